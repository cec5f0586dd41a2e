// ITS-90 helium vapour-pressure scale: temperature from saturated vapour pressure and back.
// Source: H. Preston-Thomas, "The International Temperature Scale of 1990", Metrologia 27, 3–10
// (1990), eq. (3) and Table 3; 4He coefficients as reproduced in Donnelly & Barenghi, J. Phys.
// Chem. Ref. Data 27, 1217 (1998). T90/K = A0 + Σ Ai·[(ln(p/Pa) − B)/C]^i.
// The scale is defined only on its published ranges; outside them every function refuses.

import { fmt, requireInRange } from "./errors";
import { bisect } from "./solve";

interface Branch {
  readonly a: readonly number[];
  readonly b: number;
  readonly c: number;
}

const HE4_LOWER: Branch = {
  a: [1.392408, 0.527153, 0.166756, 0.050988, 0.026514, 0.001975, -0.017976, 0.005409, 0.013259, 0],
  b: 5.6,
  c: 2.9,
};
const HE4_UPPER: Branch = {
  a: [3.146631, 1.357655, 0.413923, 0.091159, 0.016349, 0.001826, -0.004325, -0.004973, 0, 0],
  b: 10.3,
  c: 1.9,
};
// 3He coefficients recalled, then checked against the published check values (1.0 K → 1160 Pa).
const HE3: Branch = {
  a: [1.053447, 0.980106, 0.67638, 0.372692, 0.151656, -0.002263, 0.006596, 0.088966, -0.00477, -0.054943],
  b: 7.3,
  c: 4.3,
};

/** The λ point: 4He branches meet here; the branch is picked by pressure, never by temperature
 * alone, because the upper polynomial is not monotonic at low pressure. */
export const HE4_LAMBDA_PRESSURE_PA = 5041.8;
export const HE4_LAMBDA_TEMPERATURE_K = 2.1768;

function branchTemperatureK(branch: Branch, pPa: number): number {
  const x = (Math.log(pPa) - branch.b) / branch.c;
  let sum = 0;
  for (let i = branch.a.length - 1; i >= 0; i--) sum = sum * x + (branch.a[i] ?? 0);
  return sum;
}

/** Pressure at which a branch gives tK, solved in ln p on a bracket where the branch is monotonic. */
function branchPressurePa(branch: Branch, tK: number, loPa: number, hiPa: number): number {
  const lnP = bisect((lnp) => branchTemperatureK(branch, Math.exp(lnp)) - tK, Math.log(loPa), Math.log(hiPa), 1e-14);
  return Math.exp(lnP);
}

export interface VapourPressureRange {
  readonly temperatureMinK: number;
  readonly temperatureMaxK: number;
  readonly pressureMinPa: number;
  readonly pressureMaxPa: number;
}

// Brackets on which each polynomial is monotonic (checked numerically, see tests).
const HE4_LOWER_BRACKET_PA = [30, 6000] as const;
const HE4_UPPER_BRACKET_PA = [4000, 250_000] as const;
const HE3_BRACKET_PA = [50, 200_000] as const;

export const HE4_RANGE: VapourPressureRange = {
  temperatureMinK: 1.25,
  temperatureMaxK: 5.0,
  pressureMinPa: branchPressurePa(HE4_LOWER, 1.25, ...HE4_LOWER_BRACKET_PA),
  pressureMaxPa: branchPressurePa(HE4_UPPER, 5.0, ...HE4_UPPER_BRACKET_PA),
};

export const HE3_RANGE: VapourPressureRange = {
  temperatureMinK: 0.65,
  temperatureMaxK: 3.2,
  pressureMinPa: branchPressurePa(HE3, 0.65, ...HE3_BRACKET_PA),
  pressureMaxPa: branchPressurePa(HE3, 3.2, ...HE3_BRACKET_PA),
};

function rangeText(range: VapourPressureRange): string {
  return (
    `ITS-90 range (${range.temperatureMinK}–${range.temperatureMaxK.toFixed(1)} K, ` +
    `${fmt(range.pressureMinPa, 6)}–${fmt(range.pressureMaxPa, 6)} Pa)`
  );
}

function checkPressure(isotope: string, pPa: number, range: VapourPressureRange): void {
  requireInRange(`${isotope} vapour pressure`, pPa, {
    min: range.pressureMinPa,
    max: range.pressureMaxPa,
    unit: "Pa",
    text: rangeText(range),
  });
}

// A forward result at a range end can land 1e-16 K outside it by rounding; a nanokelvin is far
// below the scale's own uncertainty, so such values are taken as the end itself.
const END_SLACK_K = 1e-9;

function checkTemperature(isotope: string, tK: number, range: VapourPressureRange): number {
  requireInRange(`${isotope} temperature`, tK, {
    min: range.temperatureMinK - END_SLACK_K,
    max: range.temperatureMaxK + END_SLACK_K,
    unit: "K",
    text: rangeText(range),
  });
  return Math.min(Math.max(tK, range.temperatureMinK), range.temperatureMaxK);
}

/** T90 in K from the saturated vapour pressure of 4He (1.25–5.0 K). */
export function he4TemperatureFromPressure(pressurePa: number): number {
  checkPressure("4He", pressurePa, HE4_RANGE);
  const branch = pressurePa <= HE4_LAMBDA_PRESSURE_PA ? HE4_LOWER : HE4_UPPER;
  return branchTemperatureK(branch, pressurePa);
}

/** T90 in K from the saturated vapour pressure of 3He (0.65–3.2 K). */
export function he3TemperatureFromPressure(pressurePa: number): number {
  checkPressure("3He", pressurePa, HE3_RANGE);
  return branchTemperatureK(HE3, pressurePa);
}

/** Saturated vapour pressure of 4He in Pa at T90 (1.25–5.0 K), by inverting the scale. */
export function he4PressureFromTemperature(temperatureK: number): number {
  const tK = checkTemperature("4He", temperatureK, HE4_RANGE);
  return tK <= HE4_LAMBDA_TEMPERATURE_K
    ? branchPressurePa(HE4_LOWER, tK, ...HE4_LOWER_BRACKET_PA)
    : branchPressurePa(HE4_UPPER, tK, ...HE4_UPPER_BRACKET_PA);
}

/** Saturated vapour pressure of 3He in Pa at T90 (0.65–3.2 K), by inverting the scale. */
export function he3PressureFromTemperature(temperatureK: number): number {
  const tK = checkTemperature("3He", temperatureK, HE3_RANGE);
  return branchPressurePa(HE3, tK, ...HE3_BRACKET_PA);
}
