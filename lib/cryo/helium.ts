// Liquid-helium bookkeeping: litres from a level meter or a weighed dewar, gas equivalents,
// boil-off rate and the forecast of the minimum level, transfer efficiency, boil-off from a heat
// load. Property data: data/cryogens-eos.json (CoolProp; helium after Ortiz-Vega et al. 2019), at
// the normal boiling point (1 atm) unless the bath's pressure or temperature is given.
// Rules of thumb (1 W ≈ 1.38 L/h; transfer losses 20–40 %) are common practice, not physics.

import { type BathState, CRYOGENS, type Cryogen, type SaturatedLiquid, saturatedLiquid } from "./cryogens";
import { CryoInputError, fmt, requireFinite, requireInRange, requireNonNegative, requirePositive } from "./errors";
import { linearInterpolate } from "./interp";
import { linearFit } from "./lsq";

export type LevelCalibration =
  | { kind: "linear"; litresPerPercent: number; offsetLitres: number }
  | { kind: "table"; points: readonly { percent: number; litres: number }[] };

const MS_PER_DAY = 86_400_000;

/** Litres of liquid from a level-meter reading in % using the reservoir's calibration. */
export function litresFromLevel(levelPercent: number, calibration: LevelCalibration): number {
  if (calibration.kind === "linear") {
    requireInRange("Level", levelPercent, { min: 0, max: 100, unit: "%", text: "level meter's range (0–100 %)" });
    requireFinite("Litres per percent", calibration.litresPerPercent);
    requireFinite("Offset (L)", calibration.offsetLitres);
    return calibration.offsetLitres + calibration.litresPerPercent * levelPercent;
  }
  const points = calibration.points;
  if (points.length < 2) throw new CryoInputError("A level table needs at least 2 points");
  points.forEach((p, i) => {
    requireFinite("Table percent", p.percent);
    requireFinite("Table litres", p.litres);
    const prev = points[i - 1];
    if (prev && (p.percent <= prev.percent || p.litres < prev.litres)) {
      throw new CryoInputError(`Level table row ${i + 1}: percent must rise and litres must not fall`);
    }
  });
  const first = points[0]?.percent ?? NaN;
  const last = points[points.length - 1]?.percent ?? NaN;
  requireInRange("Level", levelPercent, {
    min: first,
    max: last,
    unit: "%",
    text: `level table's range (${fmt(first)}–${fmt(last)} %)`,
  });
  return linearInterpolate(
    points.map((p) => p.percent),
    points.map((p) => p.litres),
    levelPercent,
  );
}

/** Liquid helium density at the normal boiling point in kg/L (eos file: 124.669 kg/m³). */
export const HELIUM_LIQUID_DENSITY_KG_PER_L = CRYOGENS.helium.liquidDensityKgPerM3 / 1000;

/** Litres of liquid from a weighed dewar's net mass (gross minus tare), at the given density
 * (default: liquid helium at the normal boiling point, 1 atm; litresFromMassAt takes the bath). */
export function litresFromMass(netMassKg: number, densityKgPerL = HELIUM_LIQUID_DENSITY_KG_PER_L): number {
  requireNonNegative("Net mass (kg)", netMassKg);
  requirePositive("Density (kg/L)", densityKgPerL);
  return netMassKg / densityKgPerL;
}

export interface LitresFromMass {
  readonly litres: number;
  /** The liquid's state the density is taken at (atNormalBoilingPoint: 1 atm only). */
  readonly liquid: SaturatedLiquid;
}

/** Litres of saturated liquid from a net mass, at the bath's pressure or temperature (default 1 atm). */
export function litresFromMassAt(netMassKg: number, bath?: BathState, cryogen: Cryogen = "helium"): LitresFromMass {
  requireNonNegative("Net mass (kg)", netMassKg);
  const liquid = saturatedLiquid(cryogen, bath);
  return { litres: (netMassKg / liquid.liquidDensityKgPerM3) * 1000, liquid };
}

export interface LevelReading {
  readonly timeMs: number;
  readonly litres: number;
}

export interface BoilOffRate {
  /** Liquid lost per day (positive = losing). */
  readonly litresPerDay: number;
  readonly standardErrorLitresPerDay: number;
  /** Fitted line through the centroid (mean time, mean litres), where the band pivots. */
  readonly centroidTimeMs: number;
  readonly centroidLitres: number;
  readonly residualRmsLitres: number;
  readonly points: number;
}

export const MIN_BOIL_OFF_POINTS = 3;

/**
 * Least-squares boil-off rate from level readings between two transfers. A rise larger than
 * `riseToleranceLitres` (meter noise) between consecutive readings means a transfer happened
 * inside the history, and the fit is refused.
 */
export function boilOffRate(history: readonly LevelReading[], { riseToleranceLitres = 1 } = {}): BoilOffRate {
  if (history.length < MIN_BOIL_OFF_POINTS) {
    throw new CryoInputError(`A boil-off rate needs at least ${MIN_BOIL_OFF_POINTS} readings (got ${history.length})`);
  }
  history.forEach((r, i) => {
    requireFinite("Reading time (ms)", r.timeMs);
    requireFinite("Reading litres", r.litres);
    const prev = history[i - 1];
    if (!prev) return;
    if (r.timeMs <= prev.timeMs) throw new CryoInputError(`Reading ${i + 1} is not later than reading ${i}`);
    if (r.litres - prev.litres > riseToleranceLitres) {
      throw new CryoInputError(
        `Reading ${i + 1} rises by ${fmt(r.litres - prev.litres)} L: a transfer lies inside this history — fit each side separately`,
      );
    }
  });
  const t0 = history[0]?.timeMs ?? 0;
  const fit = linearFit(
    history.map((r) => (r.timeMs - t0) / MS_PER_DAY),
    history.map((r) => r.litres),
  );
  return {
    litresPerDay: -fit.slope,
    standardErrorLitresPerDay: fit.slopeStandardError,
    centroidTimeMs: t0 + fit.meanX * MS_PER_DAY,
    centroidLitres: fit.meanY,
    residualRmsLitres: fit.residualRms,
    points: fit.n,
  };
}

export type MinimumLevelForecast =
  | {
      readonly forecast: true;
      readonly reachMs: number;
      readonly reachDate: Date;
      readonly daysLeft: number;
      /** Band from the rate ± coverageFactor·standard error; latest is null if that rate is ≤ 0. */
      readonly earliestMs: number;
      readonly latestMs: number | null;
      readonly daysLeftEarliest: number;
      readonly daysLeftLatest: number | null;
    }
  | { readonly forecast: false; readonly reason: string };

/**
 * When the fitted level reaches `minimumLitres`, counted from `nowMs`. The line pivots on the
 * fit's centroid (where slope and level errors are uncorrelated); the band comes from the
 * rate's standard error only. No forecast when the level is not falling.
 */
export function forecastMinimumLevel(
  rate: BoilOffRate,
  minimumLitres: number,
  nowMs: number,
  { coverageFactor = 1 } = {},
): MinimumLevelForecast {
  requireFinite("Minimum level (L)", minimumLitres);
  requireFinite("Now (ms)", nowMs);
  requireNonNegative("Coverage factor", coverageFactor);
  if (rate.litresPerDay <= 0) {
    return { forecast: false, reason: "The level is not falling: no date to forecast" };
  }
  const reachAt = (litresPerDay: number) =>
    rate.centroidTimeMs + ((rate.centroidLitres - minimumLitres) / litresPerDay) * MS_PER_DAY;
  const reachMs = reachAt(rate.litresPerDay);
  const earliestMs = reachAt(rate.litresPerDay + coverageFactor * rate.standardErrorLitresPerDay);
  const slowest = rate.litresPerDay - coverageFactor * rate.standardErrorLitresPerDay;
  const latestMs = slowest > 0 ? reachAt(slowest) : null;
  const days = (ms: number) => (ms - nowMs) / MS_PER_DAY;
  return {
    forecast: true,
    reachMs,
    reachDate: new Date(reachMs),
    daysLeft: days(reachMs),
    earliestMs,
    latestMs,
    daysLeftEarliest: days(earliestMs),
    daysLeftLatest: latestMs === null ? null : days(latestMs),
  };
}

export interface TransferEfficiency {
  /** Fraction of the liquid taken from the supply that arrived (0–1). */
  readonly efficiency: number;
  readonly lossLitres: number;
  /** True when more arrived than was taken: a reading is wrong. */
  readonly exceedsSupply: boolean;
}

/** Transfer efficiency = litres gained in the cryostat / litres taken from the supply dewar. */
export function transferEfficiency(gainedLitres: number, takenLitres: number): TransferEfficiency {
  requireNonNegative("Litres gained", gainedLitres);
  requirePositive("Litres taken from the supply", takenLitres);
  return {
    efficiency: gainedLitres / takenLitres,
    lossLitres: takenLitres - gainedLitres,
    exceedsSupply: gainedLitres > takenLitres,
  };
}

export interface HeatLoadBoilOff {
  readonly litresPerHour: number;
  readonly litresPerDay: number;
  /** The liquid's state the figure holds at (atNormalBoilingPoint: 1 atm only). */
  readonly liquid: SaturatedLiquid;
}

/**
 * Liquid evaporated by a steady heat load: Q/(ρ·L), with ρ and L at the bath's pressure or
 * temperature (eos saturation table), or at the normal boiling point (1 atm) when no bath is given.
 */
export function boilOffFromHeatLoad(powerW: number, cryogen: Cryogen = "helium", bath?: BathState): HeatLoadBoilOff {
  requireNonNegative("Heat load (W)", powerW);
  const liquid = saturatedLiquid(cryogen, bath);
  const litresPerSecond = (powerW / (liquid.liquidDensityKgPerM3 * liquid.latentHeatJPerKg)) * 1000;
  return { litresPerHour: litresPerSecond * 3600, litresPerDay: litresPerSecond * 86_400, liquid };
}
