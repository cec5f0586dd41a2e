// Field-by-field differences between two versions of the facility rules, for the audited
// `rules.change` entry (old and new value of every changed setting, R2).
import type { FacilityRulesValues } from "@/lib/schemas/rules";
import { canonicalJson } from "@/lib/sync/hash";

export type RuleChange = { field: string; from: unknown; to: unknown };

export function diffRules(before: FacilityRulesValues | null, after: FacilityRulesValues): RuleChange[] {
  const keys = Object.keys(after) as (keyof FacilityRulesValues)[];
  const out: RuleChange[] = [];
  for (const k of keys) {
    const from = before ? before[k] : null;
    const to = after[k];
    if (from === null || canonicalJson(from) !== canonicalJson(to)) out.push({ field: k, from: from ?? null, to });
  }
  return out;
}
