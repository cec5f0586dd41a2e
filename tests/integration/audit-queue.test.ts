// The audit queue on the demo lab: the seeded one-person transfer and the transfer with no oxygen
// reading are queued with their flags; a finding with a password-confirmed "audited" signature
// takes a record out of the queue; an unconfirmed audit signature, or one on the record itself,
// is refused; the transfer table filters by flag and person.

import { randomUUID } from "node:crypto";
import { eq } from "drizzle-orm";
import { afterAll, describe, expect, it } from "vitest";
import { auditQueue, auditTable } from "@/db/queries/audit";
import { appendEntries } from "@/db/queries/entries";
import { users } from "@/db/schema";
import type { EntryInput } from "@/lib/schemas/entry";
import { hmacHex, passwordProofKey, signingMessage } from "@/lib/signing/proof";
import { recordHash } from "@/lib/sync/hash";
import { fileCheckpointKeys } from "@/server/audit/keys";
import { testDirs } from "../support/dirs";
import { entryBuilder, entryInput } from "../support/entries";
import { grace, tomasz } from "../support/users";
import { freshDb } from "./fixture";

const dirs = testDirs("rimelog-audit-keys-");
afterAll(() => dirs.remove());
const keys = fileCheckpointKeys(dirs.keyDir);
/** Grace's entries at the audit desk, written now. */
const fromDesk = entryBuilder({ authorId: grace.id, deviceId: "audit-desk" });

function finding(
  target: { id: string; cryostatId: string | null },
  verdict: "acceptable" | "needs_action",
): EntryInput {
  return fromDesk({
    cryostatId: target.cryostatId,
    kind: "audit.finding",
    payload: { targetEntryId: target.id, verdict, findings: "Checked.", flags: [] },
  });
}

function signature(target: EntryInput, passwordHash: string | null, over: Record<string, unknown> = {}): EntryInput {
  const signedHash = recordHash(target);
  const proof = passwordHash
    ? hmacHex(
        passwordProofKey(passwordHash),
        signingMessage({ signedEntryId: target.id, signedHash, meaning: "audited", signerId: grace.id }),
      )
    : undefined;
  return fromDesk({
    cryostatId: target.cryostatId,
    kind: "signature",
    payload: {
      signedEntryId: target.id,
      meaning: "audited",
      signerName: grace.name,
      signerRole: "safety_officer",
      signedHash,
      ...(proof ? { confirmedBy: "password", confirmProof: proof } : {}),
      ...over,
    },
  });
}

describe("audit queue", () => {
  it("queues the seeded transfers with their flags and takes a signed one out", async () => {
    const db = await freshDb({ seeded: true });
    // A one-person transfer (hand-made: the demo history's own may fall on a day without a transfer).
    const alone = entryInput({
      cryostatId: "plover",
      kind: "transfer",
      deviceId: "tab-9",
      payload: {
        supplyDewar: "D-250-B",
        peoplePresent: ["u-tomasz"],
        ppeConfirmed: true,
        oxygenMonitorChecked: true,
        oxygenLowestPercent: 20.7,
        levelBeforePercent: 31,
        levelAfterPercent: 80,
        suppliedLitres: 68,
        suppliedBy: "level",
        gainedLitres: 49,
        durationMin: 35,
        anomalies: "",
      },
    });
    expect((await appendEntries(db, tomasz, [alone])).rejected).toEqual([]);
    const queue = await auditQueue(db, { keys });
    const transfers = queue.filter((i) => i.entry.kind === "transfer");
    expect(transfers.length).toBeGreaterThan(4);
    const single = transfers.find((i) => i.entry.id === alone.id)!;
    expect(single.flags.map((f) => f.code)).toContain("single_person");
    const noOxygen = transfers.find(
      (i) => (i.entry.payload as { oxygenMonitorChecked: boolean }).oxygenMonitorChecked === false,
    )!;
    expect(noOxygen.flags.map((f) => f.code)).toContain("oxygen_check_missing");
    expect(queue.some((i) => i.entry.kind === "quench")).toBe(true);
    expect(
      single.figures && "efficiencyPercent" in single.figures ? single.figures.efficiencyPercent : null,
    ).toBeGreaterThan(50);

    const [g] = await db.select().from(users).where(eq(users.id, grace.id));
    const f = finding(single.entry, "needs_action");
    const res = await appendEntries(db, grace, [f, signature(f, g!.passwordHash)]);
    expect(res.rejected).toEqual([]);
    const after = await auditQueue(db, { keys });
    expect(after.some((i) => i.entry.id === single.entry.id)).toBe(false);
    expect(after.length).toBe(queue.length - 1);

    // A finding without its signature leaves the record in the queue.
    const f2 = finding(noOxygen.entry, "acceptable");
    expect((await appendEntries(db, grace, [f2])).rejected).toEqual([]);
    const still = (await auditQueue(db, { keys })).find((i) => i.entry.id === noOxygen.entry.id);
    expect(still?.findings).toHaveLength(1);
    expect(still?.verdict).toBeNull();

    const table = await auditTable(db, { keys, flag: "single_person" });
    expect(table.map((i) => i.entry.id)).toContain(single.entry.id);
    expect(table.every((i) => i.flags.some((x) => x.code === "single_person"))).toBe(true);
    const signed = table.find((i) => i.entry.id === single.entry.id)!;
    expect(signed.verdict).toBe("needs_action");
    expect(signed.findings[0]!.signatures[0]).toMatchObject({
      meaning: "audited",
      signerName: grace.name,
      confirmedBy: "password",
    });
    const byPriya = await auditTable(db, { keys, personId: "u-priya" });
    expect(byPriya.length).toBeGreaterThan(0);
    expect(byPriya.some((i) => i.entry.id === alone.id)).toBe(false);
  });

  it("refuses an audit signature without PIN or password, and one on the record itself", async () => {
    const db = await freshDb({ seeded: true });
    const [item] = (await auditQueue(db, { keys })).filter((i) => i.entry.kind === "transfer");
    const f = finding(item!.entry, "acceptable");
    const res = await appendEntries(db, grace, [f, signature(f, null)]);
    expect(res.rejected.map((r) => r.message)).toEqual([
      // Every signature needs a proof now (lib/record/rules.ts), an audit signature included.
      "A signature must be confirmed with the signer's PIN or password.",
    ]);
    const [g] = await db.select().from(users).where(eq(users.id, grace.id));
    const onRecord = signature(item!.entry as EntryInput, g!.passwordHash);
    const res2 = await appendEntries(db, grace, [onRecord]);
    expect(res2.rejected[0]?.message).toMatch(/signs the officer's finding/);
  });

  it("refuses a finding on an entry that is not audited", async () => {
    const db = await freshDb({ seeded: true });
    const level = { id: randomUUID(), cryostatId: "wren" };
    const res = await appendEntries(db, grace, [finding(level, "acceptable")]);
    expect(res.rejected[0]?.message).toMatch(/not on the server/);
  });
});
