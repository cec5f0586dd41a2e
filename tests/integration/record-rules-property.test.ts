// A seeded random property over the record rules (lib/record/rules.ts): pushes from several
// signed-in users, mixing honest entries with forged corrections (other kinds, others' records,
// no reason), completions of a run with nothing done (signed or not), replayed and renamed
// signatures and unstorable text. Whatever arrives, in whatever order and batching:
// - the push never fails as a whole (no exception: the route would answer 500);
// - the quench stays in the audit queue, as itself or as its author's own correction;
// - the run stays open;
// - every stored signature is its author's, under the name and role of the user record, once per
//   record and meaning.
import { randomUUID } from "node:crypto";
import { eq } from "drizzle-orm";
import fc from "fast-check";
import { afterAll, describe, expect, it } from "vitest";
import { auditQueue } from "@/db/queries/audit";
import { listRuns } from "@/db/queries/runs";
import { latestTemplates } from "@/db/queries/templates";
import { entries, signatures, users } from "@/db/schema";
import type { EntryInput } from "@/lib/schemas/entry";
import type { SessionUser } from "@/lib/schemas/user";
import { fileCheckpointKeys } from "@/server/audit/keys";
import { applyPush } from "@/server/sync/apply";
import { testDirs } from "../support/dirs";
import { entryBuilder } from "../support/entries";
import { passwordSignature } from "../support/signing";
import { registeredDeviceId, wire } from "../support/tablet";
import { grace, mateo, priya, tomasz } from "../support/users";
import { freshDb } from "./fixture";

const dirs = testDirs("rimelog-record-property-");
afterAll(() => dirs.remove());
const keys = fileCheckpointKeys(dirs.keyDir);
const PEOPLE: SessionUser[] = [tomasz, priya, mateo, grace];
const onHeron = entryBuilder({ cryostatId: "heron" });
type Fields = Parameters<typeof onHeron>[0];

const quenchOf = (by: SessionUser, over: Partial<EntryInput> = {}) =>
  onHeron({
    kind: "quench",
    authorId: by.id,
    payload: { at: "2026-12-01T10:00:00.000Z", fieldT: 6.2, actions: "Heater off." },
    ...over,
  } as Fields);

type Action =
  | { t: "correct"; by: number; kind: "quench" | "incident" | "note"; reason: string }
  | { t: "complete"; by: number; signed: boolean }
  | { t: "replay"; by: number; rename: boolean }
  | { t: "rename"; by: number }
  | { t: "badText"; by: number };

const who = fc.integer({ min: 0, max: PEOPLE.length - 1 });
const action: fc.Arbitrary<Action> = fc.oneof(
  fc.record({
    t: fc.constant("correct" as const),
    by: who,
    kind: fc.constantFrom("quench" as const, "incident" as const, "note" as const),
    reason: fc.constantFrom("", "  ", "typo"),
  }),
  fc.record({ t: fc.constant("complete" as const), by: who, signed: fc.boolean() }),
  fc.record({ t: fc.constant("replay" as const), by: who, rename: fc.boolean() }),
  fc.record({ t: fc.constant("rename" as const), by: who }),
  fc.record({ t: fc.constant("badText" as const), by: who }),
);

describe("record rules under random forged pushes", () => {
  it("never fail a push, never hide the quench, never complete the run, never store a false signature", async () => {
    await fc.assert(
      fc.asyncProperty(
        fc.array(action, { minLength: 1, maxLength: 8 }),
        fc.integer({ min: 1, max: 3 }),
        async (plan, per) => {
          const db = await freshDb({ seeded: true });
          await registeredDeviceId(db, [tomasz, priya, mateo, grace]);
          const q = quenchOf(tomasz);
          const qSig = await passwordSignature(db, q, tomasz, "performed");
          const t = (await latestTemplates(db)).find((x) => x.key === "cooldown-dry-dilution")!;
          const runId = randomUUID();
          const start = onHeron({
            id: runId,
            runId,
            kind: "run.start",
            payload: { templateId: t.id, templateKey: t.key, templateVersion: t.version, title: "Cooldown" },
          });
          expect((await applyPush(db, tomasz, wire({ entries: [q, qSig, start] }))).rejected).toEqual([]);

          // Each person's forged entries, in the order planned, sent in batches of `per`.
          const queues = new Map<string, EntryInput[]>();
          for (const a of plan) {
            const u = PEOPLE[a.by]!;
            const list = queues.get(u.id) ?? [];
            if (a.t === "correct") {
              const payload =
                a.kind === "quench"
                  ? { at: "2026-12-01T10:00:00.000Z", fieldT: 5.9, actions: "Heater off." }
                  : a.kind === "incident"
                    ? { title: "Nothing happened", description: "", actions: "" }
                    : { text: "nothing" };
              list.push(
                onHeron({ kind: a.kind, authorId: u.id, payload, supersedes: q.id, reason: a.reason } as Fields),
              );
            } else if (a.t === "complete") {
              const done = onHeron({ runId, kind: "run.complete", authorId: u.id, payload: {} });
              list.push(done);
              if (a.signed) list.push(await passwordSignature(db, done, u, "performed"));
            } else if (a.t === "replay") {
              list.push({
                ...qSig,
                id: randomUUID(),
                authorId: u.id,
                payload: { ...qSig.payload, ...(a.rename ? { signerName: u.name, signerRole: u.role } : {}) },
              });
            } else if (a.t === "rename") {
              const s = await passwordSignature(db, q, u, "verified");
              list.push({ ...s, payload: { ...s.payload, signerName: grace.name } });
            } else {
              list.push(onHeron({ kind: "note", authorId: u.id, payload: { text: `bad \u0000 ${u.name}` } }));
            }
            queues.set(u.id, list);
          }
          for (const [userId, list] of queues) {
            const u = PEOPLE.find((p) => p.id === userId)!;
            for (let i = 0; i < list.length; i += per) {
              // Never throws: a bad entry is answered per entry, the rest stored.
              const reply = await applyPush(db, u, wire({ entries: list.slice(i, i + per) }));
              expect(reply.accepted.length + reply.rejected.length).toBeGreaterThan(0);
            }
          }

          // The quench is still to be audited: itself, or Tomasz's own correction of it as a quench.
          const queue = await auditQueue(db, { keys });
          const lineage = queue.filter((i) => i.entry.id === q.id || i.corrects?.entry.id === q.id);
          expect(lineage.length).toBeGreaterThan(0);
          for (const i of lineage) {
            expect(i.entry.kind).toBe("quench");
            expect(i.entry.authorId).toBe(tomasz.id);
          }
          // The run with nothing done is still open.
          expect((await listRuns(db, { cryostatId: "heron" })).find((r) => r.id === runId)?.status).toBe("open");
          // Every signature stored on these records is its author's, under the user record's name, once.
          const sigs = await db
            .select({ s: signatures, payload: entries.payload, name: users.name, role: users.role })
            .from(signatures)
            .innerJoin(entries, eq(entries.id, signatures.entryId))
            .innerJoin(users, eq(users.id, signatures.signerId))
            .where(eq(signatures.signedEntryId, q.id));
          const seen = new Set<string>();
          for (const x of sigs) {
            const p = x.payload as { signerName: string; signerRole: string };
            expect([p.signerName, p.signerRole]).toEqual([x.name, x.role]);
            const key = `${x.s.signerId}|${x.s.meaning}`;
            expect(seen.has(key)).toBe(false);
            seen.add(key);
          }
          // No unstorable text reached the log.
          const notes = await db.select({ payload: entries.payload }).from(entries).where(eq(entries.kind, "note"));
          expect(notes.some((n) => JSON.stringify(n.payload).includes("\\u0000"))).toBe(false);
        },
      ),
      { numRuns: 12, seed: 20261202 },
    );
  }, 240_000);
});
