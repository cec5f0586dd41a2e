// A helium transfer done as a procedure run makes one transfer record, the same as the transfer
// form's: the tablet sends it with the completion, the server builds it again from the stored
// steps (lib/procedures/transfer-record.ts) and refuses a completion without it, a record whose
// figures differ from the steps, and a second record for the run. The run's flags (an oxygen
// reading below the step's range) reach the audit queue on that record.
import { randomBytes, randomUUID } from "node:crypto";
import { eq } from "drizzle-orm";
import { afterAll, describe, expect, it } from "vitest";
import type { Db } from "@/db/client";
import { auditQueue } from "@/db/queries/audit";
import { appendEntries } from "@/db/queries/entries";
import { listRuns } from "@/db/queries/runs";
import { latestTemplates } from "@/db/queries/templates";
import { users } from "@/db/schema";
import { PLOVER } from "@/db/seed";
import { HELIUM_LIQUID_DENSITY_KG_PER_L } from "@/lib/cryo";
import { deriveRun } from "@/lib/procedures/state";
import { transferFromRun } from "@/lib/procedures/transfer-record";
import type { EntryInput, Payload } from "@/lib/schemas/entry";
import type { SessionUser } from "@/lib/schemas/user";
import { derivePinKey, formatPinRecord, hmacHex, signingMessage } from "@/lib/signing/proof";
import { signatureEntry, signingSubject } from "@/lib/signing/sign";
import { fileCheckpointKeys } from "@/server/audit/keys";
import { testDirs } from "../support/dirs";
import { entryBuilder, ticking } from "../support/entries";
import { priya, tomasz } from "../support/users";
import { freshDb } from "./fixture";

const dirs = testDirs("rimelog-run-transfer-keys-");
afterAll(() => dirs.remove());
const keys = fileCheckpointKeys(dirs.keyDir);

/** One minute between entries, from 2026-12-01 08:00 UTC. */
const clock = ticking("2026-12-01T08:00:00Z");
/** Tomasz's entries on Plover (a wet bath cryostat with a level calibration). */
const entry = entryBuilder({ cryostatId: "plover" }, clock);

async function pinSigner(db: Db, signer: SessionUser) {
  const salt = randomBytes(16).toString("base64");
  const key = await derivePinKey("731904", salt, 1000);
  await db
    .update(users)
    .set({ pinHash: formatPinRecord(1000, salt, key) })
    .where(eq(users.id, signer.id));
  return (target: EntryInput) => {
    const subject = signingSubject(target, signer, "performed");
    return signatureEntry({
      target,
      subject,
      signer,
      deviceId: target.deviceId,
      confirmedBy: "pin",
      proof: hmacHex(key, signingMessage(subject)),
      recordedAt: clock().toISOString(),
    });
  };
}

type Figures = { oxygenBefore: number; oxygenLowest: number };

/** A helium transfer run on Plover, every step done; `oxygenBefore` below 19.5 % is flagged out of range. */
async function transferRun(db: Db, { oxygenBefore = 20.8, oxygenLowest = 20.6 }: Partial<Figures> = {}) {
  const t = (await latestTemplates(db)).find((x) => x.key === "helium-transfer")!;
  const id = randomUUID();
  const start = entry({
    id,
    runId: id,
    kind: "run.start",
    payload: { templateId: t.id, templateKey: t.key, templateVersion: t.version, title: "Helium transfer, Plover" },
  });
  const step = (payload: Payload<"run.step">) => entry({ runId: id, kind: "run.step", payload });
  const reading = (stepId: string, quantity: string, unit: "%" | "mbar" | "kg", value: number, comment?: string) =>
    step({
      stepId,
      kind: "reading",
      quantity,
      value,
      unit,
      outOfRange: stepId.startsWith("oxygen") && value < 19.5,
      ...(comment ? { comment } : {}),
    });
  const steps = [
    step({ stepId: "caution-oxygen", kind: "caution", acknowledged: true }),
    step({ stepId: "people", kind: "check", secondPersonId: priya.id }),
    step({ stepId: "ppe", kind: "check" }),
    reading(
      "oxygen-before",
      "Oxygen monitor reading before the transfer",
      "%",
      oxygenBefore,
      oxygenBefore < 19.5 ? "Left the room, ventilation checked, monitor read again before starting." : undefined,
    ),
    reading("level-before", "Helium level before", "%", 31),
    reading("pressure-before", "Bath pressure before", "mbar", 1012),
    reading("supply-before", "Supply dewar mass before", "kg", 180, "D-250-A"),
    step({ stepId: "caution-line", kind: "caution", acknowledged: true }),
    step({ stepId: "line", kind: "check" }),
    reading(
      "oxygen-lowest",
      "Lowest oxygen reading during the transfer",
      "%",
      oxygenLowest,
      oxygenLowest < 19.5 ? "Told the safety officer." : undefined,
    ),
    reading("level-after", "Helium level after", "%", 80),
    reading("pressure-after", "Bath pressure after", "mbar", 1025),
    reading("supply-after", "Supply dewar mass after", "kg", 172.5),
    step({ stepId: "line-out", kind: "check" }),
    step({ stepId: "level-photo", kind: "photo", attachmentId: randomUUID() }),
  ];
  expect((await appendEntries(db, tomasz, [start, ...steps])).rejected).toEqual([]);
  const state = deriveRun(id, t, [start, ...steps]);
  const built = transferFromRun(state, { calibration: PLOVER.reservoir!.calibration });
  if (!built.ok) throw new Error(built.problems.join("; "));
  const transfer = (payload: Payload<"transfer"> = built.payload) => entry({ runId: id, kind: "transfer", payload });
  const complete = () => entry({ runId: id, kind: "run.complete", payload: {} });
  return { id, built: built.payload, transfer, complete, sign: await pinSigner(db, tomasz) };
}

describe("procedure transfers", () => {
  it("a complete transfer run completes with its transfer record, shown once in the audit queue", async () => {
    const db = await freshDb({ seeded: true });
    const run = await transferRun(db);
    // The figures the steps give. Litres gained: Plover's demo level table (db/seed.ts, invented)
    // is linear from 10 % = 8.5 L to 90 % = 88.5 L, so 31 % → 29.5 L and 80 % → 78.5 L: 49 L.
    // Litres taken: 7.5 kg of liquid at 0.12467 kg/L (lib/cryo README, [eos]): 60.16 → 60.2 L.
    expect(run.built).toMatchObject({
      supplyDewar: "D-250-A",
      peoplePresent: [tomasz.id, priya.id],
      ppeConfirmed: true,
      oxygenMonitorChecked: true,
      oxygenLowestPercent: 20.6,
      levelBeforePercent: 31,
      levelAfterPercent: 80,
      pressureBeforeMbar: 1012,
      pressureAfterMbar: 1025,
      suppliedBy: "weight",
      supplyMassBeforeKg: 180,
      supplyMassAfterKg: 172.5,
      gainedLitres: 49,
      suppliedLitres: Math.round((7.5 / HELIUM_LIQUID_DENSITY_KG_PER_L) * 10) / 10,
    });
    expect(run.built.suppliedLitres).toBe(60.2);
    const transfer = run.transfer();
    const complete = run.complete();
    const res = await appendEntries(db, tomasz, [transfer, complete, run.sign(transfer), run.sign(complete)]);
    expect(res.rejected).toEqual([]);
    expect((await listRuns(db, { cryostatId: "plover" })).find((r) => r.id === run.id)?.status).toBe("completed");
    const mine = (await auditQueue(db, { keys })).filter((i) => i.entry.runId === run.id);
    expect(mine.map((i) => i.entry.id)).toEqual([transfer.id]);
    expect(mine[0]!.flags.map((f) => f.code)).toEqual([]);
  });

  it("a run with a 19.2 % oxygen reading reaches the audit queue with its flags", async () => {
    const db = await freshDb({ seeded: true });
    const run = await transferRun(db, { oxygenBefore: 19.2 });
    const transfer = run.transfer();
    const complete = run.complete();
    expect(
      (await appendEntries(db, tomasz, [transfer, complete, run.sign(transfer), run.sign(complete)])).rejected,
    ).toEqual([]);
    const item = (await auditQueue(db, { keys })).find((i) => i.entry.id === transfer.id);
    expect(item).toBeDefined();
    const codes = item!.flags.map((f) => f.code);
    // The demo rules' alarm level is 19.5 % (db/seed.ts, invented); the step's minimum is 19.5 % too.
    expect(codes).toContain("oxygen_below_alarm");
    expect(codes).toContain("procedure_flags");
    const detail = item!.flags.find((f) => f.code === "procedure_flags")!.detail;
    expect(detail).toContain("Oxygen monitor reading before the transfer: 19.2 %");
    expect(detail).toContain("Out of range");
  });

  it("refuses a completion without the run's transfer record", async () => {
    const db = await freshDb({ seeded: true });
    const run = await transferRun(db);
    const complete = run.complete();
    const res = await appendEntries(db, tomasz, [complete, run.sign(complete)]);
    // The completion is refused, and so its signature (it names a record the server does not hold).
    expect(res.rejected.map((r) => r.code)).toEqual(["bad_request:transfer", "bad_request:signature"]);
    expect(res.rejected[0]).toMatchObject({ code: "bad_request:transfer" });
    expect(res.rejected[0]!.message).toMatch(/send the run's transfer entry with its completion/);
    expect((await listRuns(db, { cryostatId: "plover" })).find((r) => r.id === run.id)?.status).toBe("open");
  });

  it("refuses a transfer record whose figures differ from the run's steps, and the completion after it", async () => {
    const db = await freshDb({ seeded: true });
    const run = await transferRun(db, { oxygenBefore: 19.2 });
    // The tablet cannot send other numbers: a better oxygen reading and more litres gained.
    const forged = run.transfer({ ...run.built, oxygenLowestPercent: 20.9, gainedLitres: 55 });
    const complete = run.complete();
    const res = await appendEntries(db, tomasz, [forged, complete, run.sign(complete)]);
    expect(res.rejected.map((r) => r.code)).toEqual([
      "conflict:transfer",
      "bad_request:transfer",
      "bad_request:signature",
    ]);
    expect(res.rejected[0]!.message).toMatch(/gainedLitres, oxygenLowestPercent/);
    expect((await auditQueue(db, { keys })).some((i) => i.entry.id === forged.id)).toBe(false);
  });

  it("refuses a second transfer record for the same run", async () => {
    const db = await freshDb({ seeded: true });
    const run = await transferRun(db);
    const first = run.transfer();
    const complete = run.complete();
    expect((await appendEntries(db, tomasz, [first, complete, run.sign(complete)])).rejected).toEqual([]);
    const second = run.transfer();
    const res = await appendEntries(db, tomasz, [second]);
    expect(res.rejected).toEqual([expect.objectContaining({ id: second.id, code: "conflict:transfer" })]);
    // Two in one push: the second is refused too.
    const other = await transferRun(db);
    const otherComplete = other.complete();
    const res2 = await appendEntries(db, tomasz, [
      other.transfer(),
      other.transfer(),
      otherComplete,
      other.sign(otherComplete),
    ]);
    expect(res2.rejected.map((r) => r.code)).toEqual(["conflict:transfer"]);
    expect((await auditQueue(db, { keys })).filter((i) => i.entry.runId === other.id)).toHaveLength(1);
  });

  it("refuses a transfer record for a run whose procedure makes none", async () => {
    const db = await freshDb({ seeded: true });
    const run = await transferRun(db);
    const t = (await latestTemplates(db)).find((x) => x.key === "cooldown-wet-bath")!;
    const id = randomUUID();
    const start = entry({
      id,
      runId: id,
      kind: "run.start",
      payload: { templateId: t.id, templateKey: t.key, templateVersion: t.version, title: "Cooldown of Plover" },
    });
    const stray = entry({ runId: id, kind: "transfer", payload: run.built });
    const res = await appendEntries(db, tomasz, [start, stray]);
    expect(res.rejected).toEqual([expect.objectContaining({ id: stray.id, code: "bad_request:transfer" })]);
  });
});
