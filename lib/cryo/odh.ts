// Oxygen deficiency after an inert-gas release in a room: well-mixed room of free volume V,
// release rate R, fresh-air supply Q — the forms of the ODH method in the Fermilab ES&H manual
// (FESHM 4240) as implemented in public ODH codes (the manual's own wording from memory).
// Thresholds: OSHA 29 CFR 1910.146 — below 19.5 % O2 is oxygen-deficient, above 23.5 % enriched;
// an 18 % evacuate point is common practice. The facility sets its own alarm points; these
// estimates never replace a fixed oxygen monitor, a risk assessment or local safety rules.

import { type GasReference, gasLitresFromLiquid } from "./cryogens";
import { requireFinite, requireInRange, requireNonNegative, requirePositive } from "./errors";

/** Oxygen fraction of fresh air used by the FESHM forms. */
export const AIR_OXYGEN_FRACTION = 0.21;

export interface SuddenRelease {
  readonly roomVolumeM3: number;
  /** Gas released, at room conditions. */
  readonly gasVolumeM3: number;
}

function checkSudden({ roomVolumeM3, gasVolumeM3 }: SuddenRelease): void {
  requirePositive("Room volume (m³)", roomVolumeM3);
  requireNonNegative("Released gas volume (m³)", gasVolumeM3);
}

/** O2 fraction after a sudden release that mixes and pushes mixed air out: 0.21·V/(V + Vgas). */
export function oxygenAfterMixedRelease(release: SuddenRelease): number {
  checkSudden(release);
  return (AIR_OXYGEN_FRACTION * release.roomVolumeM3) / (release.roomVolumeM3 + release.gasVolumeM3);
}

/** O2 fraction if the gas displaces air without mixing (worst case): 0.21·(1 − Vgas/V), ≥ 0. */
export function oxygenAfterDisplacement(release: SuddenRelease): number {
  checkSudden(release);
  return AIR_OXYGEN_FRACTION * Math.max(0, 1 - release.gasVolumeM3 / release.roomVolumeM3);
}

export interface ContinuousRelease {
  readonly roomVolumeM3: number;
  /** Inert gas release rate at room conditions. */
  readonly releaseM3PerS: number;
  /** Fresh-air supply (0 = no ventilation). */
  readonly ventilationM3PerS: number;
}

function checkContinuous({ roomVolumeM3, releaseM3PerS, ventilationM3PerS }: ContinuousRelease): void {
  requirePositive("Room volume (m³)", roomVolumeM3);
  requireNonNegative("Release rate (m³/s)", releaseM3PerS);
  requireNonNegative("Ventilation (m³/s)", ventilationM3PerS);
}

/** O2 fraction at time t after a steady release starts: 0.21·[Q + R·e^{−(Q+R)t/V}]/(Q + R). */
export function oxygenDuringRelease(release: ContinuousRelease, timeS: number): number {
  checkContinuous(release);
  requireNonNegative("Time (s)", timeS);
  const { roomVolumeM3: v, releaseM3PerS: r, ventilationM3PerS: q } = release;
  if (q + r === 0) return AIR_OXYGEN_FRACTION;
  return (AIR_OXYGEN_FRACTION * (q + r * Math.exp((-(q + r) * timeS) / v))) / (q + r);
}

/** O2 fraction the room settles at: 0.21·Q/(Q + R). */
export function steadyStateOxygen(release: ContinuousRelease): number {
  checkContinuous(release);
  const { releaseM3PerS: r, ventilationM3PerS: q } = release;
  return q + r === 0 ? AIR_OXYGEN_FRACTION : (AIR_OXYGEN_FRACTION * q) / (q + r);
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
    text: "range 0–0.21 (fresh air)",
  });
  const steady = steadyStateOxygen(release);
  if (targetFraction <= steady) return { reached: false, steadyStateFraction: steady };
  const { roomVolumeM3: v, releaseM3PerS: r, ventilationM3PerS: q } = release;
  const decay = ((targetFraction * (q + r)) / AIR_OXYGEN_FRACTION - q) / r;
  return { reached: true, timeS: (-Math.log(decay) * v) / (q + r) };
}

/** Fresh-air supply in m³/s from air changes per hour. */
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

export interface OxygenThresholds {
  /** Warn at or below this fraction (default 0.195, OSHA 29 CFR 1910.146 "oxygen deficient"). */
  readonly alarm: number;
  /** Leave the room at or below this (default 0.18, common practice). */
  readonly evacuate: number;
  /** Above this the air is oxygen-enriched (default 0.235, OSHA 29 CFR 1910.146). */
  readonly enriched: number;
}

export const DEFAULT_OXYGEN_THRESHOLDS: OxygenThresholds = { alarm: 0.195, evacuate: 0.18, enriched: 0.235 };

export type OxygenStatus = "normal" | "alarm" | "evacuate" | "enriched";

export interface OxygenClassification {
  readonly status: OxygenStatus;
  readonly deficient: boolean;
  readonly thresholds: OxygenThresholds;
}

/** Flag an O2 fraction (0–1) against the facility's thresholds. */
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
    fraction <= t.evacuate ? "evacuate" : fraction <= t.alarm ? "alarm" : fraction > t.enriched ? "enriched" : "normal";
  return { status, deficient: fraction < 0.195, thresholds: t };
}
