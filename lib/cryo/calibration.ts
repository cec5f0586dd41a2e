// Sensor calibration tables (ruthenium-oxide, germanium, carbon resistors; silicon diodes):
// parsing a two-column text table and converting a reading to temperature. Interpolation is
// monotone cubic (Fritsch–Carlson / PCHIP, SIAM J. Numer. Anal. 17, 238 (1980)) in
// (ln R, ln T) for resistive sensors — their R(T) is close to a power law there — and in (V, T)
// for diodes, whose V(T) is nearly linear. Outside the table nothing is extrapolated.

import { CryoInputError, fmt, requireInRange } from "./errors";
import { pchip } from "./interp";

export type SensorKind = "ruthenium-oxide" | "germanium" | "silicon-diode" | "carbon";
export type ColumnOrder = "temperature-value" | "value-temperature";

export interface CalibrationPoint {
  /** Resistance in Ω, or voltage in V for a diode. */
  readonly value: number;
  readonly temperatureK: number;
}

export interface CalibrationRange {
  readonly valueMin: number;
  readonly valueMax: number;
  readonly temperatureMinK: number;
  readonly temperatureMaxK: number;
}

export interface CalibrationTable {
  readonly sensorKind: SensorKind;
  readonly quantity: "resistance" | "voltage";
  readonly valueUnit: "Ω" | "V";
  /** Sorted by value, ascending. */
  readonly points: readonly CalibrationPoint[];
  readonly range: CalibrationRange;
}

export interface ParseOptions {
  sensorKind: SensorKind;
  /** Column order; when omitted it is read from a header line, else temperature first. */
  columns?: ColumnOrder;
}

export const MIN_CALIBRATION_POINTS = 3;

interface Row {
  line: number;
  a: number;
  b: number;
}

const NUMBER = /^[+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?$/;

function splitFields(text: string): string[] {
  return text.split(/[\s,;]+/).filter((f) => f.length > 0);
}

/** Header words that say which column comes first. */
function orderFromHeader(header: string): ColumnOrder | undefined {
  const first = splitFields(header)[0]?.toLowerCase() ?? "";
  if (/^(t|temp|temperature|t\(k\)|t_k|k)\b/.test(first)) return "temperature-value";
  if (/^(r|res|resistance|ohm|ohms|v|volt|volts|voltage|u)\b/.test(first)) return "value-temperature";
  return undefined;
}

function readRows(text: string): { rows: Row[]; header?: string } {
  const rows: Row[] = [];
  let header: string | undefined;
  text.split(/\r\n|\n|\r/).forEach((raw, index) => {
    const line = index + 1;
    const content = raw.replace(/#.*$/, "").trim();
    if (content === "") return;
    const fields = splitFields(content);
    if (!fields.every((f) => NUMBER.test(f))) {
      if (rows.length === 0) {
        header ??= content;
        return;
      }
      throw new CryoInputError(`Line ${line}: cannot read "${content}" as two numbers`);
    }
    if (fields.length !== 2) {
      throw new CryoInputError(`Line ${line}: expected 2 columns, found ${fields.length}`);
    }
    rows.push({ line, a: Number(fields[0]), b: Number(fields[1]) });
  });
  return header === undefined ? { rows } : { rows, header };
}

function toPoints(rows: Row[], order: ColumnOrder, unit: string): (CalibrationPoint & { line: number })[] {
  return rows.map(({ line, a, b }) => {
    const point = order === "temperature-value" ? { temperatureK: a, value: b } : { temperatureK: b, value: a };
    if (point.temperatureK <= 0) throw new CryoInputError(`Line ${line}: temperature must be > 0 K`);
    if (point.value <= 0) throw new CryoInputError(`Line ${line}: value must be > 0 ${unit}`);
    return { ...point, line };
  });
}

/** Both columns must move strictly one way through the file (either direction). */
function checkMonotone(points: readonly (CalibrationPoint & { line: number })[]): void {
  const seenT = new Map<number, number>();
  const seenV = new Map<number, number>();
  for (const p of points) {
    const dupT = seenT.get(p.temperatureK);
    if (dupT !== undefined) {
      throw new CryoInputError(`Line ${p.line}: duplicate temperature ${p.temperatureK} K (also on line ${dupT})`);
    }
    const dupV = seenV.get(p.value);
    if (dupV !== undefined) {
      throw new CryoInputError(`Line ${p.line}: duplicate value ${p.value} (also on line ${dupV})`);
    }
    seenT.set(p.temperatureK, p.line);
    seenV.set(p.value, p.line);
  }
  const [p0, p1] = points;
  if (p0 === undefined || p1 === undefined) return;
  const dirT = Math.sign(p1.temperatureK - p0.temperatureK);
  const dirV = Math.sign(p1.value - p0.value);
  for (let i = 1; i < points.length; i++) {
    const prev = points[i - 1];
    const cur = points[i];
    if (prev === undefined || cur === undefined) continue;
    if (Math.sign(cur.temperatureK - prev.temperatureK) !== dirT) {
      throw new CryoInputError(`Line ${cur.line}: temperature ${cur.temperatureK} K breaks the order of the table`);
    }
    if (Math.sign(cur.value - prev.value) !== dirV) {
      throw new CryoInputError(
        `Line ${cur.line}: value ${cur.value} is not monotonic in temperature (the sensor curve must not turn back)`,
      );
    }
  }
}

/**
 * Parse a calibration table: CSV or whitespace two-column text, '#' comments and header lines
 * before the data allowed. Errors name the offending line.
 */
export function parseCalibration(text: string, options: ParseOptions): CalibrationTable {
  const { rows, header } = readRows(text);
  const isDiode = options.sensorKind === "silicon-diode";
  const valueUnit = isDiode ? "V" : "Ω";
  const order = options.columns ?? (header ? orderFromHeader(header) : undefined) ?? "temperature-value";
  const points = toPoints(rows, order, valueUnit);
  if (points.length < MIN_CALIBRATION_POINTS) {
    throw new CryoInputError(
      `A calibration table needs at least ${MIN_CALIBRATION_POINTS} points (found ${points.length})`,
    );
  }
  checkMonotone(points);
  const sorted = points.map(({ value, temperatureK }) => ({ value, temperatureK })).sort((p, q) => p.value - q.value);
  const temperatures = sorted.map((p) => p.temperatureK);
  const range: CalibrationRange = {
    valueMin: sorted[0]?.value ?? NaN,
    valueMax: sorted[sorted.length - 1]?.value ?? NaN,
    temperatureMinK: Math.min(...temperatures),
    temperatureMaxK: Math.max(...temperatures),
  };
  return {
    sensorKind: options.sensorKind,
    quantity: isDiode ? "voltage" : "resistance",
    valueUnit,
    points: sorted,
    range,
  };
}

// The table stays plain data (it is stored and synced); its interpolant is built on first use.
const curves = new WeakMap<CalibrationTable, (value: number) => number>();

function curveOf(table: CalibrationTable): (value: number) => number {
  const cached = curves.get(table);
  if (cached) return cached;
  const logLog = table.quantity === "resistance";
  const forward = logLog ? Math.log : (x: number) => x;
  const back = logLog ? Math.exp : (y: number) => y;
  const spline = pchip(
    table.points.map((p) => forward(p.value)),
    table.points.map((p) => forward(p.temperatureK)),
  );
  const curve = (value: number) => back(spline(forward(value)));
  curves.set(table, curve);
  return curve;
}

/** Temperature in K for a reading (Ω or V) inside the table's range; outside → RangeError. */
export function convertReading(table: CalibrationTable, value: number): number {
  const { range } = table;
  requireInRange(`Reading`, value, {
    min: range.valueMin,
    max: range.valueMax,
    unit: table.valueUnit,
    text:
      `calibration table's range (${fmt(range.valueMin)}–${fmt(range.valueMax)} ${table.valueUnit}, ` +
      `${fmt(range.temperatureMinK)}–${fmt(range.temperatureMaxK)} K)`,
  });
  return curveOf(table)(value);
}
