// Automatic audit flags: one pure function per flag, each reading its threshold from the facility
// rules. A flag is raised (returned) or not (null); the audit queue, the transfer table, the CSV
// and the PDF report all show the same flags, computed by `flagsFor`.
import { transferEfficiency } from "@/lib/cryo";
import { visitorsIn } from "@/lib/record/people";
import type { EntryFields } from "@/lib/schemas/entry";
import type { FacilityRulesValues } from "@/lib/schemas/rules";

export const FLAG_CODES = [
  "single_person",
  "ppe_not_confirmed",
  "oxygen_check_missing",
  "oxygen_below_alarm",
  "gained_more_than_taken",
  "efficiency_implausible",
  "level_below_minimum",
  "missing_signature",
  "chain_broken",
  "visitor_present",
  "procedure_flags",
] as const;
export type FlagCode = (typeof FLAG_CODES)[number];

export const FLAG_LABEL: Record<FlagCode, string> = {
  single_person: "Single person",
  ppe_not_confirmed: "PPE not confirmed",
  oxygen_check_missing: "Oxygen check missing",
  oxygen_below_alarm: "Oxygen below alarm level",
  gained_more_than_taken: "Gained more than taken",
  efficiency_implausible: "Efficiency outside plausible band",
  level_below_minimum: "Level below minimum",
  missing_signature: "Missing signature",
  chain_broken: "Hash chain broken",
  visitor_present: "Visitor listed as present",
  procedure_flags: "Flagged during the procedure",
};

export type Flag = { code: FlagCode; label: string; detail: string };

export type AuditKind = "transfer" | "quench" | "incident";

/**
 * What the flags look at: the record (kind and payload typed together, so testing the kind types
 * the payload), the signatures on it, and the state of its chain.
 */
export type AuditRecord = EntryFields<"id" | "cryostatId"> & {
  seq: number;
  /** Signatures on this record (meaning, signer), not counting the officer's own audit signature. */
  signatures: { meaning: string; signerId: string }[];
  /**
   * For a transfer record made by a procedure run: the run's title and its flags as the auditor
   * reads them (lib/procedures/transfer-record.ts runFlagsForAudit). Absent for other records.
   */
  run?: { title: string; flags: string[] } | null;
};

export type AuditContext = {
  rules: FacilityRulesValues;
  /** seq of the first bad entry of the record's chain, or null when the chain verified. */
  chainBreakSeq?: number | null;
};

/**
 * Default plausible band for transfer efficiency when the facility sets none: 40–95 %.
 * [practice] transfer losses of 20–40 % are usual (common practice); below 40 % suggests a
 * wrong figure or a bad line, above 95 % is better than a warm transfer line allows.
 */
export const DEFAULT_EFFICIENCY_BAND = { minPercent: 40, maxPercent: 95 } as const;

const num = (v: unknown): number | undefined => (typeof v === "number" && Number.isFinite(v) ? v : undefined);
const round = (x: number, d = 1) => Number(x.toFixed(d));
const flag = (code: FlagCode, detail: string): Flag => ({ code, label: FLAG_LABEL[code], detail });

/** Two-person rule on, and fewer than two distinct people recorded as present. */
export function singlePersonFlag(r: AuditRecord, { rules }: AuditContext): Flag | null {
  if (r.kind !== "transfer" || !rules.twoPersonTransfer) return null;
  const people = new Set(r.payload.peoplePresent);
  if (people.size >= 2) return null;
  return flag(
    "single_person",
    `${people.size} person recorded as present; the facility's rules require two for a transfer.`,
  );
}

export function ppeFlag(r: AuditRecord): Flag | null {
  if (r.kind !== "transfer") return null;
  return r.payload.ppeConfirmed === true ? null : flag("ppe_not_confirmed", "Protective equipment was not confirmed.");
}

/** The oxygen monitor was not checked, or no lowest reading was written down. */
export function oxygenCheckFlag(r: AuditRecord): Flag | null {
  if (r.kind !== "transfer") return null;
  const p = r.payload;
  const checked = p.oxygenMonitorChecked === true;
  const reading = num(p.oxygenLowestPercent);
  if (checked && reading !== undefined) return null;
  if (!checked && reading === undefined)
    return flag("oxygen_check_missing", "The oxygen monitor was not checked and no reading was recorded.");
  if (!checked) return flag("oxygen_check_missing", "A reading was recorded but the monitor check was not confirmed.");
  return flag("oxygen_check_missing", "The monitor was checked but its lowest reading was not recorded.");
}

/** A recorded oxygen reading (transfer or quench) below the facility's alarm level. */
export function oxygenAlarmFlag(r: AuditRecord, { rules }: AuditContext): Flag | null {
  if (r.kind !== "transfer" && r.kind !== "quench") return null;
  const reading = num(r.payload.oxygenLowestPercent);
  if (reading === undefined || reading >= rules.oxygenAlarmPercent) return null;
  return flag(
    "oxygen_below_alarm",
    `Lowest oxygen reading ${reading} % is below the alarm level of ${rules.oxygenAlarmPercent} %.`,
  );
}

export function gainedMoreThanTakenFlag(r: AuditRecord): Flag | null {
  if (r.kind !== "transfer") return null;
  const p = r.payload;
  const gained = num(p.gainedLitres);
  const taken = num(p.suppliedLitres);
  if (gained === undefined || taken === undefined || gained <= taken) return null;
  return flag("gained_more_than_taken", `${gained} L gained but only ${taken} L taken from the supply.`);
}

/** Efficiency (gained / taken) outside the facility's plausible band. Not raised when gained > taken (its own flag). */
export function efficiencyFlag(r: AuditRecord, { rules }: AuditContext): Flag | null {
  if (r.kind !== "transfer") return null;
  const p = r.payload;
  const gained = num(p.gainedLitres);
  const taken = num(p.suppliedLitres);
  if (gained === undefined || taken === undefined || gained > taken) return null;
  const min = rules.transferEfficiencyMinPercent ?? DEFAULT_EFFICIENCY_BAND.minPercent;
  const max = rules.transferEfficiencyMaxPercent ?? DEFAULT_EFFICIENCY_BAND.maxPercent;
  if (taken === 0) return flag("efficiency_implausible", "No litres taken from the supply were recorded.");
  const percent = transferEfficiency(gained, taken).efficiency * 100;
  if (percent >= min && percent <= max) return null;
  return flag(
    "efficiency_implausible",
    `Efficiency ${round(percent)} % is outside the plausible band ${min}–${max} %.`,
  );
}

/** A level recorded below the facility's minimum for that cryostat (before or after). */
export function levelBelowMinimumFlag(r: AuditRecord, { rules }: AuditContext): Flag | null {
  if (r.kind !== "transfer" && r.kind !== "quench") return null;
  const min = r.cryostatId ? rules.minHeliumPercent[r.cryostatId] : undefined;
  if (min === undefined) return null;
  const p = r.payload;
  const levels = [num(p.levelBeforePercent), num(p.levelAfterPercent)].filter((x): x is number => x !== undefined);
  const lowest = levels.length ? Math.min(...levels) : undefined;
  if (lowest === undefined || lowest >= min) return null;
  return flag("level_below_minimum", `Level ${lowest} % is below the minimum of ${min} % for this cryostat.`);
}

/** No signature by the people who did the work ("performed" or "verified"). */
export function missingSignatureFlag(r: AuditRecord): Flag | null {
  const signed = r.signatures.some((s) => s.meaning === "performed" || s.meaning === "verified");
  return signed ? null : flag("missing_signature", "Nobody signed this record as performed or verified.");
}

/** The record's chain fails verification at or before this record. */
export function chainBrokenFlag(r: AuditRecord, { chainBreakSeq }: AuditContext): Flag | null {
  if (chainBreakSeq === null || chainBreakSeq === undefined || chainBreakSeq > r.seq) return null;
  return flag(
    "chain_broken",
    `The hash chain of this cryostat is broken at or before this record (first bad entry at seq ${chainBreakSeq}).`,
  );
}

/** Someone listed as present is a visitor, not a user of the facility (lib/record/people.ts). */
export function visitorFlag(r: AuditRecord): Flag | null {
  if (r.kind !== "transfer") return null;
  const visitors = visitorsIn(r.payload.peoplePresent);
  if (!visitors.length) return null;
  return flag(
    "visitor_present",
    `Listed as present but not a user of the facility: ${visitors.join(", ")} (visitor${visitors.length > 1 ? "s" : ""}).`,
  );
}

/** A transfer made by a procedure run whose steps were flagged (out-of-range readings, hold points…). */
export function procedureFlag(r: AuditRecord): Flag | null {
  if (r.kind !== "transfer" || !r.run?.flags.length) return null;
  return flag("procedure_flags", `In the run "${r.run.title}": ${r.run.flags.join("; ")}`);
}

export const FLAG_RULES: readonly ((r: AuditRecord, ctx: AuditContext) => Flag | null)[] = [
  singlePersonFlag,
  ppeFlag,
  oxygenCheckFlag,
  oxygenAlarmFlag,
  gainedMoreThanTakenFlag,
  efficiencyFlag,
  levelBelowMinimumFlag,
  missingSignatureFlag,
  chainBrokenFlag,
  visitorFlag,
  procedureFlag,
];

export function flagsFor(r: AuditRecord, ctx: AuditContext): Flag[] {
  return FLAG_RULES.map((f) => f(r, ctx)).filter((f): f is Flag => f !== null);
}
