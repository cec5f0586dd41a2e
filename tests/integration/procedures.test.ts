// Procedure runs on a real (in-memory) PGlite with the committed migrations: pinned template
// versions, the runs projection, server re-checks of step entries, corrections that keep the
// original in the history, and two tablets writing to one run.
import { randomBytes, randomUUID } from "node:crypto";
import { eq } from "drizzle-orm";
import { describe, expect, it } from "vitest";
import type { Db } from "@/db/client";
import { appendEntries, chainEntries } from "@/db/queries/entries";
import { getRunRecord, listRuns } from "@/db/queries/runs";
import { getTemplate, latestTemplates, saveTemplateVersion } from "@/db/queries/templates";
import { users } from "@/db/schema";
import { DEFAULT_TEMPLATES } from "@/db/seed-templates";
import { deriveRun } from "@/lib/procedures/state";
import type { EntryInput, Payload } from "@/lib/schemas/entry";
import { templateInputSchema } from "@/lib/schemas/run";
import type { SessionUser } from "@/lib/schemas/user";
import { derivePinKey, formatPinRecord, hmacHex, signingMessage } from "@/lib/signing/proof";
import { signatureEntry, signingSubject } from "@/lib/signing/sign";
import { type Envelope, entryBuilder, ticking } from "../support/entries";
import { ines, priya, tomasz } from "../support/users";
import { freshDb } from "./fixture";

/** One minute between entries, from 2026-12-01 08:00 UTC. */
const clock = ticking("2026-12-01T08:00:00Z");
/** Tomasz's entries on Heron. */
const entry = entryBuilder({ cryostatId: "heron" }, clock);
const step = (runId: string, payload: Payload<"run.step">, over: Envelope = {}) =>
  entry({ runId, kind: "run.step", payload, ...over });

async function cooldown(db: Db) {
  const t = (await latestTemplates(db)).find((x) => x.key === "cooldown-dry-dilution")!;
  const id = randomUUID();
  const start = entry({
    id,
    runId: id,
    kind: "run.start",
    payload: { templateId: t.id, templateKey: t.key, templateVersion: t.version, title: "Cooldown of Heron" },
  });
  expect((await appendEntries(db, tomasz, [start])).rejected).toEqual([]);
  return { t, id, start };
}

async function pinSign(db: Db, target: EntryInput, signer: SessionUser) {
  const salt = randomBytes(16).toString("base64");
  const key = await derivePinKey("731904", salt, 1000);
  await db
    .update(users)
    .set({ pinHash: formatPinRecord(1000, salt, key) })
    .where(eq(users.id, signer.id));
  const subject = signingSubject(target, signer, "verified");
  return signatureEntry({
    target,
    subject,
    signer,
    deviceId: target.deviceId,
    confirmedBy: "pin",
    proof: hmacHex(key, signingMessage(subject)),
    recordedAt: clock().toISOString(),
  });
}

describe("procedure templates", () => {
  it("every default template passes the admin form's own schema", () => {
    for (const t of DEFAULT_TEMPLATES) expect(templateInputSchema.safeParse(t).success, t.key).toBe(true);
    const kinds = new Set(DEFAULT_TEMPLATES.flatMap((t) => t.cryostatKinds));
    expect([...kinds].sort()).toEqual(["dry_dilution", "test_dewar", "wet_bath"]);
  });

  it("a template edit makes a new version and does not alter a run started on the old one", async () => {
    const db = await freshDb({ seeded: true });
    const { t, id } = await cooldown(db);
    const edited = {
      ...t,
      title: "Cooldown — dry fridge (rev. B)",
      steps: t.steps.map((s) => (s.id === "mxc-base" ? { ...s, max: 15 } : s)).filter((s) => s.id !== "panel-photo"),
    };
    const saved = await saveTemplateVersion(db, {
      input: templateInputSchema.parse(edited),
      createdBy: ines.id,
      basedOnVersion: t.version,
    });
    expect(saved.ok && saved.template.version).toBe(2);
    // A second editor still on version 1 is refused, not silently overwritten.
    expect(
      await saveTemplateVersion(db, {
        input: templateInputSchema.parse(edited),
        createdBy: ines.id,
        basedOnVersion: 1,
      }),
    ).toMatchObject({ ok: false, reason: "stale", latest: 2 });

    const record = await getRunRecord(db, { runId: id });
    expect(record?.template.id).toBe(t.id);
    expect(record?.template.version).toBe(1);
    expect(record?.template.steps.map((s) => s.id)).toContain("panel-photo");
    expect((await getTemplate(db, { id: t.id }))?.steps).toEqual(t.steps);
    // The old run still accepts entries for the step the new version removed.
    const photo = step(id, { stepId: "panel-photo", kind: "photo", attachmentId: randomUUID() });
    expect((await appendEntries(db, tomasz, [photo])).rejected).toEqual([]);
    // A reading of 18 mK is in range for version 1 (≤ 20 mK) though version 2 would flag it.
    const r = step(id, {
      stepId: "mxc-base",
      kind: "reading",
      quantity: "Mixing chamber temperature at base",
      value: 18,
      unit: "mK",
      outOfRange: false,
    });
    expect((await appendEntries(db, tomasz, [r])).rejected).toEqual([]);
  });
});

describe("procedure runs", () => {
  it("projects the run into `runs` in the same push and ends it on completion", async () => {
    const db = await freshDb({ seeded: true });
    const { id } = await cooldown(db);
    expect((await listRuns(db, { cryostatId: "heron", status: "open" })).map((r) => r.id)).toContain(id);
    await appendEntries(db, tomasz, [
      entry({ runId: id, kind: "run.abort", payload: { reason: "Leak on the vacuum can seal." } }),
    ]);
    const [run] = await listRuns(db, { cryostatId: "heron" });
    expect(run).toMatchObject({ id, status: "aborted", templateKey: "cooldown-dry-dilution", templateVersion: 1 });
  });

  it("re-checks readings against the pinned range: unflagged out-of-range, flagged in-range and missing comments are refused", async () => {
    const db = await freshDb({ seeded: true });
    const { id } = await cooldown(db);
    const base = {
      stepId: "tank-before",
      kind: "reading",
      quantity: "Mixture tank pressure before condensing",
      unit: "mbar",
    } as const;
    const res = await appendEntries(db, tomasz, [
      step(id, { ...base, value: 640, outOfRange: false }),
      step(id, { ...base, value: 806, outOfRange: true, comment: "x" }),
      step(id, { ...base, value: 640, outOfRange: true }),
      step(id, { ...base, value: 806, outOfRange: false, unit: "bar" }),
      step(id, { stepId: "no-such-step", kind: "check" }),
      step(id, { stepId: "probe-closed", kind: "reading", quantity: "x", value: 1, unit: "K", outOfRange: false }),
      step(id, { ...base, value: 640, outOfRange: true, comment: "Tank low: admin told, cooldown paused." }),
    ]);
    expect(res.rejected.map((r) => r.code)).toEqual(Array(6).fill("bad_request:run"));
    expect(res.accepted).toHaveLength(1);
  });

  it("refuses a step for a run the server has never seen", async () => {
    const db = await freshDb({ seeded: true });
    const res = await appendEntries(db, tomasz, [step(randomUUID(), { stepId: "probe-closed", kind: "check" })]);
    expect(res.rejected[0]?.code).toBe("bad_request:run");
  });

  it("keeps the original of a corrected reading in the history; the correction is what counts", async () => {
    const db = await freshDb({ seeded: true });
    const { t, id } = await cooldown(db);
    const first = step(id, {
      stepId: "precool-pt2",
      kind: "reading",
      quantity: "4 K plate temperature after pre-cool",
      value: 34,
      unit: "K",
      outOfRange: true,
      comment: "Still cooling",
    });
    const fix = step(
      id,
      {
        stepId: "precool-pt2",
        kind: "reading",
        quantity: "4 K plate temperature after pre-cool",
        value: 3.4,
        unit: "K",
        outOfRange: false,
      },
      { supersedes: first.id, reason: "Decimal point missed on the keypad." },
    );
    expect((await appendEntries(db, tomasz, [first, fix])).rejected).toEqual([]);

    const rec = (await getRunRecord(db, { runId: id }))!;
    expect(rec.entries.map((e) => e.id)).toEqual(expect.arrayContaining([first.id, fix.id]));
    const chain = await chainEntries(db, "heron");
    expect(chain.find((e) => e.id === first.id)?.payload).toMatchObject({ value: 34 });

    const state = deriveRun(id, t, rec.entries);
    const s = state.steps.find((x) => x.step.id === "precool-pt2")!;
    expect(s.history.map((e) => e.id)).toEqual([first.id, fix.id]);
    expect(s.current.map((e) => e.id)).toEqual([fix.id]);
    expect(s.status).toBe("done");
  });

  it("a correction of a signed hold point counts only once it carries its own signature", async () => {
    const db = await freshDb({ seeded: true });
    const { t, id } = await cooldown(db);
    const hold = step(id, { stepId: "hold-precool", kind: "hold", statement: "Pre-cool finished." });
    const sig = await pinSign(db, hold, tomasz);
    expect((await appendEntries(db, tomasz, [hold, sig])).rejected).toEqual([]);
    const fix = step(
      id,
      { stepId: "hold-precool", kind: "hold", statement: "Pre-cool finished; 4 K plate 3.9 K." },
      { supersedes: hold.id, reason: "Add the plate temperature." },
    );
    expect((await appendEntries(db, tomasz, [fix])).rejected).toEqual([]);

    let state = deriveRun(id, t, (await getRunRecord(db, { runId: id }))!.entries);
    let h = state.steps.find((x) => x.step.id === "hold-precool")!;
    expect(h.current.map((e) => e.id)).toEqual([hold.id]);
    expect(state.flags.join(" ")).toMatch(/waits for its own signature/);

    expect((await appendEntries(db, tomasz, [await pinSign(db, fix, tomasz)])).rejected).toEqual([]);
    state = deriveRun(id, t, (await getRunRecord(db, { runId: id }))!.entries);
    h = state.steps.find((x) => x.step.id === "hold-precool")!;
    expect(h.current.map((e) => e.id)).toEqual([fix.id]);
    expect(h.history.map((e) => e.id)).toEqual([hold.id, fix.id]);
    expect(h.status).toBe("done");
  });

  it("two tablets on one run: both keep their entries and the state is the union", async () => {
    const db = await freshDb({ seeded: true });
    const { t, id } = await cooldown(db);
    const a1 = step(id, { stepId: "probe-closed", kind: "check" }, { deviceId: "tab-A" });
    const b1 = step(id, { stepId: "probe-closed", kind: "check" }, { deviceId: "tab-B", authorId: priya.id });
    const b2 = step(id, { stepId: "leak-check", kind: "check" }, { deviceId: "tab-B", authorId: priya.id });
    // Tablet B syncs first, then A; each push is from its own user's session.
    expect((await appendEntries(db, priya, [b1, b2])).rejected).toEqual([]);
    expect((await appendEntries(db, tomasz, [a1])).rejected).toEqual([]);
    const state = deriveRun(id, t, (await getRunRecord(db, { runId: id }))!.entries);
    const probe = state.steps.find((x) => x.step.id === "probe-closed")!;
    expect(probe.current.map((e) => e.deviceId).sort()).toEqual(["tab-A", "tab-B"]);
    expect(state.steps.find((x) => x.step.id === "leak-check")?.status).toBe("done");
    expect(state.progress.done).toBe(2);
  });
});
