// A field setting against the magnet's limits: its rated current, the field that current gives
// (coil constant × rated current) and the ramp limit (the facility's rule for the cryostat, else
// the magnet's own). A setting beyond any of them is refused unless it carries an explicit reason
// for the override. The tablet shows the same limits before saving; the server decides.
// Ratings and ramp limits are the maker's and the facility's: follow them and the facility's
// magnet rules; an override is for a case the facility has approved, not for speed.
import type { CryostatConfig } from "@/lib/schemas/cryostat";
import type { Refusal } from "./rules";

type Magnet = NonNullable<CryostatConfig["magnet"]>;
type Setting = {
  currentA: number;
  fieldT: number;
  rampRateTPerMin?: number | undefined;
  limitOverrideReason?: string | undefined;
};

/** The limits a setting exceeds, each in plain words (empty: within every limit). */
export function magnetLimitsExceeded(s: Setting, magnet: Magnet, facilityRampLimitTPerMin?: number): string[] {
  const out: string[] = [];
  const ratedFieldT = magnet.coilConstantTPerA * magnet.maxCurrentA;
  if (Math.abs(s.currentA) > magnet.maxCurrentA)
    out.push(`current ${s.currentA} A is above the magnet's rated ${magnet.maxCurrentA} A`);
  if (Math.abs(s.fieldT) > ratedFieldT + 1e-9)
    out.push(`field ${s.fieldT} T is above the rated ${Number(ratedFieldT.toPrecision(4))} T`);
  const rampLimit = facilityRampLimitTPerMin ?? magnet.rampLimitTPerMin;
  if (s.rampRateTPerMin !== undefined && s.rampRateTPerMin > rampLimit)
    out.push(
      `ramp ${s.rampRateTPerMin} T/min is above the ${facilityRampLimitTPerMin !== undefined ? "facility's" : "magnet's"} limit of ${rampLimit} T/min`,
    );
  return out;
}

export function magnetLimitRefusal(s: Setting, magnet: Magnet, facilityRampLimitTPerMin?: number): Refusal | null {
  const exceeded = magnetLimitsExceeded(s, magnet, facilityRampLimitTPerMin);
  if (!exceeded.length || s.limitOverrideReason?.trim()) return null;
  return {
    code: "bad_request:magnet_limit",
    message: `Beyond the magnet's limits: ${exceeded.join("; ")}. Check the value; if the facility has approved it, give the reason for the override.`,
  };
}
