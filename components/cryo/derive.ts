// Derived values shown beside a reading as it is typed: pure functions, no React, no I/O, so the
// same rules run in the reading form, the procedure step and the unit tests. Each rule maps one
// kind of reading to figures from lib/cryo (ITS-90 4He or 3He vapour pressure over a pure bath or
// pot — never a dilution fridge's still, whose vapour comes from a mixture —, the reservoir level
// calibration and boil-off fit, the magnet's coil constant and ramp limit, a sensor calibration
// table). A value outside a formula's range comes back as a message, never as NaN or a throw.
import {
  boilOffRate,
  type CalibrationTable,
  convertReading,
  currentFromField,
  fieldFromCurrent,
  forecastMinimumLevel,
  he3TemperatureFromPressure,
  he4TemperatureFromPressure,
  litresFromLevel,
  ptTemperature,
  rampTime,
} from "@/lib/cryo";
import type { CryostatConfig } from "@/lib/schemas/cryostat";
import { readTypedNumber } from "@/lib/typed-number";

/** What the derivation needs to know about a cryostat (a row from the server or the tablet store). */
export interface CryostatLike {
  readonly id: string;
  readonly name?: string;
  readonly config: CryostatConfig;
}

/** One helium level reading, in %, with its time. */
export interface LevelPoint {
  readonly timeMs: number;
  readonly percent: number;
}

export interface DeriveInput {
  readonly cryostat: CryostatLike;
  /** The reading's quantity as written in the form ("Helium level", "VTI pressure", "Magnet current"…). */
  readonly quantity: string;
  readonly unit: string;
  /** The typed value: a number, or the raw text of the input (empty → nothing shown). */
  readonly value: number | string | null | undefined;
  /** Thermometer stage key from the cryostat's config. */
  readonly stage?: string;
  /** Level readings since the last transfer (older first or any order); enables days left. */
  readonly levelHistory?: readonly LevelPoint[];
  /** The field the magnet is at now (T), the start of the ramp estimate; default 0 T. */
  readonly fromFieldT?: number;
  /** The stage's sensor calibration table, when one was accepted for it. */
  readonly calibration?: CalibrationTable;
  /** Clock for the forecast (ms); default Date.now(). */
  readonly nowMs?: number;
}

export interface DerivedItem {
  /** Plain words: "Temperature (ITS-90, ⁴He)". */
  readonly label: string;
  readonly value: number;
  readonly unit: string;
  /** The figure as shown, with its unit. */
  readonly text: string;
}

export type Derived =
  | { readonly status: "none" }
  | { readonly status: "error"; readonly message: string }
  | {
      readonly status: "ok";
      readonly items: readonly DerivedItem[];
      /** A note that qualifies the figures (e.g. why there is no forecast). */
      readonly note?: string;
      /** Which caution the figures need beside them. */
      readonly caution?: "magnet";
    };

const NONE: Derived = { status: "none" };
const MS_PER_DAY = 86_400_000;

/** Significant-figure formatting without trailing noise; thousands grouped. */
export function figure(x: number, digits = 4): string {
  if (!Number.isFinite(x)) return "—";
  if (x === 0) return "0";
  const rounded = Number(x.toPrecision(digits));
  return Math.abs(rounded) >= 10_000 ? rounded.toLocaleString("en-GB") : rounded.toString();
}

/** A temperature in the unit a fridge person reads: mK below 1 K. */
export function temperatureText(k: number): string {
  return k < 1 ? `${figure(k * 1000)} mK` : `${figure(k)} K`;
}

/** Minutes as "42 min" or "3 h 05 min". */
export function durationText(minutes: number): string {
  if (!Number.isFinite(minutes)) return "—";
  if (minutes < 60) return `${figure(minutes, 3)} min`;
  const h = Math.floor(minutes / 60);
  const m = Math.round(minutes - h * 60);
  return m === 60 ? `${h + 1} h 00 min` : `${h} h ${String(m).padStart(2, "0")} min`;
}

/** Reads a typed value; undefined when the input is empty or not (yet) a number. */
export function readNumber(value: DeriveInput["value"]): number | undefined {
  if (value === null || value === undefined) return undefined;
  if (typeof value === "number") return Number.isFinite(value) ? value : undefined;
  return readTypedNumber(value);
}

const PRESSURE_TO_PA: Record<string, number> = { Pa: 1, mbar: 100, bar: 1e5, kPa: 1000 };
const RESISTANCE_TO_OHM: Record<string, number> = { Ω: 1, ohm: 1, kΩ: 1000 };

/** A dilution refrigerator's still: the vapour is ³He over a dilute mixture. */
function isStill(input: DeriveInput): boolean {
  return /\bstill\b/.test(`${input.quantity.toLowerCase()} ${input.stage ?? ""}`);
}

/** Which pure-helium scale a vapour pressure is read on: ³He when the quantity or stage says so. */
function isotopeOf(input: DeriveInput): "he3" | "he4" {
  return /³he|\b3\s*-?\s*he\b|\bhe\s*-?\s*3\b|helium\s*-?\s*3/i.test(`${input.quantity} ${input.stage ?? ""}`)
    ? "he3"
    : "he4";
}

/** Quantities read as a vapour pressure over a pure helium bath (a pumped pot, a VTI, a bath): not tanks or lines. */
function isVapourPressure(input: DeriveInput): boolean {
  const q = input.quantity.toLowerCase();
  if (/tank|dump|cylinder|mixture|line|inlet|ivc|ovc|vacuum|supply|return/.test(q)) return false;
  if (isStill(input)) return false;
  if (input.stage && input.stage === input.cryostat.config.vapourPressureStage) return true;
  return /\b1\s*k\b|pot|vti|vapou?r|bath/.test(q) || (input.stage !== undefined && /pot|vti|bath/.test(input.stage));
}

/** What a still pressure does tell: a labelled note instead of a temperature no scale gives. */
const STILL_NOTE: Derived = {
  status: "ok",
  items: [],
  note: "Still pressure: the vapour is mostly ³He evaporating from the dilute ³He/⁴He mixture, so no helium vapour-pressure scale gives the still's temperature. Read the still thermometer.",
};

function isLevel(input: DeriveInput): boolean {
  return input.unit === "%" && /helium|level|he\b|lhe/i.test(input.quantity);
}

function errorOf(e: unknown): Derived {
  if (e instanceof Error) return { status: "error", message: e.message };
  return { status: "error", message: String(e) };
}

function vapourPressure(pressure: number, unit: string, isotope: "he3" | "he4"): Derived {
  const toPa = PRESSURE_TO_PA[unit];
  if (toPa === undefined) return NONE;
  const k =
    isotope === "he3" ? he3TemperatureFromPressure(pressure * toPa) : he4TemperatureFromPressure(pressure * toPa);
  const label = `Temperature (ITS-90, ${isotope === "he3" ? "³He" : "⁴He"} vapour pressure)`;
  return { status: "ok", items: [{ label, value: k, unit: "K", text: temperatureText(k) }] };
}

function helium(input: DeriveInput, percent: number): Derived {
  const reservoir = input.cryostat.config.reservoir;
  if (!reservoir) return NONE;
  const litres = litresFromLevel(percent, reservoir.calibration);
  const items: DerivedItem[] = [{ label: "Liquid helium", value: litres, unit: "L", text: `${figure(litres, 3)} L` }];
  const history = input.levelHistory;
  if (!history || history.length === 0)
    return { status: "ok", items, note: "No level history on this tablet: no forecast." };
  const nowMs = input.nowMs ?? Date.now();
  // The reading being typed is the newest point of the fit.
  const sorted = [...history].filter((p) => p.timeMs < nowMs).sort((a, b) => a.timeMs - b.timeMs);
  const points = [...sorted, { timeMs: nowMs, percent }];
  try {
    const rate = boilOffRate(
      points.map((p) => ({ timeMs: p.timeMs, litres: litresFromLevel(p.percent, reservoir.calibration) })),
    );
    const minimumLitres = litresFromLevel(reservoir.minimumPercent, reservoir.calibration);
    items.push({
      label: "Boil-off",
      value: rate.litresPerDay,
      unit: "L/day",
      text: `${figure(rate.litresPerDay, 3)} ± ${figure(rate.standardErrorLitresPerDay, 2)} L/day`,
    });
    if (litres <= minimumLitres) {
      return {
        status: "ok",
        items,
        note: `At or below the minimum level (${figure(reservoir.minimumPercent, 3)} %): transfer now.`,
      };
    }
    const f = forecastMinimumLevel(rate, minimumLitres, nowMs);
    if (!f.forecast) return { status: "ok", items, note: f.reason };
    items.push({
      label: `Days left to ${figure(reservoir.minimumPercent, 3)} %`,
      value: f.daysLeft,
      unit: "d",
      text: `${figure(f.daysLeft, 2)} days (${new Date(f.reachMs).toLocaleDateString("en-GB", { day: "2-digit", month: "short" })})`,
    });
    return { status: "ok", items };
  } catch (e) {
    // Litres still stand; the forecast needs more readings since the last transfer.
    return { status: "ok", items, note: e instanceof Error ? e.message : String(e) };
  }
}

function magnetCurrent(input: DeriveInput, currentA: number): Derived {
  const magnet = input.cryostat.config.magnet;
  if (!magnet) return NONE;
  const fieldT = fieldFromCurrent(currentA, magnet);
  return magnetRamp(input, magnet, fieldT, {
    label: "Field at centre",
    value: fieldT,
    unit: "T",
    text: `${figure(fieldT)} T`,
  });
}

function magnetField(input: DeriveInput, fieldT: number): Derived {
  const magnet = input.cryostat.config.magnet;
  if (!magnet) return NONE;
  const currentA = currentFromField(fieldT, magnet);
  return magnetRamp(input, magnet, fieldT, {
    label: "Coil current",
    value: currentA,
    unit: "A",
    text: `${figure(currentA)} A`,
  });
}

// Both magnet directions end the same way: the converted figure, then the ramp from the last field.
function magnetRamp(
  input: DeriveInput,
  magnet: NonNullable<CryostatConfig["magnet"]>,
  fieldT: number,
  converted: DerivedItem,
): Derived {
  const from = input.fromFieldT ?? 0;
  const ramp = rampTime(from, fieldT, magnet.rampLimitTPerMin, magnet);
  return {
    status: "ok",
    caution: "magnet",
    items: [
      converted,
      {
        label: `Ramp from ${figure(from, 3)} T at ${figure(magnet.rampLimitTPerMin, 3)} T/min`,
        value: ramp.minutes,
        unit: "min",
        text: durationText(ramp.minutes),
      },
    ],
  };
}

function sensor(input: DeriveInput, value: number): Derived {
  const ohm = RESISTANCE_TO_OHM[input.unit];
  const isVoltage = input.unit === "V" || input.unit === "mV";
  if (input.calibration) {
    const table = input.calibration;
    if (table.quantity === "voltage" && !isVoltage) return NONE;
    if (table.quantity === "resistance" && ohm === undefined) return NONE;
    const raw = table.quantity === "voltage" ? (input.unit === "mV" ? value / 1000 : value) : value * (ohm ?? 1);
    const k = convertReading(table, raw);
    return {
      status: "ok",
      items: [{ label: "Temperature (sensor calibration)", value: k, unit: "K", text: temperatureText(k) }],
    };
  }
  // A platinum sensor named as such: IEC 60751 needs no uploaded table.
  const pt = /pt\s*-?\s*(100|1000)\b/i.exec(input.quantity);
  if (pt && ohm !== undefined) {
    const c = ptTemperature(value * ohm, Number(pt[1]));
    const k = c + 273.15;
    return {
      status: "ok",
      items: [
        { label: `Temperature (IEC 60751, Pt${pt[1]})`, value: k, unit: "K", text: `${figure(k)} K (${figure(c)} °C)` },
      ],
    };
  }
  return NONE;
}

/** The derived figures for a reading as typed; `status: "none"` when no rule applies. */
export function deriveReading(input: DeriveInput): Derived {
  const value = readNumber(input.value);
  if (value === undefined) return NONE;
  try {
    if (input.unit in PRESSURE_TO_PA && isStill(input)) return STILL_NOTE;
    if (input.unit in PRESSURE_TO_PA && isVapourPressure(input)) {
      return vapourPressure(value, input.unit, isotopeOf(input));
    }
    if (isLevel(input)) return helium(input, value);
    if (input.unit === "A") return magnetCurrent(input, value);
    if ((input.unit === "T" || input.unit === "mT") && input.cryostat.config.magnet) {
      return magnetField(input, input.unit === "mT" ? value / 1000 : value);
    }
    if (input.unit in RESISTANCE_TO_OHM || input.unit === "V" || input.unit === "mV") return sensor(input, value);
    return NONE;
  } catch (e) {
    return errorOf(e);
  }
}

/**
 * Level readings since the last transfer: everything after the newest rise larger than the
 * meter's noise (a transfer), so the boil-off fit never spans a fill.
 */
export function sinceLastFill(points: readonly LevelPoint[], riseTolerancePercent = 1): LevelPoint[] {
  const sorted = [...points].sort((a, b) => a.timeMs - b.timeMs);
  let start = 0;
  for (let i = 1; i < sorted.length; i++) {
    const prev = sorted[i - 1];
    const cur = sorted[i];
    if (prev && cur && cur.percent - prev.percent > riseTolerancePercent) start = i;
  }
  return sorted.slice(start);
}

export { MS_PER_DAY };
