// Wording for computed safety figures: every number the app works out (oxygen after a release,
// the fringe-field line, stored energy, helium boiled off) is shown as an estimate with its basis.
import type { FacilityRulesValues } from "@/lib/schemas/rules";

const sig = (x: number, digits = 3) => (Number.isFinite(x) ? Number(x.toPrecision(digits)).toString() : "—");

export const ESTIMATE_NOTE =
  "Estimate from Rimelog's arithmetic, not a measurement: the room's oxygen monitors, the maker's data and the facility's own assessment are what count.";

/** "Estimated oxygen …" with the facility's alarm level beside it. */
export function oxygenEstimateText(fraction: number, rules: FacilityRulesValues, basis: string): string {
  const percent = fraction * 100;
  const below = percent < rules.oxygenAlarmPercent;
  return (
    `Estimate: oxygen about ${sig(percent)} % (${basis}). ` +
    (below
      ? `That is below the facility's alarm level of ${rules.oxygenAlarmPercent} % — treat the room as unsafe until the monitors say otherwise.`
      : `The facility's alarm level is ${rules.oxygenAlarmPercent} %.`) +
    ` ${ESTIMATE_NOTE}`
  );
}

export function fringeDistanceText(axisM: number, equatorM: number, contourMilliTesla: number): string {
  return (
    `Estimate: the ${sig(contourMilliTesla)} mT line lies about ${sig(axisM)} m from the magnet centre along its axis and ` +
    `${sig(equatorM)} m sideways (far-field dipole model, no iron or shielding). ${ESTIMATE_NOTE}`
  );
}

export function heliumLostText(litres: number, basis: string): string {
  return `Estimate: about ${sig(litres)} L of liquid helium lost (${basis}). ${ESTIMATE_NOTE}`;
}

export function storedEnergyText(joules: number): string {
  return `Estimate: about ${sig(joules / 1000)} kJ stored in the magnet (½ L I²). ${ESTIMATE_NOTE}`;
}
