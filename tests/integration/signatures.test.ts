// Signatures on the server: bound to the exact record by recordHash (RFC 8785 canonical
// JSON, SHA-256), refused when the record changed after signing, refused for a role that may not
// sign that meaning, and refused on procedure records without a checked PIN/password proof.
import { createHash, randomBytes, randomUUID } from "node:crypto";
import canonicalize from "canonicalize";
import { eq } from "drizzle-orm";
import { describe, expect, it } from "vitest";
import type { Db } from "@/db/client";
import { appendEntries } from "@/db/queries/entries";
import { latestTemplates } from "@/db/queries/templates";
import { users } from "@/db/schema";
import type { EntryInput, SignatureMeaning, UncheckedEntry } from "@/lib/schemas/entry";
import type { SessionUser } from "@/lib/schemas/user";
import {
  derivePinKey,
  hmacHex,
  PIN_ITERATIONS,
  passwordProofKey,
  signingMessage,
  verifierOf,
} from "@/lib/signing/proof";
import { signatureEntry, signingSubject } from "@/lib/signing/sign";
import { recordHash } from "@/lib/sync/hash";
import { entryBuilder } from "../support/entries";
import { setTestPin } from "../support/signing";
import { grace, priya, tomasz } from "../support/users";
import { freshDb } from "./fixture";

/** Tomasz's entries on Heron, written now. */
const entry = entryBuilder({ cryostatId: "heron" });

async function startRun(db: Db) {
  const t = (await latestTemplates(db)).find((x) => x.key === "cooldown-dry-dilution")!;
  const id = randomUUID();
  const start = entry({
    id,
    runId: id,
    kind: "run.start",
    payload: { templateId: t.id, templateKey: t.key, templateVersion: t.version, title: "Cooldown of Heron" },
  });
  const hold = entry({
    runId: id,
    kind: "run.step",
    payload: { stepId: "hold-precool", kind: "hold", statement: "Pre-cool finished." },
  });
  const res = await appendEntries(db, tomasz, [start, hold]);
  expect(res.rejected).toEqual([]);
  return { start, hold };
}

async function pinSignature(
  db: Db,
  target: EntryInput,
  signer: SessionUser,
  meaning: SignatureMeaning,
  pin = "482916",
) {
  const { key } = await setTestPin(db, signer.id, pin);
  const subject = signingSubject(target, signer, meaning);
  return signatureEntry({
    target,
    subject,
    signer,
    deviceId: "tab-1",
    confirmedBy: "pin",
    proof: hmacHex(key, signingMessage(subject)),
  });
}

describe("signatures", () => {
  it("recordHash is SHA-256 of the RFC 8785 canonical JSON (checked with canonicalize + node:crypto directly)", () => {
    // Extra payload fields on purpose (hashing sees any JSON): not an entry the schema would pass.
    const e: UncheckedEntry = {
      ...entry({ kind: "note", payload: { text: "" } }),
      payload: { text: "Cafe\u0301 ok", b: 1, a: [2, 1] },
    };
    const content = {
      id: e.id,
      cryostatId: e.cryostatId,
      runId: e.runId,
      kind: e.kind,
      payload: { text: "Café ok", b: 1, a: [2, 1] },
      authorId: e.authorId,
      deviceId: e.deviceId,
      recordedAt: e.recordedAt,
      supersedes: null,
      reason: null,
    };
    expect(recordHash(e)).toBe(createHash("sha256").update(canonicalize(content)!).digest("hex"));
  });

  it("accepts a PIN-confirmed hold-point signature and refuses the same record after one field changed", async () => {
    const db = await freshDb({ seeded: true });
    const { hold } = await startRun(db);
    const sig = await pinSignature(db, hold, tomasz, "verified");
    expect((await appendEntries(db, tomasz, [sig])).rejected).toEqual([]);

    // Tampered: the signed record's content changed after signing (a new record with the old id
    // cannot be stored, so the tampering shows as a signature whose hash no longer matches).
    const hold2 = entry({
      runId: hold.runId,
      kind: "run.step",
      payload: { stepId: "hold-precool", kind: "hold", statement: "Pre-cool finished." },
    });
    const sig2 = await pinSignature(db, hold2, tomasz, "verified");
    const changed = { ...hold2, payload: { ...hold2.payload, statement: "Pre-cool NOT finished." } };
    const res = await appendEntries(db, tomasz, [changed, sig2]);
    expect(res.accepted.map((a) => a.id)).toEqual([changed.id]);
    expect(res.rejected).toEqual([
      { id: sig2.id, code: "conflict:signature", message: expect.stringMatching(/changed after signing/) },
    ]);
  });

  it("refuses a signature moved onto another record", async () => {
    const db = await freshDb({ seeded: true });
    const { start, hold } = await startRun(db);
    const sig = await pinSignature(db, hold, tomasz, "verified");
    const moved = { ...sig, payload: { ...sig.payload, signedEntryId: start.id } };
    const res = await appendEntries(db, tomasz, [moved]);
    expect(res.rejected[0]?.code).toBe("conflict:signature");
  });

  it("refuses a procedure signature without an identity proof, with a proof made for another meaning, or with a wrong PIN", async () => {
    const db = await freshDb({ seeded: true });
    const { hold } = await startRun(db);
    const good = await pinSignature(db, hold, tomasz, "verified");
    const bare = {
      ...good,
      id: randomUUID(),
      payload: { ...good.payload, confirmedBy: undefined, confirmProof: undefined },
    };
    // The proof covers the meaning too: the same proof under another meaning is refused.
    const reused = { ...good, id: randomUUID(), payload: { ...good.payload, meaning: "performed" as const } };
    const res = await appendEntries(db, tomasz, [bare, reused]);
    expect(res.rejected.map((r) => r.code)).toEqual(["forbidden:signature", "forbidden:signature"]);

    const { key } = await setTestPin(db, tomasz.id, "111111");
    const wrongKey = await derivePinKey("222222", "AAAAAAAAAAAAAAAAAAAAAA==", 1000);
    expect(wrongKey).not.toBe(key);
    const subject = signingSubject(hold, tomasz, "verified");
    const wrong = signatureEntry({
      target: hold,
      subject,
      signer: tomasz,
      deviceId: "tab-1",
      confirmedBy: "pin",
      proof: hmacHex(wrongKey, signingMessage(subject)),
    });
    expect((await appendEntries(db, tomasz, [wrong])).rejected[0]?.code).toBe("forbidden:signature");
  });

  it("accepts a password-confirmed signature (proof keyed by the stored password hash)", async () => {
    const db = await freshDb({ seeded: true });
    const { hold } = await startRun(db);
    const [row] = await db.select().from(users).where(eq(users.id, tomasz.id));
    const subject = signingSubject(hold, tomasz, "verified");
    const sig = signatureEntry({
      target: hold,
      subject,
      signer: tomasz,
      deviceId: "tab-1",
      confirmedBy: "password",
      proof: hmacHex(passwordProofKey(row!.passwordHash), signingMessage(subject)),
    });
    expect((await appendEntries(db, tomasz, [sig])).rejected).toEqual([]);
  });

  it("refuses a meaning the signer's role may not sign, and a signer role that is not the session's", async () => {
    const db = await freshDb({ seeded: true });
    const { hold } = await startRun(db);
    const sig = await pinSignature(db, hold, tomasz, "audited");
    expect((await appendEntries(db, tomasz, [sig])).rejected[0]?.code).toBe("forbidden:signature");
    const asGrace = await pinSignature(db, hold, grace, "verified");
    const claimed = { ...asGrace, payload: { ...asGrace.payload, signerRole: "technician" as const } };
    expect((await appendEntries(db, grace, [claimed])).rejected[0]?.code).toBe("forbidden:signature");
    // And nobody can push a signature in someone else's name.
    const forPriya = await pinSignature(db, hold, priya, "verified");
    expect((await appendEntries(db, tomasz, [forPriya])).rejected[0]?.code).toBe("forbidden:author");
  });

  it("the PIN verifier the tablet keeps cannot itself make a proof", async () => {
    const salt = randomBytes(16).toString("base64");
    const key = await derivePinKey("482916", salt, 1000);
    const verifier = verifierOf(key);
    expect(verifier).not.toBe(key);
    expect(hmacHex(verifier, "m")).not.toBe(hmacHex(key, "m"));
    expect(PIN_ITERATIONS).toBeGreaterThanOrEqual(600_000);
  });
});
