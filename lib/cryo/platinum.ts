// Platinum resistance thermometers: IEC 60751 (Callendar–Van Dusen) resistance ↔ temperature and
// the tolerance classes. Source: IEC 60751:2008, A = 3.9083e−3, B = −5.775e−7, C = −4.183e−12,
// defined for −200…850 °C only; outside that the standard says nothing, so we refuse.

import { type RangeSpec, requireInRange, requirePositive } from "./errors";
import { bisect } from "./solve";

const A = 3.9083e-3;
const B = -5.775e-7;
const C = -4.183e-12;

export const PT_TEMPERATURE_MIN_C = -200;
export const PT_TEMPERATURE_MAX_C = 850;
const RANGE_TEXT = `IEC 60751 range (${PT_TEMPERATURE_MIN_C}…${PT_TEMPERATURE_MAX_C} °C)`;
const TEMPERATURE_RANGE: RangeSpec = {
  min: PT_TEMPERATURE_MIN_C,
  max: PT_TEMPERATURE_MAX_C,
  unit: "°C",
  text: RANGE_TEXT,
};

function cvdRatio(tC: number): number {
  const base = 1 + A * tC + B * tC * tC;
  return tC < 0 ? base + C * (tC - 100) * tC * tC * tC : base;
}

/** Resistance in Ω of a platinum sensor at tCelsius (ITS-90 °C), nominal r0Ohm at 0 °C. */
export function ptResistance(tCelsius: number, r0Ohm = 100): number {
  requirePositive("R0 (Ω)", r0Ohm);
  requireInRange("Temperature", tCelsius, TEMPERATURE_RANGE);
  return r0Ohm * cvdRatio(tCelsius);
}

/** Temperature in °C from a platinum sensor's resistance (inverse of ptResistance). */
export function ptTemperature(rOhm: number, r0Ohm = 100): number {
  requirePositive("R0 (Ω)", r0Ohm);
  const rMin = r0Ohm * cvdRatio(PT_TEMPERATURE_MIN_C);
  const rMax = r0Ohm * cvdRatio(PT_TEMPERATURE_MAX_C);
  requireInRange("Resistance", rOhm, {
    min: rMin,
    max: rMax,
    unit: "Ω",
    text: `${RANGE_TEXT.slice(0, -1)}, ${rMin.toFixed(2)}–${rMax.toFixed(2)} Ω for R0 = ${r0Ohm} Ω)`,
  });
  const ratio = rOhm / r0Ohm;
  if (ratio >= 1) {
    // Above 0 °C the equation is a quadratic; take the physical root.
    return (-A + Math.sqrt(A * A - 4 * B * (1 - ratio))) / (2 * B);
  }
  return bisect((t) => cvdRatio(t) - ratio, PT_TEMPERATURE_MIN_C, 0, 1e-13);
}

export type PtToleranceClass = "A" | "B";

/**
 * Permitted deviation ±°C of an IEC 60751 class A or B sensor at tCelsius. The standard also
 * limits each class to a temperature span that depends on the element (wire-wound or film);
 * check the maker's sheet for that — here only the general −200…850 °C range is enforced.
 */
export function ptToleranceC(tCelsius: number, toleranceClass: PtToleranceClass): number {
  requireInRange("Temperature", tCelsius, TEMPERATURE_RANGE);
  const abs = Math.abs(tCelsius);
  return toleranceClass === "A" ? 0.15 + 0.002 * abs : 0.3 + 0.005 * abs;
}
