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

/** The standard's table prints resistances to 0.01 Ω (Pt100: 18.52 Ω at −200 °C, 390.48 Ω at 850 °C). */
const roundToTable = (r: number) => Math.round(r * 100) / 100;

/**
 * Temperature in °C from a platinum sensor's resistance (inverse of ptResistance). The range is
 * −200…850 °C, edges included: both the exact edge resistances and the table's 0.01 Ω values
 * (18.52 Ω for a Pt100, which is 0.000 08 Ω below the exact 18.520 08 Ω) are accepted; a reading
 * between the two is the edge temperature.
 */
export function ptTemperature(rOhm: number, r0Ohm = 100): number {
  requirePositive("R0 (Ω)", r0Ohm);
  const rMinExact = r0Ohm * cvdRatio(PT_TEMPERATURE_MIN_C);
  const rMaxExact = r0Ohm * cvdRatio(PT_TEMPERATURE_MAX_C);
  const rMin = Math.min(rMinExact, roundToTable(rMinExact));
  const rMax = Math.max(rMaxExact, roundToTable(rMaxExact));
  requireInRange("Resistance", rOhm, {
    min: rMin,
    max: rMax,
    unit: "Ω",
    text: `${RANGE_TEXT.slice(0, -1)}, ${rMin.toFixed(2)}–${rMax.toFixed(2)} Ω for R0 = ${r0Ohm} Ω)`,
  });
  if (rOhm <= rMinExact) return PT_TEMPERATURE_MIN_C;
  if (rOhm >= rMaxExact) return PT_TEMPERATURE_MAX_C;
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
