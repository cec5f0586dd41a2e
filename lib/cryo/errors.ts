// Input guards shared by the lib/cryo modules. Owns the one rule of this folder: a value outside
// a formula's published range, or a non-finite number, is refused with a message a technician can
// read — never silently extrapolated.

/** An input that is well-formed as a number but unusable for another reason (too few points, a
 * transfer inside a boil-off history, an unreadable calibration line). */
export class CryoInputError extends Error {
  constructor(message: string) {
    super(message);
    this.name = "CryoInputError";
  }
}

/** Throws a RangeError unless `value` is a finite number. */
export function requireFinite(name: string, value: number): number {
  if (typeof value !== "number" || !Number.isFinite(value)) {
    throw new RangeError(`${name} must be a finite number (got ${String(value)})`);
  }
  return value;
}

/** Throws a RangeError unless `value` is finite and > 0. */
export function requirePositive(name: string, value: number): number {
  requireFinite(name, value);
  if (value <= 0) throw new RangeError(`${name} must be greater than 0 (got ${value})`);
  return value;
}

/** Throws a RangeError unless `value` is finite and ≥ 0. */
export function requireNonNegative(name: string, value: number): number {
  requireFinite(name, value);
  if (value < 0) throw new RangeError(`${name} must not be negative (got ${value})`);
  return value;
}

export interface RangeSpec {
  min: number;
  max: number;
  /** Unit printed after the value, e.g. "Pa". */
  unit: string;
  /** The published range as the message should name it, e.g. "IEC 60751 range (−200…850 °C)". */
  text: string;
}

/** Throws a RangeError unless range.min ≤ value ≤ range.max; the message says which side. */
export function requireInRange(what: string, value: number, range: RangeSpec): number {
  requireFinite(what, value);
  const shown = `${what} ${fmt(value)}${range.unit ? ` ${range.unit}` : ""}`;
  if (value < range.min) throw new RangeError(`${shown} is below the ${range.text}`);
  if (value > range.max) throw new RangeError(`${shown} is above the ${range.text}`);
  return value;
}

/** Short human formatting for messages: 4 significant digits, no trailing noise. */
export function fmt(value: number, digits = 4): string {
  return Number(value.toPrecision(digits)).toString();
}
