// Oxygen deficiency after an inert-gas release in a room. Continuous release: the well-mixed room
// balance V·dC/dt = C_air·F − C·(F + R) (fresh air F in, release R in, the same volume out), the
// forms of the ODH method in the Fermilab ES&H manual (FESHM 4240) for supply and for exhaust
// ventilation (the manual's own wording from memory). Sudden release: displacement (worst case)
// and mixed air leaving as the gas enters, the fast-release limit of the continuous balance.
// Thresholds: OSHA 29 CFR 1910.146 — below 19.5 % O2 is oxygen-deficient, above 23.5 % enriched;
// an 18 % evacuate point is common practice. The facility sets its own alarm points; these
// estimates never replace a fixed oxygen monitor, a risk assessment or local safety rules.

import { type GasReference, gasLitresFromLiquid } from "./cryogens";
import { requireFinite, requireInRange, requireNonNegative, requirePositive } from "./errors";

/** Oxygen fraction of fresh air: 20.9 %, what an oxygen monitor reads in fresh air. */
export const AIR_OXYGEN_FRACTION = 0.209;

/** Which room model a figure comes from. */
export type OxygenModel = "displacement" | "mixed-outflow" | "well-mixed-supply" | "well-mixed-exhaust";

/** Plain words for each model, shown beside its figure. */
export const OXYGEN_MODEL_LABEL: Readonly<Record<OxygenModel, string>> = {
  displacement: "Gas displaces room air, no mixing (worst case)",
  "mixed-outflow": "Gas mixes in, mixed air leaves as it enters",
  "well-mixed-supply": "Well-mixed room, fresh air supplied",
  "well-mixed-exhaust": "Well-mixed room, room air extracted (fresh air drawn in)",
};

export interface OxygenEstimate {
  readonly model: OxygenModel;
  readonly label: string;
  /** O2 fraction (0–1). */
  readonly fraction: number;
}

const estimate = (model: OxygenModel, fraction: number): OxygenEstimate => ({
  model,
  label: OXYGEN_MODEL_LABEL[model],
  fraction,
});

export interface SuddenRelease {
  readonly roomVolumeM3: number;
  /** Gas released, at room conditions. */
  readonly gasVolumeM3: number;
}

function checkSudden({ roomVolumeM3, gasVolumeM3 }: SuddenRelease): void {
  requirePositive("Room volume (m³)", roomVolumeM3);
  requireNonNegative("Released gas volume (m³)", gasVolumeM3);
}

/**
 * O2 fraction after a sudden release that mixes in while mixed air leaves: C_air·e^{−Vgas/V}.
 * The continuous balance with no ventilation after R·t = Vgas, and its limit for a fast release.
 */
export function oxygenAfterMixedRelease(release: SuddenRelease): number {
  checkSudden(release);
  return AIR_OXYGEN_FRACTION * Math.exp(-release.gasVolumeM3 / release.roomVolumeM3);
}

/** O2 fraction if the gas displaces air without mixing (worst case): C_air·(V − Vgas)/V, ≥ 0. */
export function oxygenAfterDisplacement(release: SuddenRelease): number {
  checkSudden(release);
  return AIR_OXYGEN_FRACTION * Math.max(0, 1 - release.gasVolumeM3 / release.roomVolumeM3);
}

export interface SuddenReleaseOxygen {
  /** Displacement first, then mixed outflow; each names its model. */
  readonly estimates: readonly OxygenEstimate[];
  /** The lowest figure (displacement: 1 − x ≤ e^{−x}). */
  readonly conservative: OxygenEstimate;
}

/** Both sudden-release figures, labelled, and the conservative one. */
export function suddenReleaseOxygen(release: SuddenRelease): SuddenReleaseOxygen {
  const displacement = estimate("displacement", oxygenAfterDisplacement(release));
  const mixed = estimate("mixed-outflow", oxygenAfterMixedRelease(release));
  return {
    estimates: [displacement, mixed],
    conservative: displacement.fraction <= mixed.fraction ? displacement : mixed,
  };
}

/** Supply: fresh air blown in (room air leaves). Exhaust: room air extracted (fresh air drawn in). */
export type VentilationKind = "supply" | "exhaust";

export interface ContinuousRelease {
  readonly roomVolumeM3: number;
  /** Inert gas release rate at room conditions. */
  readonly releaseM3PerS: number;
  /** Ventilation flow (0 = none): the fresh air supplied, or the room air extracted. */
  readonly ventilationM3PerS: number;
  /** Default "supply". */
  readonly ventilationKind?: VentilationKind | undefined;
}

function checkContinuous({ roomVolumeM3, releaseM3PerS, ventilationM3PerS, ventilationKind }: ContinuousRelease): void {
  requirePositive("Room volume (m³)", roomVolumeM3);
  requireNonNegative("Release rate (m³/s)", releaseM3PerS);
  requireNonNegative("Ventilation (m³/s)", ventilationM3PerS);
  if (ventilationKind !== undefined && ventilationKind !== "supply" && ventilationKind !== "exhaust") {
    throw new RangeError(`Unknown ventilation kind "${String(ventilationKind)}" (known: supply, exhaust)`);
  }
}

/**
 * Fresh air entering the room. Supply: Q. Exhaust: the room keeps its volume, so the air drawn in
 * is the extract minus the release, Q − R; an extract smaller than the release draws none (the
 * surplus gas pushes mixed air out through the gaps).
 */
export function freshAirInflowM3PerS(release: ContinuousRelease): number {
  checkContinuous(release);
  const { releaseM3PerS: r, ventilationM3PerS: q } = release;
  return release.ventilationKind === "exhaust" ? Math.max(0, q - r) : q;
}

/**
 * O2 fraction at time t after a steady release starts, fresh air F = freshAirInflowM3PerS:
 * C_air·[F + R·e^{−(F+R)t/V}]/(F + R). For exhaust Q ≥ R this is C_air·[(1 − R/Q) + (R/Q)e^{−Qt/V}].
 */
export function oxygenDuringRelease(release: ContinuousRelease, timeS: number): number {
  const f = freshAirInflowM3PerS(release);
  requireNonNegative("Time (s)", timeS);
  const { roomVolumeM3: v, releaseM3PerS: r } = release;
  if (f + r === 0) return AIR_OXYGEN_FRACTION;
  return (AIR_OXYGEN_FRACTION * (f + r * Math.exp((-(f + r) * timeS) / v))) / (f + r);
}

/** The continuous figure with its model named. */
export function continuousReleaseOxygen(release: ContinuousRelease, timeS: number): OxygenEstimate {
  const model = release.ventilationKind === "exhaust" ? "well-mixed-exhaust" : "well-mixed-supply";
  return estimate(model, oxygenDuringRelease(release, timeS));
}

/** O2 fraction the room settles at: C_air·F/(F + R). */
export function steadyStateOxygen(release: ContinuousRelease): number {
  const f = freshAirInflowM3PerS(release);
  const r = release.releaseM3PerS;
  return f + r === 0 ? AIR_OXYGEN_FRACTION : (AIR_OXYGEN_FRACTION * f) / (f + r);
}

export type TimeToOxygen =
  | { readonly reached: true; readonly timeS: number }
  | { readonly reached: false; readonly steadyStateFraction: number };

/** Time until the O2 fraction falls to `targetFraction`, or the level it settles at if never. */
export function timeToOxygenFraction(release: ContinuousRelease, targetFraction: number): TimeToOxygen {
  requireInRange("Target O2 fraction", targetFraction, {
    min: 0,
    max: AIR_OXYGEN_FRACTION,
    unit: "",
    text: `range 0–${AIR_OXYGEN_FRACTION} (fresh air)`,
  });
  const steady = steadyStateOxygen(release);
  if (targetFraction <= steady) return { reached: false, steadyStateFraction: steady };
  const f = freshAirInflowM3PerS(release);
  const { roomVolumeM3: v, releaseM3PerS: r } = release;
  const decay = ((targetFraction * (f + r)) / AIR_OXYGEN_FRACTION - f) / r;
  return { reached: true, timeS: (-Math.log(decay) * v) / (f + r) };
}

/** Ventilation flow in m³/s from air changes per hour. */
export function ventilationFromAirChanges(roomVolumeM3: number, airChangesPerHour: number): number {
  requirePositive("Room volume (m³)", roomVolumeM3);
  requireNonNegative("Air changes per hour", airChangesPerHour);
  return (roomVolumeM3 * airChangesPerHour) / 3600;
}

export interface QuenchGas {
  readonly gasM3: number;
  readonly reference: GasReference;
}

/** Helium gas released if the whole liquid inventory boils (a quench or loss of vacuum). */
export function quenchGasVolume(liquidLitres: number, reference: GasReference = "20C_1atm"): QuenchGas {
  const gas = gasLitresFromLiquid(liquidLitres, reference, "helium");
  return { gasM3: gas.gasLitres / 1000, reference };
}

/** OSHA 29 CFR 1910.146: "oxygen deficient atmosphere" means below 19.5 % oxygen by volume. */
export const OSHA_DEFICIENT_FRACTION = 0.195;

export interface OxygenThresholds {
  /** Alarm below this fraction (default 0.195, OSHA 29 CFR 1910.146 "oxygen deficient"). */
  readonly alarm: number;
  /** Leave the room below this (default 0.18, common practice). */
  readonly evacuate: number;
  /** Above this the air is oxygen-enriched (default 0.235, OSHA 29 CFR 1910.146). */
  readonly enriched: number;
}

export const DEFAULT_OXYGEN_THRESHOLDS: OxygenThresholds = {
  alarm: OSHA_DEFICIENT_FRACTION,
  evacuate: 0.18,
  enriched: 0.235,
};

export type OxygenStatus = "normal" | "alarm" | "evacuate" | "enriched";

export interface OxygenClassification {
  readonly status: OxygenStatus;
  /** Below 19.5 % (OSHA's definition, whatever the facility's alarm point). */
  readonly deficient: boolean;
  readonly thresholds: OxygenThresholds;
}

/**
 * Flag an O2 fraction (0–1) against the facility's thresholds. One rule throughout, OSHA's:
 * a level is crossed when the fraction is strictly below it (exactly 19.5 % is not deficient and
 * raises no alarm; exactly 18 % is an alarm, not yet evacuate); enriched strictly above.
 */
export function classifyOxygen(fraction: number, thresholds: Partial<OxygenThresholds> = {}): OxygenClassification {
  const t: OxygenThresholds = { ...DEFAULT_OXYGEN_THRESHOLDS, ...thresholds };
  requireInRange("O2 fraction", fraction, { min: 0, max: 1, unit: "", text: "range 0–1 (a fraction, not %)" });
  requireFinite("Alarm threshold", t.alarm);
  requireFinite("Evacuate threshold", t.evacuate);
  requireFinite("Enriched threshold", t.enriched);
  if (!(t.evacuate <= t.alarm && t.alarm < t.enriched)) {
    throw new RangeError("Oxygen thresholds must satisfy evacuate ≤ alarm < enriched");
  }
  const status: OxygenStatus =
    fraction < t.evacuate ? "evacuate" : fraction < t.alarm ? "alarm" : fraction > t.enriched ? "enriched" : "normal";
  return { status, deficient: fraction < OSHA_DEFICIENT_FRACTION, thresholds: t };
}
