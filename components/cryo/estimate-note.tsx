// The short caution beside magnet, oxygen and fringe-field figures: they are estimates, and the
// maker's data, the facility's rules and the safety officer decide. Kept in one place so it can be
// swapped for the shared safety caution component without touching every calculator.
import type { ReactNode } from "react";

export type EstimateTopic = "magnet" | "oxygen" | "fringe";

const TEXT: Record<EstimateTopic, string> = {
  magnet:
    "Estimate for planning. The magnet maker's ramp limits and instructions, the facility's magnet rules and the safety officer decide.",
  oxygen:
    "Estimate for planning, not a measurement. The fixed oxygen monitors, the facility's alarm points and risk assessment, and the safety officer decide; leave the room when an alarm sounds.",
  fringe:
    "Dipole far-field estimate: shielding and nearby steel change the real map. The maker's fringe-field map, the site survey, the facility's controlled-area rule and the safety officer decide.",
};

export function EstimateNote({ topic, children }: { topic: EstimateTopic; children?: ReactNode }) {
  return (
    <p role="note" className="rounded-lg border-l-4 border-warn bg-sunk px-3 py-2 text-base text-ink">
      <span className="font-semibold text-warn">Caution: </span>
      {TEXT[topic]}
      {children ? <> {children}</> : null}
    </p>
  );
}
