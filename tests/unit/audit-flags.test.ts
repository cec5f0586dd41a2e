// Every audit flag on hand-made records, on both sides of its threshold. Thresholds come from the
// facility rules (the demo lab's values, db/seed.ts DEMO_RULES: alarm 19.5 %, two-person rule on,
// Plover minimum 25 %). The efficiency band 40–95 % is common practice (transfer losses of 20–40 %
// are usual), overridable by the facility.
import { describe, expect, it } from "vitest";
import { DEMO_RULES } from "@/db/seed";
import {
  type AuditRecord,
  chainBrokenFlag,
  efficiencyFlag,
  flagsFor,
  gainedMoreThanTakenFlag,
  levelBelowMinimumFlag,
  missingSignatureFlag,
  oxygenAlarmFlag,
  oxygenCheckFlag,
  ppeFlag,
  singlePersonFlag,
} from "@/lib/audit/flags";
import type { Payload } from "@/lib/schemas/entry";

const rules = DEMO_RULES;
const ctx = { rules, chainBreakSeq: null };

function transfer(
  over: Partial<Payload<"transfer">> = {},
  rec: Partial<Omit<AuditRecord, "kind" | "payload">> = {},
): AuditRecord {
  return {
    id: "t1",
    kind: "transfer",
    cryostatId: "plover",
    seq: 100,
    signatures: [{ meaning: "performed", signerId: "u-tomasz" }],
    payload: {
      supplyDewar: "D-250-A",
      peoplePresent: ["u-tomasz", "u-priya"],
      ppeConfirmed: true,
      oxygenMonitorChecked: true,
      oxygenLowestPercent: 20.6,
      levelBeforePercent: 30,
      levelAfterPercent: 80,
      suppliedLitres: 70,
      suppliedBy: "level",
      gainedLitres: 50,
      durationMin: 35,
      anomalies: "",
      ...over,
    },
    ...rec,
  };
}

const quench = (over: Partial<Payload<"quench">> = {}): AuditRecord => ({
  id: "q1",
  kind: "quench",
  cryostatId: "plover",
  seq: 120,
  signatures: [],
  payload: { at: "2026-11-20T13:00:00.000Z", fieldT: 9.5, actions: "Left the room.", ...over },
});

describe("a clean transfer", () => {
  it("raises no flag at all", () => {
    expect(flagsFor(transfer(), ctx)).toEqual([]);
  });
});

describe("single person where the two-person rule applies", () => {
  it("flags one person", () => {
    expect(singlePersonFlag(transfer({ peoplePresent: ["u-tomasz"] }), ctx)?.code).toBe("single_person");
  });
  it("does not flag two people", () => {
    expect(singlePersonFlag(transfer({ peoplePresent: ["u-tomasz", "u-priya"] }), ctx)).toBeNull();
  });
  it("counts the same person twice as one", () => {
    expect(singlePersonFlag(transfer({ peoplePresent: ["u-tomasz", "u-tomasz"] }), ctx)?.code).toBe("single_person");
  });
  it("does not flag one person when the facility has no two-person rule", () => {
    expect(
      singlePersonFlag(transfer({ peoplePresent: ["u-tomasz"] }), { rules: { ...rules, twoPersonTransfer: false } }),
    ).toBeNull();
  });
});

describe("PPE not confirmed", () => {
  it("flags ppeConfirmed false", () =>
    expect(ppeFlag(transfer({ ppeConfirmed: false }))?.code).toBe("ppe_not_confirmed"));
  it("does not flag ppeConfirmed true", () => expect(ppeFlag(transfer({ ppeConfirmed: true }))).toBeNull());
});

describe("oxygen check missing", () => {
  it("flags no check and no reading", () => {
    expect(oxygenCheckFlag(transfer({ oxygenMonitorChecked: false, oxygenLowestPercent: undefined }))?.code).toBe(
      "oxygen_check_missing",
    );
  });
  it("flags a check without its reading", () => {
    expect(oxygenCheckFlag(transfer({ oxygenMonitorChecked: true, oxygenLowestPercent: undefined }))?.detail).toMatch(
      /not recorded/,
    );
  });
  it("does not flag a check with its reading", () => {
    expect(oxygenCheckFlag(transfer({ oxygenMonitorChecked: true, oxygenLowestPercent: 20.8 }))).toBeNull();
  });
});

describe("oxygen reading below the alarm level (19.5 %)", () => {
  it("flags 19.4 % on a transfer", () =>
    expect(oxygenAlarmFlag(transfer({ oxygenLowestPercent: 19.4 }), ctx)?.code).toBe("oxygen_below_alarm"));
  it("does not flag exactly 19.5 %", () =>
    expect(oxygenAlarmFlag(transfer({ oxygenLowestPercent: 19.5 }), ctx)).toBeNull());
  it("flags a quench whose lowest reading was 18.9 %", () =>
    expect(oxygenAlarmFlag(quench({ oxygenLowestPercent: 18.9 }), ctx)?.code).toBe("oxygen_below_alarm"));
  it("does not flag a quench at 20.4 %", () =>
    expect(oxygenAlarmFlag(quench({ oxygenLowestPercent: 20.4 }), ctx)).toBeNull());
  it("follows the facility's own alarm level", () => {
    expect(
      oxygenAlarmFlag(transfer({ oxygenLowestPercent: 19.8 }), { rules: { ...rules, oxygenAlarmPercent: 20 } })?.code,
    ).toBe("oxygen_below_alarm");
  });
});

describe("litres that do not add up: gained more than taken", () => {
  it("flags 50.1 L gained of 50 L taken", () =>
    expect(gainedMoreThanTakenFlag(transfer({ suppliedLitres: 50, gainedLitres: 50.1 }))?.code).toBe(
      "gained_more_than_taken",
    ));
  it("does not flag 50 L gained of 50 L taken", () =>
    expect(gainedMoreThanTakenFlag(transfer({ suppliedLitres: 50, gainedLitres: 50 }))).toBeNull());
});

describe("efficiency outside the plausible band (40–95 %)", () => {
  it("flags 39 % (39 of 100 L)", () =>
    expect(efficiencyFlag(transfer({ suppliedLitres: 100, gainedLitres: 39 }), ctx)?.code).toBe(
      "efficiency_implausible",
    ));
  it("does not flag 40 %", () =>
    expect(efficiencyFlag(transfer({ suppliedLitres: 100, gainedLitres: 40 }), ctx)).toBeNull());
  it("does not flag 95 %", () =>
    expect(efficiencyFlag(transfer({ suppliedLitres: 100, gainedLitres: 95 }), ctx)).toBeNull());
  it("flags 96 %", () =>
    expect(efficiencyFlag(transfer({ suppliedLitres: 100, gainedLitres: 96 }), ctx)?.detail).toMatch(/96 %/));
  it("uses the facility's band when set", () => {
    const own = { rules: { ...rules, transferEfficiencyMinPercent: 60, transferEfficiencyMaxPercent: 90 } };
    expect(efficiencyFlag(transfer({ suppliedLitres: 100, gainedLitres: 55 }), own)?.code).toBe(
      "efficiency_implausible",
    );
    expect(efficiencyFlag(transfer({ suppliedLitres: 100, gainedLitres: 65 }), own)).toBeNull();
  });
  it("leaves gained > taken to its own flag", () =>
    expect(efficiencyFlag(transfer({ suppliedLitres: 50, gainedLitres: 60 }), ctx)).toBeNull());
});

describe("level below the cryostat's minimum (Plover 25 %)", () => {
  it("flags a level before of 24.9 %", () =>
    expect(levelBelowMinimumFlag(transfer({ levelBeforePercent: 24.9 }), ctx)?.code).toBe("level_below_minimum"));
  it("does not flag 25 %", () => expect(levelBelowMinimumFlag(transfer({ levelBeforePercent: 25 }), ctx)).toBeNull());
  it("flags a quench that left the level at 12 %", () =>
    expect(levelBelowMinimumFlag(quench({ levelBeforePercent: 43, levelAfterPercent: 12 }), ctx)?.code).toBe(
      "level_below_minimum",
    ));
  it("does not flag a cryostat without a minimum (Heron)", () => {
    expect(levelBelowMinimumFlag(transfer({ levelBeforePercent: 5 }, { cryostatId: "heron" }), ctx)).toBeNull();
  });
});

describe("missing signature", () => {
  it("flags a record nobody signed", () =>
    expect(missingSignatureFlag(transfer({}, { signatures: [] }))?.code).toBe("missing_signature"));
  it("does not flag a record signed as performed", () => expect(missingSignatureFlag(transfer())).toBeNull());
  it("does not count a handover acceptance as signing the work", () => {
    expect(
      missingSignatureFlag(transfer({}, { signatures: [{ meaning: "accepted", signerId: "u-priya" }] }))?.code,
    ).toBe("missing_signature");
  });
});

describe("broken hash chain", () => {
  it("flags a record at the first bad entry", () =>
    expect(chainBrokenFlag(transfer(), { rules, chainBreakSeq: 100 })?.code).toBe("chain_broken"));
  it("flags a record after the break", () =>
    expect(chainBrokenFlag(transfer(), { rules, chainBreakSeq: 99 })?.code).toBe("chain_broken"));
  it("does not flag a record before the break", () =>
    expect(chainBrokenFlag(transfer(), { rules, chainBreakSeq: 101 })).toBeNull());
  it("does not flag when the chain verifies", () =>
    expect(chainBrokenFlag(transfer(), { rules, chainBreakSeq: null })).toBeNull());
});

describe("the demo's flagged transfer", () => {
  it("one person and no oxygen reading raises exactly those two flags (signed record)", () => {
    const codes = flagsFor(
      transfer({ peoplePresent: ["u-tomasz"], oxygenMonitorChecked: false, oxygenLowestPercent: undefined }),
      ctx,
    ).map((f) => f.code);
    expect(codes).toEqual(["single_person", "oxygen_check_missing"]);
  });
});
