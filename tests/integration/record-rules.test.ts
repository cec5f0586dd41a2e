// The record's rules (lib/record/rules.ts) as the server enforces them on a push: each rule with
// a forged push a hostile but signed-in user could make, and its accepted control case. The rest
// of a batch around a refused entry is stored.
import { randomUUID } from "node:crypto";
import { afterAll, describe, expect, it } from "vitest";
import { auditQueue } from "@/db/queries/audit";
import { appendEntries, getEntry } from "@/db/queries/entries";
import { listRuns } from "@/db/queries/runs";
import { latestTemplates } from "@/db/queries/templates";
import { rejectedPinProofs } from "@/db/queries/users";
import { recordsToCsv } from "@/lib/export/csv";
import { toCsvRecord, toReportRecord } from "@/lib/export/records";
import { FUTURE_BOUND_MS } from "@/lib/record/rules";
import type { EntryInput } from "@/lib/schemas/entry";
import { fileCheckpointKeys } from "@/server/audit/keys";
import { applyPush } from "@/server/sync/apply";
import { testDirs } from "../support/dirs";
import { entryBuilder, note } from "../support/entries";
import { passwordSignature, setTestPin } from "../support/signing";
import { registeredDeviceId } from "../support/tablet";
import { grace, ines, priya, tomasz } from "../support/users";
import { freshDb } from "./fixture";

const dirs = testDirs("rimelog-record-rules-");
afterAll(() => dirs.remove());
const keys = fileCheckpointKeys(dirs.keyDir);

const onHeron = entryBuilder({ cryostatId: "heron" });
const quench = (over: Partial<EntryInput> = {}) =>
  onHeron({
    kind: "quench",
    payload: { at: new Date().toISOString(), fieldT: 6.2, currentA: 68, actions: "Switch heater off, logged." },
    ...over,
  } as Parameters<typeof onHeron>[0]);

const codes = (r: { rejected: { code: string }[] }) => r.rejected.map((x) => x.code);

describe("corrections", () => {
  it("refuses a correction that changes the kind: a quench stays in the audit queue", async () => {
    const db = await freshDb({ seeded: true });
    const q = quench();
    expect((await appendEntries(db, tomasz, [q])).rejected).toEqual([]);
    const hide = onHeron({
      kind: "incident",
      payload: { title: "Nothing", description: "", actions: "" },
      supersedes: q.id,
      reason: "tidy up",
    });
    expect(codes(await appendEntries(db, tomasz, [hide]))).toEqual(["bad_request:supersedes"]);
    expect((await auditQueue(db, { keys })).some((i) => i.entry.id === q.id)).toBe(true);
  });

  it("refuses a correction of another person's record without the corrector's signature; accepts it signed, and the author's own", async () => {
    const db = await freshDb({ seeded: true });
    const q = quench();
    await appendEntries(db, tomasz, [q]);
    const byPriya = quench({ authorId: priya.id, supersedes: q.id, reason: "field was 6.0 T" });
    expect(codes(await appendEntries(db, priya, [byPriya]))).toEqual(["forbidden:correction"]);
    // Control: the same correction sent with Priya's own signature on it.
    const signed = quench({ authorId: priya.id, supersedes: q.id, reason: "field was 6.0 T" });
    const sig = await passwordSignature(db, signed, priya, "verified");
    expect((await appendEntries(db, priya, [signed, sig])).rejected).toEqual([]);
    // The audit queue shows the correction as a correction, with its original, who and why;
    // the CSV row and the report section carry the same.
    const item = (await auditQueue(db, { keys })).find((i) => i.entry.id === signed.id)!;
    expect(item.corrects?.entry.id).toBe(q.id);
    expect(item.corrects?.authorName).toBe(tomasz.name);
    expect(item.authorName).toBe(priya.name);
    expect((await auditQueue(db, { keys })).some((i) => i.entry.id === q.id)).toBe(false);
    const csv = recordsToCsv([toCsvRecord(item)]);
    expect(csv).toContain("corrects_record_id,correction_reason,original_recorded_by");
    expect(csv).toContain(`${q.id},field was 6.0 T,${tomasz.name},${q.recordedAt}`);
    const report = toReportRecord(item);
    expect(report.correction).toMatchObject({
      originalId: q.id,
      originalAuthorName: tomasz.name,
      reason: "field was 6.0 T",
    });
    expect(report.correction?.original.join(" ")).toMatch(/at 6\.2 T, 68 A/);
    // Control: the author corrects their own record with a reason, no signature needed.
    const own = quench({ supersedes: q.id, reason: "typo in the current" });
    expect((await appendEntries(db, tomasz, [own])).rejected).toEqual([]);
  });

  it("refuses a correction without a reason, and of a kind that cannot be corrected", async () => {
    const db = await freshDb({ seeded: true });
    const n = note("first");
    await appendEntries(db, tomasz, [n]);
    const blank = note("second", { supersedes: n.id, reason: "   " });
    const sig = await passwordSignature(db, n, tomasz, "verified");
    await appendEntries(db, tomasz, [sig]);
    const ofSig = {
      ...sig,
      id: randomUUID(),
      payload: { ...sig.payload, meaning: "performed" as const },
      supersedes: sig.id,
      reason: "again",
    };
    expect(codes(await appendEntries(db, tomasz, [blank, ofSig]))).toEqual([
      "bad_request:reason",
      "bad_request:supersedes",
    ]);
  });
});

describe("runs", () => {
  async function start(db: Awaited<ReturnType<typeof freshDb>>) {
    const t = (await latestTemplates(db)).find((x) => x.key === "cooldown-dry-dilution")!;
    const id = randomUUID();
    const s = onHeron({
      id,
      runId: id,
      kind: "run.start",
      payload: { templateId: t.id, templateKey: t.key, templateVersion: t.version, title: "Cooldown" },
    });
    expect((await appendEntries(db, tomasz, [s])).rejected).toEqual([]);
    return { t, id };
  }

  it("refuses a completion with no step done and the hold point unsigned, even when it is signed", async () => {
    const db = await freshDb({ seeded: true });
    const { id } = await start(db);
    const done = onHeron({ runId: id, kind: "run.complete", payload: {} });
    const sig = await passwordSignature(db, done, tomasz, "performed");
    const res = await appendEntries(db, tomasz, [done, sig]);
    expect(res.rejected[0]).toMatchObject({ id: done.id, code: "forbidden:run" });
    expect(res.rejected[0]!.message).toMatch(/hold point|required step/);
    expect((await listRuns(db, { cryostatId: "heron" })).find((r) => r.id === id)?.status).toBe("open");
  });

  it("completes a run whose steps are all done and hold points signed, only with the completion signed", async () => {
    const db = await freshDb({ seeded: true });
    const { t, id } = await start(db);
    const steps: EntryInput[] = [];
    const sigs: EntryInput[] = [];
    for (const s of t.steps) {
      const payload =
        s.kind === "reading"
          ? { stepId: s.id, kind: "reading", value: s.min ?? s.max ?? 1, unit: s.unit, outOfRange: false }
          : s.kind === "check"
            ? { stepId: s.id, kind: "check", ...(s.secondPerson ? { secondPersonId: priya.id } : {}) }
            : s.kind === "hold"
              ? { stepId: s.id, kind: "hold", statement: "Done." }
              : s.kind === "caution"
                ? { stepId: s.id, kind: "caution", acknowledged: true }
                : s.kind === "photo"
                  ? { stepId: s.id, kind: "photo", attachmentId: randomUUID() }
                  : { stepId: s.id, kind: "note", text: "ok" };
      const e = onHeron({ runId: id, kind: "run.step", payload } as Parameters<typeof onHeron>[0]);
      steps.push(e);
      if (s.kind === "hold") {
        const signer = s.role === "safety_officer" ? grace : s.role === "facility_admin" ? ines : tomasz;
        sigs.push(await passwordSignature(db, e, signer, "verified"));
      }
    }
    const res = await appendEntries(db, tomasz, steps);
    expect(res.rejected).toEqual([]);
    for (const s of sigs) {
      const signer = [grace, ines, tomasz].find((u) => u.id === s.authorId)!;
      expect((await appendEntries(db, signer, [s])).rejected).toEqual([]);
    }
    const unsigned = onHeron({ runId: id, kind: "run.complete", payload: {} });
    expect(codes(await appendEntries(db, tomasz, [unsigned]))).toEqual(["forbidden:run"]);
    const done = onHeron({ runId: id, kind: "run.complete", payload: {} });
    const sig = await passwordSignature(db, done, tomasz, "performed");
    expect((await appendEntries(db, tomasz, [done, sig])).rejected).toEqual([]);
    expect((await listRuns(db, { cryostatId: "heron" })).find((r) => r.id === id)?.status).toBe("completed");
  });
});

describe("signatures", () => {
  it("refuses a signature in another person's name, a replayed signature, one without proof and a second copy", async () => {
    const db = await freshDb({ seeded: true });
    const q = quench();
    await appendEntries(db, tomasz, [q]);
    // A technician signs "verified" under the safety officer's name.
    const good = await passwordSignature(db, q, tomasz, "verified");
    const forgedName = {
      ...good,
      id: randomUUID(),
      payload: { ...good.payload, signerName: grace.name },
    };
    // Priya re-sends Tomasz's stored signature under a new id as her own.
    const replay = {
      ...good,
      id: randomUUID(),
      authorId: priya.id,
      payload: { ...good.payload, signerName: priya.name },
    };
    // No proof at all.
    const { confirmedBy: _c, confirmProof: _p, ...bare } = good.payload;
    const noProof = { ...good, id: randomUUID(), payload: bare };
    expect(codes(await appendEntries(db, tomasz, [forgedName, noProof]))).toEqual([
      "forbidden:signature",
      "forbidden:signature",
    ]);
    expect(codes(await appendEntries(db, priya, [replay]))).toEqual(["forbidden:signature"]);
    // Control: the real one is accepted once; the same signature again under a new id is not.
    expect((await appendEntries(db, tomasz, [good])).rejected).toEqual([]);
    const again = await passwordSignature(db, q, tomasz, "verified");
    expect(codes(await appendEntries(db, tomasz, [again]))).toEqual(["conflict:signature"]);
  });

  it("counts a refused PIN proof on the server", async () => {
    const db = await freshDb({ seeded: true });
    const q = quench();
    await appendEntries(db, tomasz, [q]);
    await setTestPin(db, tomasz.id, "582914");
    const good = await passwordSignature(db, q, tomasz, "verified");
    const guessed = {
      ...good,
      payload: { ...good.payload, confirmedBy: "pin" as const, confirmProof: "ab".repeat(32) },
    };
    const since = new Date(Date.now() - 60_000);
    expect(codes(await appendEntries(db, tomasz, [guessed]))).toEqual(["forbidden:signature"]);
    expect(await rejectedPinProofs(db, { userId: tomasz.id, since })).toBe(1);
    // Control: a password proof that checks out is not counted.
    expect((await appendEntries(db, tomasz, [good])).rejected).toEqual([]);
    expect(await rejectedPinProofs(db, { userId: tomasz.id, since })).toBe(1);
  });

  it("refuses a signature filed on another cryostat's chain than its record", async () => {
    const db = await freshDb({ seeded: true });
    const q = quench();
    await appendEntries(db, tomasz, [q]);
    const sig = await passwordSignature(db, q, tomasz, "verified");
    const moved = { ...sig, cryostatId: "plover" };
    expect(codes(await appendEntries(db, tomasz, [moved]))).toEqual(["bad_request:signature"]);
    expect((await appendEntries(db, tomasz, [sig])).rejected).toEqual([]);
  });

  it("shows the signer's name from the user record in the audit", async () => {
    const db = await freshDb({ seeded: true });
    const q = quench();
    const sig = await passwordSignature(db, q, tomasz, "performed");
    await appendEntries(db, tomasz, [q, sig]);
    const item = (await auditQueue(db, { keys })).find((i) => i.entry.id === q.id)!;
    expect(item.signatures.map((s) => [s.signerName, s.confirmedBy])).toEqual([[tomasz.name, "password"]]);
  });
});

describe("time, place and text", () => {
  it("refuses an entry dated ahead of the server's clock beyond the bound; accepts one within it", async () => {
    const db = await freshDb({ seeded: true });
    const now = Date.now();
    const far = note("from 2099", { recordedAt: "2099-01-01T00:00:00.000Z" });
    const near = note("clock a little fast", { recordedAt: new Date(now + FUTURE_BOUND_MS / 2).toISOString() });
    const res = await appendEntries(db, tomasz, [far, near], { now: new Date(now) });
    expect(codes(res)).toEqual(["bad_request:time"]);
    expect(res.accepted.map((a) => a.id)).toEqual([near.id]);
  });

  it("keeps technicians off the facility chain; the admin may write there", async () => {
    const db = await freshDb({ seeded: true });
    const t = note("facility-wide", { cryostatId: null });
    expect(codes(await appendEntries(db, tomasz, [t]))).toEqual(["forbidden:chain"]);
    const a = note("facility-wide", { cryostatId: null, authorId: ines.id });
    expect((await appendEntries(db, ines, [a])).rejected).toEqual([]);
  });

  it("refuses a quench or field setting on a cryostat without a magnet", async () => {
    const db = await freshDb({ seeded: true });
    const onWren = quench({ cryostatId: "wren" });
    const field = onHeron({
      cryostatId: "wren",
      kind: "field.setting",
      payload: { fieldT: 1, currentA: 10, rampRateTPerMin: 0.1, persistent: false },
    } as Parameters<typeof onHeron>[0]);
    const res = await appendEntries(db, tomasz, [onWren, field, quench()]);
    expect(codes(res)).toEqual(["bad_request:magnet", "bad_request:magnet"]);
    expect(res.accepted).toHaveLength(1);
  });

  it("refuses a field setting beyond the magnet's rating or the ramp limit without a reason; accepts it with one, and one within the limits", async () => {
    const db = await freshDb({ seeded: true });
    // Heron's magnet (demo lab): 0.09 T/A × 100 A = 9 T rated; the facility's ramp limit 0.15 T/min.
    const setting = (payload: Record<string, unknown>) =>
      onHeron({ kind: "field.setting", payload: { persistent: false, ...payload } } as Parameters<typeof onHeron>[0]);
    const beyond = setting({ fieldT: 12, currentA: 133, rampRateTPerMin: 0.5 });
    const res = await appendEntries(db, tomasz, [beyond]);
    expect(codes(res)).toEqual(["bad_request:magnet_limit"]);
    expect(res.rejected[0]!.message).toMatch(
      /133 A is above the magnet's rated 100 A.*12 T is above the rated 9 T.*0\.5 T\/min is above the facility's limit of 0\.15 T\/min/,
    );
    const rampOnly = setting({ fieldT: 4, currentA: 44.4, rampRateTPerMin: 0.2 });
    expect(codes(await appendEntries(db, tomasz, [rampOnly]))).toEqual(["bad_request:magnet_limit"]);
    // Controls: the same with a reason for the override, and a setting within every limit.
    const approved = setting({
      fieldT: 12,
      currentA: 133,
      rampRateTPerMin: 0.5,
      limitOverrideReason: "Maker's test, approved by the facility",
    });
    const within = setting({ fieldT: 6, currentA: 66.7, rampRateTPerMin: 0.1 });
    expect((await appendEntries(db, tomasz, [approved, within])).rejected).toEqual([]);
  });

  it("refuses a NUL or a lone surrogate per entry, stores the good entries beside it, never a 500", async () => {
    const db = await freshDb({ seeded: true });
    const bad1 = note("before\u0000after");
    const bad2 = note("half \ud83d a smile");
    const good = note("fine");
    await registeredDeviceId(db, [tomasz]);
    const reply = await applyPush(db, tomasz, { entries: [bad1, good, bad2] });
    expect(reply.rejected.map((r) => [r.id, r.code])).toEqual([
      [bad1.id, "bad_request:text"],
      [bad2.id, "bad_request:text"],
    ]);
    expect(reply.accepted.map((a) => a.id)).toEqual([good.id]);
    expect(await getEntry(db, good.id)).toBeDefined();
  });
});
