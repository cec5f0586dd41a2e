"use client";
// The building blocks of the /calc page: a calculator card with its inputs, live results and
// errors. A RangeError (or CryoInputError) from lib/cryo is shown next to the input it names
// (matched by the field's `match` pattern on the message), else under the inputs — never NaN,
// never a crash. Everything runs in the browser: the page works offline once cached.
import { type ReactNode, useId, useState } from "react";
import { OptionList } from "@/components/ui/form";
import { Panel } from "@/components/ui/panel";
import type { PressureReading } from "@/lib/cryo";
import { parseTypedNumber } from "@/lib/typed-number";
import { readNumber } from "./derive";

export type NumberSpec = {
  kind?: "number";
  key: string;
  label: string;
  unit?: string;
  initial: string;
  hint?: string;
  /** Error messages that start like this belong to this input. */
  match?: RegExp;
  /** Empty is allowed (the compute function gets NaN and decides). */
  optional?: boolean;
};
export type SelectSpec = {
  kind: "select";
  key: string;
  label: string;
  initial: string;
  options: readonly { readonly value: string; readonly label: string }[];
  match?: RegExp;
};
export type TextSpec = {
  kind: "text";
  key: string;
  label: string;
  initial: string;
  hint?: string;
  rows?: number;
  match?: RegExp;
};
export type FieldSpec = NumberSpec | SelectSpec | TextSpec;

export type ResultRow = { label: string; text: string; tone?: "ok" | "warn" | "danger" };
export type Inputs = { n: Record<string, number>; s: Record<string, string> };

const INPUT =
  "w-full rounded-xl border-2 border-line bg-bg px-3 py-2 text-lg text-ink placeholder:text-muted focus:border-accent aria-[invalid=true]:border-danger";

/** A result that is a figure (set in the number font); a sentence stays in the text font. */
const FIGURE = /^[≈±−+\-\d]/;
const TONE: Record<NonNullable<ResultRow["tone"]>, string> = {
  ok: "text-ok",
  warn: "text-warn",
  danger: "text-danger",
};

export function Calculator({
  title,
  intro,
  fields,
  compute,
  footer,
  wide = false,
}: {
  title: string;
  intro?: ReactNode;
  fields: FieldSpec[];
  compute: (inputs: Inputs) => ResultRow[];
  /** Shown under the results (cautions, sources). */
  footer?: ReactNode;
  wide?: boolean;
}) {
  const uid = useId();
  const [values, setValues] = useState<Record<string, string>>(() =>
    Object.fromEntries(fields.map((f) => [f.key, f.initial])),
  );
  const fieldErrors: Record<string, string> = {};
  const n: Record<string, number> = {};
  const s: Record<string, string> = {};
  for (const f of fields) {
    const raw = values[f.key] ?? "";
    s[f.key] = raw;
    if (f.kind === "select" || f.kind === "text") continue;
    const v = parseTypedNumber(raw);
    if (!v.ok) fieldErrors[f.key] = v.message;
    else if (v.value !== undefined) n[f.key] = v.value;
    else if (f.optional) n[f.key] = NaN;
    else fieldErrors[f.key] = "Enter a number.";
  }
  let rows: ResultRow[] = [];
  let general: string | null = null;
  if (Object.keys(fieldErrors).length === 0) {
    try {
      rows = compute({ n, s });
    } catch (e) {
      const message = e instanceof Error ? e.message : String(e);
      const owner = fields.find((f) => f.match?.test(message));
      if (owner) fieldErrors[owner.key] = message;
      else general = message;
    }
  }
  return (
    <Panel className={`flex flex-col gap-3 ${wide ? "lg:col-span-2" : ""}`}>
      <h3 className="text-lg font-bold">{title}</h3>
      {intro && <div className="text-base text-muted">{intro}</div>}
      <div className={`grid gap-3 ${wide ? "" : "sm:grid-cols-2"}`}>
        {fields.map((f) => {
          const id = `${uid}-${f.key}`;
          const err = fieldErrors[f.key];
          const set = (v: string) => setValues((old) => ({ ...old, [f.key]: v }));
          return (
            <div key={f.key} className={`flex flex-col gap-1 ${f.kind === "text" ? "sm:col-span-2" : ""}`}>
              <label htmlFor={id} className="font-semibold">
                {f.label}
                {f.kind !== "select" && f.kind !== "text" && f.unit ? (
                  <span className="font-normal text-muted"> ({f.unit})</span>
                ) : null}
              </label>
              {f.kind === "select" ? (
                <select id={id} className={INPUT} value={values[f.key]} onChange={(e) => set(e.target.value)}>
                  <OptionList options={f.options} />
                </select>
              ) : f.kind === "text" ? (
                <textarea
                  id={id}
                  rows={f.rows ?? 6}
                  spellCheck={false}
                  className={`${INPUT} num text-base`}
                  value={values[f.key]}
                  aria-invalid={Boolean(err)}
                  aria-describedby={err ? `${id}-err` : undefined}
                  onChange={(e) => set(e.target.value)}
                />
              ) : (
                <input
                  id={id}
                  inputMode="decimal"
                  autoComplete="off"
                  className={`${INPUT} num`}
                  value={values[f.key]}
                  aria-invalid={Boolean(err)}
                  aria-describedby={err ? `${id}-err` : undefined}
                  onChange={(e) => set(e.target.value)}
                />
              )}
              {f.kind !== "select" && f.hint && !err && <p className="text-base text-muted">{f.hint}</p>}
              {err && (
                <p id={`${id}-err`} role="alert" className="text-base font-semibold text-danger">
                  {err}
                </p>
              )}
            </div>
          );
        })}
      </div>
      {general && (
        <p role="alert" className="text-base font-semibold text-danger">
          {general}
        </p>
      )}
      {rows.length > 0 && (
        <dl
          aria-label={`${title}: results`}
          className="grid gap-x-6 gap-y-2 rounded-xl bg-sunk px-4 py-3 sm:grid-cols-2"
        >
          {rows.map((r) => (
            <div key={r.label} className="flex flex-col">
              <dt className="text-base font-semibold text-muted">{r.label}</dt>
              <dd
                className={`${FIGURE.test(r.text) ? "num" : ""} text-lg font-semibold ${r.tone ? TONE[r.tone] : "text-ink"}`}
              >
                {r.text}
              </dd>
            </div>
          ))}
        </dl>
      )}
      {footer}
    </Panel>
  );
}

const READS_OPTIONS: { value: PressureReading; label: string }[] = [
  { value: "gauge", label: "Gauge: above the room's air pressure" },
  { value: "absolute", label: "Absolute: above vacuum" },
];

/** The gauge/absolute choice and the room's barometric pressure (used only for a gauge reading). */
export const readsFields = (initial: PressureReading) =>
  [
    { kind: "select", key: "reads", label: "The gauge reads", initial, options: READS_OPTIONS },
    {
      key: "baro",
      label: "Room barometric pressure (for a gauge reading)",
      unit: "hPa",
      initial: "1013.25",
      match: /Barometric|below vacuum/,
    },
  ] as const;

/** Pressure units a gauge may read, to Pa. Torr = 101 325/760 Pa (exact by definition). */
export const PRESSURE_UNITS: Record<string, number> = { mbar: 100, Pa: 1, kPa: 1000, bar: 1e5, Torr: 101_325 / 760 };
export const PRESSURE_OPTIONS = Object.keys(PRESSURE_UNITS).map((u) => ({ value: u, label: u }));

/** Parse pasted two-column numbers (CSV, tabs or spaces; '#' comments; a header line allowed). */
export function parsePairs(text: string, what: string): [number, number][] {
  const out: [number, number][] = [];
  text.split(/\r?\n/).forEach((raw, i) => {
    const line = raw.replace(/#.*$/, "").trim();
    if (!line) return;
    const parts = line.split(/[\s,;]+/).filter(Boolean);
    const nums = parts.map((p) => readNumber(p));
    if (nums.some((x) => x === undefined)) {
      if (out.length === 0) return; // a header line
      throw new RangeError(`${what}: line ${i + 1} is not two numbers ("${line}")`);
    }
    if (nums.length !== 2) throw new RangeError(`${what}: line ${i + 1} has ${nums.length} columns, expected 2`);
    out.push([nums[0] as number, nums[1] as number]);
  });
  return out;
}
