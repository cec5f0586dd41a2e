// The people-present rule (lib/record/people.ts), the visitor flag, and the transfer record a run
// builds (lib/procedures/transfer-record.ts) when its steps are missing or its template makes none.
import { describe, expect, it } from "vitest";
import { DEFAULT_TEMPLATES } from "@/db/seed-templates";
import { FLAG_LABEL, visitorFlag } from "@/lib/audit/flags";
import { deriveRun } from "@/lib/procedures/state";
import { makesTransferRecord, transferFromRun } from "@/lib/procedures/transfer-record";
import { peopleProblems, personLabel, secondPersonProblem, visitorEntry, visitorsIn } from "@/lib/record/people";
import type { Payload } from "@/lib/schemas/entry";
import { templateInputSchema } from "@/lib/schemas/run";
import { entryInput } from "../support/entries";

const known = [
  { id: "u-tomasz", active: true },
  { id: "u-priya", active: true },
  { id: "u-old", active: false },
];

describe("people present", () => {
  it("accepts known active users and named visitors", () => {
    expect(peopleProblems(["u-tomasz", "u-priya"], known)).toEqual([]);
    expect(peopleProblems(["u-tomasz", visitorEntry("  Jane   Roe ")], known)).toEqual([]);
    expect(visitorEntry("  Jane   Roe ")).toBe("visitor:Jane Roe");
    expect(visitorsIn(["u-tomasz", "visitor:Jane Roe"])).toEqual(["Jane Roe"]);
    expect(personLabel("visitor:Jane Roe", {})).toBe("Jane Roe (visitor)");
    expect(personLabel("u-tomasz", { "u-tomasz": "Tomasz Okafor" })).toBe("Tomasz Okafor");
  });

  it("refuses unknown ids, former users, unnamed or untidy visitors and duplicates", () => {
    expect(peopleProblems(["u-tomasz", "Jane"], known)).toEqual([expect.stringMatching(/not a user/)]);
    expect(peopleProblems(["u-old"], known)).toEqual([expect.stringMatching(/no longer has access/)]);
    expect(peopleProblems(["visitor:"], known)).toEqual([expect.stringMatching(/gives no name/)]);
    expect(peopleProblems(["visitor: Jane"], known)).toEqual([expect.stringMatching(/visitor:Jane/)]);
    expect(peopleProblems(["u-tomasz", "u-tomasz"], known)).toEqual([expect.stringMatching(/listed twice/)]);
    expect(peopleProblems(["visitor:Jane Roe", "visitor:JANE ROE"], known)).toHaveLength(1);
  });

  it("a second person is someone else than the recorder", () => {
    expect(secondPersonProblem("u-tomasz", "u-tomasz", known)).toMatch(/someone other/);
    expect(secondPersonProblem("u-priya", "u-tomasz", known)).toBeNull();
    expect(secondPersonProblem("visitor:Jane Roe", "u-tomasz", known)).toBeNull();
  });

  it("flags a visitor on a transfer for the auditor", () => {
    const payload = { peoplePresent: ["u-tomasz", "visitor:Jane Roe"] } as Payload<"transfer">;
    const rec = { id: "t", cryostatId: "plover", kind: "transfer" as const, payload, seq: 1, signatures: [] };
    expect(visitorFlag(rec)).toMatchObject({ code: "visitor_present", label: FLAG_LABEL.visitor_present });
    expect(visitorFlag({ ...rec, payload: { ...payload, peoplePresent: ["u-tomasz"] } })).toBeNull();
  });
});

describe("the transfer record of a run", () => {
  const tpl = DEFAULT_TEMPLATES.find((t) => t.key === "helium-transfer")!;
  const pinned = { id: crypto.randomUUID(), key: tpl.key, version: 1, title: tpl.title, steps: tpl.steps };

  it("only the helium transfer template makes one, and every default template stays valid", () => {
    expect(DEFAULT_TEMPLATES.filter((t) => makesTransferRecord(t.steps)).map((t) => t.key)).toEqual([
      "helium-transfer",
    ]);
    for (const t of DEFAULT_TEMPLATES) expect(templateInputSchema.safeParse(t).success, t.key).toBe(true);
    // A template version from before record fields (none named) is still valid and makes none.
    const old = tpl.steps.map(({ ...s }) => {
      if ("recordField" in s) delete s.recordField;
      return s;
    });
    expect(templateInputSchema.safeParse({ ...tpl, steps: old }).success).toBe(true);
    expect(makesTransferRecord(old)).toBe(false);
  });

  it("a template that names some record fields must name the levels and masses", () => {
    const partial = tpl.steps.map((s) => (s.id === "level-after" ? { ...s, recordField: undefined } : s));
    const res = templateInputSchema.safeParse({ ...tpl, steps: partial });
    expect(res.success).toBe(false);
    expect(JSON.stringify(res.error?.issues)).toMatch(/levelAfterPercent/);
  });

  it("is not built while the figures it needs are missing", () => {
    const id = crypto.randomUUID();
    const start = entryInput({
      id,
      runId: id,
      cryostatId: "plover",
      kind: "run.start",
      payload: { templateId: pinned.id, templateKey: tpl.key, templateVersion: 1, title: "Transfer" },
    });
    const built = transferFromRun(deriveRun(id, pinned, [start]));
    expect(built.ok).toBe(false);
    expect(built.ok ? [] : built.problems).toContain("The level before is not recorded in the run.");
  });
});
