// Changing the facility rules: each change is a hash-chained `rules.change` entry on the facility
// chain with the old and new value of every changed setting; a stale version is refused; only the
// facility admin may change them.
import { describe, expect, it } from "vitest";
import { appendEntries, chainEntries } from "@/db/queries/entries";
import { changeRules, getRules } from "@/db/queries/rules";
import { AppError } from "@/lib/errors";
import { ines, tomasz } from "../support/users";
import { freshDb } from "./fixture";

describe("facility rules changes", () => {
  it("writes an audited rules.change entry with old and new values and puts the new version in force", async () => {
    const db = await freshDb({ seeded: true });
    const before = (await getRules(db))!;
    const after = await changeRules(db, ines, {
      values: { ...before.values, oxygenAlarmPercent: 19.8, transferEfficiencyMinPercent: 45 },
      reason: "New monitors",
      expectedVersion: before.version,
    });
    expect(after.version).toBe(before.version + 1);
    expect(after.values.oxygenAlarmPercent).toBe(19.8);
    const chain = await chainEntries(db, "facility");
    const change = chain.find((e) => e.kind === "rules.change")!;
    expect(change.authorId).toBe("u-ines");
    expect(change.payload).toMatchObject({ version: after.version, reason: "New monitors" });
    expect((change.payload as { changes: unknown[] }).changes).toEqual([
      { field: "oxygenAlarmPercent", from: 19.5, to: 19.8 },
      { field: "transferEfficiencyMinPercent", from: null, to: 45 },
    ]);
  });

  it("refuses a change made from an older version, and a change that changes nothing", async () => {
    const db = await freshDb({ seeded: true });
    const r = (await getRules(db))!;
    await changeRules(db, ines, {
      values: { ...r.values, forecastWarnDays: 5 },
      reason: "Longer notice",
      expectedVersion: r.version,
    });
    await expect(
      changeRules(db, ines, {
        values: { ...r.values, forecastWarnDays: 7 },
        reason: "Other",
        expectedVersion: r.version,
      }),
    ).rejects.toThrow(/changed the rules meanwhile/);
    const now = (await getRules(db))!;
    await expect(
      changeRules(db, ines, { values: now.values, reason: "Same", expectedVersion: now.version }),
    ).rejects.toBeInstanceOf(AppError);
    expect((await getRules(db))!.values.forecastWarnDays).toBe(5);
  });

  it("refuses a rules.change entry from a technician", async () => {
    const db = await freshDb({ seeded: true });
    const r = (await getRules(db))!;
    await expect(
      changeRules(db, tomasz, {
        values: { ...r.values, twoPersonTransfer: false },
        reason: "No",
        expectedVersion: r.version,
      }),
    ).rejects.toThrow(/may not record/);
    expect((await getRules(db))!.version).toBe(r.version);
    const res = await appendEntries(db, tomasz, []);
    expect(res.accepted).toEqual([]);
  });
});
