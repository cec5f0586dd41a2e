// Field-by-field differences between two versions of the facility rules, for the audited
// `rules.change` entry (old and new value of every changed setting, for the audit trail).
import type { FacilityRulesValues } from "@/lib/schemas/rules";
import { canonicalJson } from "@/lib/sync/hash";

export type RuleChange = { field: string; from: unknown; to: unknown };

export function diffRules(before: FacilityRulesValues | null, after: FacilityRulesValues): RuleChange[] {
  // Optional settings may be absent on either side: absent and null compare equal.
  const keys = [...new Set([...Object.keys(before ?? {}), ...Object.keys(after)])] as (keyof FacilityRulesValues)[];
  const out: RuleChange[] = [];
  for (const k of keys) {
    const from = before ? (before[k] ?? null) : null;
    const to = after[k] ?? null;
    if (!before || canonicalJson(from) !== canonicalJson(to)) out.push({ field: k, from, to });
  }
  return out;
}
