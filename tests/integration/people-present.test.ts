// Who may be listed as present (lib/record/people.ts), held by the server: a transfer's people
// present and a procedure step's second person are known active users of the facility or named,
// marked visitors; anyone else is refused with its own code, the rest of the push is stored, and
// a visitor is flagged for the auditor.
import { randomUUID } from "node:crypto";
import { eq } from "drizzle-orm";
import { afterAll, describe, expect, it } from "vitest";
import { auditQueue } from "@/db/queries/audit";
import { appendEntries } from "@/db/queries/entries";
import { latestTemplates } from "@/db/queries/templates";
import { users } from "@/db/schema";
import type { Payload } from "@/lib/schemas/entry";
import { fileCheckpointKeys } from "@/server/audit/keys";
import { testDirs } from "../support/dirs";
import { entryBuilder, note } from "../support/entries";
import { priya, tomasz } from "../support/users";
import { freshDb } from "./fixture";

const dirs = testDirs("rimelog-people-keys-");
afterAll(() => dirs.remove());
const keys = fileCheckpointKeys(dirs.keyDir);
const entry = entryBuilder({ cryostatId: "plover" });

/** A form transfer on Plover with these people present (the figures are the demo lab's, invented). */
function transfer(peoplePresent: string[]) {
  const payload: Payload<"transfer"> = {
    supplyDewar: "D-250-B",
    peoplePresent,
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
  };
  return entry({ kind: "transfer", payload });
}

describe("people present at a transfer", () => {
  it("refuses an id that belongs to nobody, alone, and keeps the rest of the push", async () => {
    const db = await freshDb({ seeded: true });
    const ghost = transfer([tomasz.id, "u-nobody"]);
    const n = note("Level checked.", { cryostatId: "plover" });
    const res = await appendEntries(db, tomasz, [ghost, n]);
    expect(res.rejected).toEqual([expect.objectContaining({ id: ghost.id, code: "bad_request:people" })]);
    expect(res.rejected[0]!.message).toMatch(/"u-nobody" is not a user of this facility/);
    expect(res.accepted.map((a) => a.id)).toEqual([n.id]);
  });

  it("refuses a former user, a visitor without a name and a person listed twice", async () => {
    const db = await freshDb({ seeded: true });
    await db.update(users).set({ active: false }).where(eq(users.id, priya.id));
    const res = await appendEntries(db, tomasz, [
      transfer([tomasz.id, priya.id]),
      transfer([tomasz.id, "visitor:  "]),
      transfer([tomasz.id, "visitor:Jane Roe", "visitor:jane roe"]),
    ]);
    expect(res.rejected.map((r) => r.code)).toEqual(["bad_request:people", "bad_request:people", "bad_request:people"]);
    expect(res.rejected.map((r) => r.message)).toEqual([
      expect.stringMatching(/no longer has access/),
      expect.stringMatching(/gives no name/),
      expect.stringMatching(/listed twice/),
    ]);
  });

  it("accepts a known person, and a visitor flagged for the auditor", async () => {
    const db = await freshDb({ seeded: true });
    const known = transfer([tomasz.id, priya.id]);
    const visitor = transfer([tomasz.id, "visitor:Jane Roe"]);
    expect((await appendEntries(db, tomasz, [known, visitor])).rejected).toEqual([]);
    const queue = await auditQueue(db, { keys });
    const k = queue.find((i) => i.entry.id === known.id)!;
    const v = queue.find((i) => i.entry.id === visitor.id)!;
    expect(k.flags.map((f) => f.code)).not.toContain("visitor_present");
    expect(k.flags.map((f) => f.code)).not.toContain("single_person");
    expect(v.flags.find((f) => f.code === "visitor_present")).toMatchObject({
      label: "Visitor listed as present",
      detail: expect.stringContaining("Jane Roe"),
    });
    expect(v.peopleNames).toEqual([tomasz.name, "Jane Roe (visitor)"]);
    // The demo lab's own visitor (db/seed.ts) went through the same checks and is flagged too.
    const demo = queue.filter((i) => i.peopleNames.includes("Noor Castellanos (visitor)"));
    expect(demo).toHaveLength(1);
    expect(demo[0]!.flags.map((f) => f.code)).toContain("visitor_present");
  });
});

describe("the second person of a procedure step", () => {
  it("refuses an unknown id and the recorder themselves; accepts a known person and a visitor", async () => {
    const db = await freshDb({ seeded: true });
    const t = (await latestTemplates(db)).find((x) => x.key === "helium-transfer")!;
    const id = randomUUID();
    const start = entry({
      id,
      runId: id,
      kind: "run.start",
      payload: { templateId: t.id, templateKey: t.key, templateVersion: t.version, title: "Helium transfer, Plover" },
    });
    const people = (secondPersonId: string) =>
      entry({ runId: id, kind: "run.step", payload: { stepId: "people", kind: "check", secondPersonId } });
    const ghost = people("u-nobody");
    const self = people(tomasz.id);
    const known = people(priya.id);
    const visitor = people("visitor:Jane Roe");
    const res = await appendEntries(db, tomasz, [start, ghost, self, known, visitor]);
    expect(res.rejected).toEqual([
      expect.objectContaining({ id: ghost.id, code: "bad_request:people" }),
      expect.objectContaining({ id: self.id, code: "bad_request:people" }),
    ]);
    expect(res.accepted.map((a) => a.id)).toEqual([start.id, known.id, visitor.id]);
  });
});
