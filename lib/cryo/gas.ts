// Gas accounting for tanks and cylinders: amount from p, V, T (n = pV/(ZRT)) as mol and as litres
// at a named reference condition, helium compressibility at 20 °C, and the mixture lost between a
// warmup and the next cooldown. Sources: CODATA 2018 (R exact; molar volumes 22.413 969 54 L/mol
// at 0 °C/101.325 kPa and 22.710 954 64 L/mol at 0 °C/100 kPa); helium Z from data/cryogens-eos.json
// (CoolProp, Ortiz-Vega et al. 2019). The gas law takes absolute pressure; cylinder gauges read
// gauge pressure (above the room's air): absolutePressurePa adds the room's barometric pressure.
// Treat high-pressure gas with the usual cylinder cautions.

import { GAS_CONSTANT_J_PER_MOL_K, STANDARD_ATMOSPHERE_PA, ZERO_CELSIUS_K } from "./constants";
import eos from "./data/cryogens-eos.json";
import { fmt, requireFinite, requireInRange, requirePositive } from "./errors";
import { linearInterpolate } from "./interp";

export const MOLAR_VOLUME_REFERENCES = ["0C_1atm", "0C_100kPa", "15C_1atm", "20C_1atm"] as const;
export type MolarVolumeReference = (typeof MOLAR_VOLUME_REFERENCES)[number];

const idealMolarVolumeLPerMol = (temperatureK: number, pressurePa: number) =>
  ((GAS_CONSTANT_J_PER_MOL_K * temperatureK) / pressurePa) * 1000;

/** Ideal-gas molar volume in L/mol at each named reference condition. */
export const MOLAR_VOLUME_L_PER_MOL: Readonly<Record<MolarVolumeReference, number>> = {
  "0C_1atm": 22.41396954,
  "0C_100kPa": 22.71095464,
  "15C_1atm": idealMolarVolumeLPerMol(ZERO_CELSIUS_K + 15, STANDARD_ATMOSPHERE_PA),
  "20C_1atm": idealMolarVolumeLPerMol(ZERO_CELSIUS_K + 20, STANDARD_ATMOSPHERE_PA),
};

/** How a gauge reads: above the room's air pressure ("gauge", most cylinder gauges) or above vacuum. */
export type PressureReading = "gauge" | "absolute";

/** Room barometric pressures accepted, Pa: sea level to about 5 000 m altitude, with weather. */
export const BAROMETRIC_RANGE_PA = { min: 50_000, max: 110_000 } as const;

/**
 * Absolute pressure from a gauge reading: a gauge reading plus the room's barometric pressure
 * (default the standard atmosphere, 1013.25 hPa); an absolute reading as read. Refuses a result
 * below vacuum.
 */
export function absolutePressurePa(
  pressurePa: number,
  reads: PressureReading,
  barometricPa: number = STANDARD_ATMOSPHERE_PA,
): number {
  requireFinite("Pressure (Pa)", pressurePa);
  if (reads !== "gauge" && reads !== "absolute") {
    throw new RangeError(`Say whether the pressure is gauge or absolute (got "${String(reads)}")`);
  }
  requireFinite("Barometric pressure (hPa)", barometricPa);
  requireInRange("Barometric pressure", barometricPa / 100, {
    min: BAROMETRIC_RANGE_PA.min / 100,
    max: BAROMETRIC_RANGE_PA.max / 100,
    unit: "hPa",
    text: `plausible room barometric pressure (${BAROMETRIC_RANGE_PA.min / 100}–${BAROMETRIC_RANGE_PA.max / 100} hPa)`,
  });
  const absolute = reads === "gauge" ? pressurePa + barometricPa : pressurePa;
  if (absolute < 0) {
    throw new RangeError(
      reads === "gauge"
        ? `Pressure ${fmt(pressurePa / 100)} hPa gauge is below vacuum at a barometric pressure of ${fmt(barometricPa / 100)} hPa`
        : `Pressure ${fmt(pressurePa)} Pa absolute is below vacuum`,
    );
  }
  return absolute;
}

/** Above this pressure the ideal gas law is flagged when no Z was given (He: +0.5 % at 10 bar). */
export const IDEAL_GAS_WARNING_PA = 5e5;

export interface TankState {
  readonly pressurePa: number;
  readonly volumeLitres: number;
  readonly temperatureK: number;
  /** Compressibility factor; default 1 (ideal gas). */
  readonly compressibilityZ?: number;
}

export interface GasAmount {
  readonly mol: number;
  readonly litresAtReference: number;
  readonly reference: MolarVolumeReference;
  /** True when the pressure is above a few bar and Z was left at the ideal-gas default. */
  readonly idealGasWarning: boolean;
}

/** Amount of gas in a tank, absolute pressure. */
export function gasAmount(tank: TankState, reference: MolarVolumeReference = "0C_1atm"): GasAmount {
  requirePositive("Pressure (Pa, absolute)", tank.pressurePa);
  requirePositive("Tank volume (L)", tank.volumeLitres);
  requirePositive("Temperature (K)", tank.temperatureK);
  const z = requirePositive("Compressibility Z", tank.compressibilityZ ?? 1);
  const molarVolume = MOLAR_VOLUME_L_PER_MOL[reference];
  if (molarVolume === undefined) {
    throw new RangeError(`Unknown reference condition "${reference}" (known: ${MOLAR_VOLUME_REFERENCES.join(", ")})`);
  }
  const mol = (tank.pressurePa * tank.volumeLitres * 1e-3) / (z * GAS_CONSTANT_J_PER_MOL_K * tank.temperatureK);
  return {
    mol,
    litresAtReference: mol * molarVolume,
    reference,
    idealGasWarning: tank.compressibilityZ === undefined && tank.pressurePa > IDEAL_GAS_WARNING_PA,
  };
}

const HELIUM_Z_20C = eos.fluids.Helium.compressibility_20C;

/** Helium compressibility Z at 20 °C, interpolated in the eos file's table (1–300 bar). */
export function heliumCompressibility20C(pressurePa: number): number {
  const bars = HELIUM_Z_20C.map((row) => row.p_bar);
  const lo = bars[0] ?? NaN;
  const hi = bars[bars.length - 1] ?? NaN;
  requireInRange("Pressure", pressurePa / 1e5, {
    min: lo,
    max: hi,
    unit: "bar",
    text: `helium Z table's range (${fmt(lo)}–${fmt(hi)} bar at 20 °C)`,
  });
  return linearInterpolate(
    bars,
    HELIUM_Z_20C.map((row) => row.Z),
    pressurePa / 1e5,
  );
}

export interface MixtureLoss {
  readonly litresLost: number;
  readonly percentLost: number;
  readonly before: GasAmount;
  readonly after: GasAmount;
  readonly reference: MolarVolumeReference;
}

/**
 * Mixture lost between two readings of the same storage tank (after a warmup, before the next
 * cooldown), both with the mixture fully in the tank. A negative loss means the tank gained gas:
 * check for air leaking in.
 */
export function mixtureLoss(
  tankVolumeLitres: number,
  before: Omit<TankState, "volumeLitres">,
  after: Omit<TankState, "volumeLitres">,
  reference: MolarVolumeReference = "0C_1atm",
): MixtureLoss {
  const b = gasAmount({ ...before, volumeLitres: tankVolumeLitres }, reference);
  const a = gasAmount({ ...after, volumeLitres: tankVolumeLitres }, reference);
  const litresLost = b.litresAtReference - a.litresAtReference;
  return { litresLost, percentLost: (100 * litresLost) / b.litresAtReference, before: b, after: a, reference };
}
