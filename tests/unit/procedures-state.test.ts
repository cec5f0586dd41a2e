// Run state derived from entries alone (lib/procedures/state.ts), the keypad's number parsing and
// the handover summary. Signature validity is checked with node:crypto's SHA-256 directly.
import { randomUUID } from "node:crypto";
import { describe, expect, it } from "vitest";
import { applyKey, keypadNumber } from "@/components/procedures/keypad";
import { DEFAULT_TEMPLATES } from "@/db/seed-templates";
import { handoverSummary } from "@/lib/procedures/handover";
import {
  deriveRun,
  describeRange,
  type PinnedTemplate,
  type RunEntry,
  readingOutOfRange,
} from "@/lib/procedures/state";
import { recordHash } from "@/lib/sync/hash";
import { type EntryFields, entryBuilder, ticking } from "../support/entries";

const cooldown = DEFAULT_TEMPLATES.find((t) => t.key === "cooldown-dry-dilution")!;
const template: PinnedTemplate = {
  id: randomUUID(),
  key: cooldown.key,
  version: 1,
  title: cooldown.title,
  steps: cooldown.steps,
};

/** Tomasz's entries on Heron, one minute apart from 2026-12-01 08:00 UTC. */
const entry = entryBuilder({ cryostatId: "heron" }, ticking("2026-12-01T08:00:00Z"));
/** A fixture entry: only the payload fields a check reads (not a full entry the schema would pass). */
function e(kind: string, payload: Record<string, unknown>, over: Partial<RunEntry> = {}): RunEntry {
  return entry({ kind, payload, ...over } as EntryFields) as RunEntry;
}
function run() {
  const start = e("run.start", {
    templateId: template.id,
    templateKey: template.key,
    templateVersion: 1,
    title: "Cooldown",
  });
  const step = (payload: Record<string, unknown>, over: Partial<Omit<RunEntry, "kind" | "payload">> = {}) =>
    e("run.step", payload, { runId: start.id, ...over });
  const sign = (target: RunEntry, meaning = "verified", role = "technician") =>
    e(
      "signature",
      {
        signedEntryId: target.id,
        meaning,
        signerName: "Tomasz Okafor",
        signerRole: role,
        signedHash: recordHash(target),
        confirmedBy: "pin",
      },
      { runId: start.id },
    );
  return { start, step, sign };
}

describe("readings against the range", () => {
  it("limits are inclusive and a missing limit is open", () => {
    expect(readingOutOfRange({ min: 700, max: 900 }, 700)).toBeNull();
    expect(readingOutOfRange({ min: 700, max: 900 }, 699.9)).toBe("low");
    expect(readingOutOfRange({ min: 700, max: 900 }, 900.1)).toBe("high");
    expect(readingOutOfRange({ max: 20 }, -5)).toBeNull();
    expect(describeRange({ min: 700, max: 900, unit: "mbar" })).toBe("700 – 900 mbar");
    expect(describeRange({ max: 20, unit: "mK" })).toBe("at most 20 mK");
  });
});

describe("run state", () => {
  it("starts with nothing done; the first step is current and steps after the first hold point wait", () => {
    const { start } = run();
    const s = deriveRun(start.id, template, [start]);
    expect(s.status).toBe("open");
    expect(s.currentIndex).toBe(0);
    expect(s.progress).toEqual({
      done: 0,
      required: template.steps.filter((x) => x.kind !== "note").length,
      percent: 0,
    });
    const hold = template.steps.findIndex((x) => x.id === "hold-precool");
    expect(s.blockingHold).toBe(hold);
    expect(s.steps[hold + 1]?.status).toBe("blocked");
    expect(s.canComplete).toBe(false);
  });

  it("flags an out-of-range reading (and a missing comment) but counts it as recorded", () => {
    const { start, step } = run();
    const r = step({
      stepId: "tank-before",
      kind: "reading",
      quantity: "q",
      value: 640,
      unit: "mbar",
      outOfRange: true,
    });
    const s = deriveRun(start.id, template, [start, r]).steps.find((x) => x.step.id === "tank-before")!;
    expect(s.status).toBe("flagged");
    expect(s.problems.join(" ")).toMatch(/below 700 – 900 mbar/);
    expect(s.problems.join(" ")).toMatch(/without a comment/);
  });

  it("a hold point is released only by a valid signature of the required role", () => {
    const { start, step, sign } = run();
    const hold = step({ stepId: "hold-precool", kind: "hold", statement: "ok" });
    const wrongRole = sign(hold, "verified", "researcher");
    let s = deriveRun(start.id, template, [start, hold, wrongRole]);
    expect(s.steps.find((x) => x.step.id === "hold-precool")?.status).toBe("awaiting_signature");
    const forged = { ...sign(hold), payload: { ...sign(hold).payload, signedHash: "0".repeat(64) } } as RunEntry;
    s = deriveRun(start.id, template, [start, hold, forged]);
    expect(s.steps.find((x) => x.step.id === "hold-precool")?.status).toBe("awaiting_signature");
    expect(s.flags.join(" ")).toMatch(/does not match/);
    s = deriveRun(start.id, template, [start, hold, sign(hold)]);
    expect(s.steps.find((x) => x.step.id === "hold-precool")?.status).toBe("done");
    expect(s.blockingHold).toBe(template.steps.findIndex((x) => x.id === "hold-base"));
  });

  it("keeps and flags work recorded past a hold point before it was signed (another tablet)", () => {
    const { start, step, sign } = run();
    const early = step({ stepId: "circulation", kind: "check" }, { deviceId: "tab-2" });
    const hold = step({ stepId: "hold-precool", kind: "hold", statement: "ok" });
    const s = deriveRun(start.id, template, [start, early, hold, sign(hold)]);
    const circ = s.steps.find((x) => x.step.id === "circulation")!;
    expect(circ.current.map((x) => x.id)).toEqual([early.id]);
    expect(circ.status).toBe("flagged");
    expect(circ.problems.join(" ")).toMatch(/before the hold point/);
  });

  it("the same result whatever order the entries arrive in", () => {
    const { start, step, sign } = run();
    const hold = step({ stepId: "hold-precool", kind: "hold", statement: "ok" });
    const list = [
      start,
      step({ stepId: "probe-closed", kind: "check" }),
      step({ stepId: "leak-check", kind: "check" }, { deviceId: "tab-2" }),
      hold,
      sign(hold),
    ];
    const a = deriveRun(start.id, template, list);
    const b = deriveRun(start.id, template, [...list].reverse());
    expect(b.steps.map((x) => x.status)).toEqual(a.steps.map((x) => x.status));
    expect(b.progress).toEqual(a.progress);
  });

  it("completes when everything required is done; abort wins and is kept with its reason", () => {
    const { start, step, sign } = run();
    const list: RunEntry[] = [start];
    for (const st of template.steps) {
      if (st.kind === "note") continue;
      const p =
        st.kind === "check"
          ? { stepId: st.id, kind: "check" }
          : st.kind === "reading"
            ? {
                stepId: st.id,
                kind: "reading",
                quantity: st.quantity,
                value: st.max ?? st.min ?? 1,
                unit: st.unit,
                outOfRange: false,
              }
            : st.kind === "photo"
              ? { stepId: st.id, kind: "photo", attachmentId: randomUUID() }
              : st.kind === "caution"
                ? { stepId: st.id, kind: "caution", acknowledged: true }
                : { stepId: st.id, kind: "hold", statement: st.text };
      const x = step(p);
      list.push(x);
      if (st.kind === "hold") list.push(sign(x));
    }
    let s = deriveRun(start.id, template, list);
    expect(s.canComplete).toBe(true);
    expect(s.progress.percent).toBe(100);
    const done = e("run.complete", {}, { runId: start.id });
    s = deriveRun(start.id, template, [...list, done]);
    expect(s.status).toBe("completed");
    expect(s.flags).toContain("Completion not yet signed.");
    s = deriveRun(start.id, template, [...list, done, sign(done, "performed")]);
    expect(s.flags).toEqual([]);
    const abort = e("run.abort", { reason: "Leak found" }, { runId: start.id });
    expect(deriveRun(start.id, template, [start, abort]).aborted?.reason).toBe("Leak found");
  });
});

describe("keypad", () => {
  it("builds numbers a key at a time and refuses half-typed values", () => {
    let v = "";
    for (const k of [".", "0", "5"]) v = applyKey(v, k);
    expect(v).toBe("0.05");
    expect(keypadNumber(v)).toBe(0.05);
    expect(applyKey("3.4", ".")).toBe("3.4");
    expect(applyKey("12", "−")).toBe("-12");
    expect(applyKey("-12", "−")).toBe("12");
    expect(applyKey("12", "⌫")).toBe("1");
    expect(keypadNumber("-")).toBeNull();
    expect(keypadNumber("3.")).toBeNull();
    expect(keypadNumber("1e5")).toBeNull();
  });
});

describe("handover summary", () => {
  it("takes the latest per stage, the level in litres and a forecast from the boil-off since the last fill", () => {
    const config = {
      stages: [{ key: "bath", label: "Helium bath", nominalK: 4.2 }],
      reservoir: {
        capacityLitres: 60,
        minimumPercent: 20,
        calibration: { kind: "linear" as const, litresPerPercent: 0.6, offsetLitres: 0 },
      },
    };
    const now = Date.parse("2026-12-10T12:00:00Z");
    const day = 86_400_000;
    const at = (d: number) => new Date(now - d * day).toISOString();
    const list = [
      e("reading", { quantity: "T", stage: "bath", value: 4.3, unit: "K" }, { recordedAt: at(3) }),
      e("reading", { quantity: "T", stage: "bath", value: 4.21, unit: "K" }, { recordedAt: at(1) }),
      e("transfer", { levelAfterPercent: 90 }, { recordedAt: at(4) }),
      // 5 %/day = 3 L/day from 90 %: 80 % after two days, 70 % after four.
      e("helium.level", { percent: 85 }, { recordedAt: at(3) }),
      e("helium.level", { percent: 80 }, { recordedAt: at(2) }),
      e("helium.level", { percent: 70 }, { recordedAt: at(0) }),
    ];
    const s = handoverSummary(list, config, now);
    expect(s.stages).toEqual([{ stage: "Helium bath", valueK: 4.21, at: at(1) }]);
    expect(s.heliumPercent).toBe(70);
    expect(s.heliumLitres).toBeCloseTo(42, 9);
    // Hand arithmetic: 70 % → 20 % at 5 %/day is 10 days.
    expect(s.forecastDays).toBeCloseTo(10, 1);
  });
});
