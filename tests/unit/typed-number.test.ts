// The one parser for typed numbers (lib/typed-number.ts) against the four it replaced: the entry
// forms' (components/entries/form-schemas.ts), the transfer and quench forms' (components/ui/form.tsx
// typedNumber), the calculators' (components/cryo/derive.ts readNumber) and the procedure keypad's
// (components/procedures/keypad.tsx). Each old parser is copied here as it was, and every input of
// a list any of them accepted must read as the same number now.
import { describe, expect, it } from "vitest";
import { keypadNumber } from "@/components/procedures/keypad";
import { parseTypedNumber, readTypedNumber, typedNumber } from "@/lib/typed-number";

// --- the earlier parsers, verbatim apart from their names ---
function oldFormToNumber(v: string): number | undefined {
  const t = v.trim().replace(",", ".").replace(/\s/g, "");
  if (t === "") return undefined;
  return /^[-+]?(\d+\.?\d*|\.\d+)(e[-+]?\d+)?$/i.test(t) ? Number(t) : Number.NaN;
}
const oldTypedNumber = (s: string): number | undefined => (s.trim() === "" ? undefined : Number(s.replace(",", ".")));
function oldReadNumber(value: string): number | undefined {
  const t = value.trim().replace(/\s/g, "").replace(",", ".");
  if (t === "" || !/^[+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?$/.test(t)) return undefined;
  return Number(t);
}
function oldKeypadNumber(value: string): number | null {
  if (!/^-?\d+(\.\d+)?$/.test(value.trim())) return null;
  const n = Number(value);
  return Number.isFinite(n) ? n : null;
}

const INPUTS = [
  "0",
  "4.2",
  "4,2",
  "-4.2",
  "+4.2",
  "-0,5",
  "12.",
  "12,",
  ".5",
  ",5",
  "-.5",
  "007",
  "3e-5",
  "3E-5",
  "3e5",
  "3e+5",
  "3,5e-3",
  "3.e5",
  " 12 ",
  "1 000",
  "1\u00a0000,5",
  "1\u2009013.25",
  "12\t",
  "1013.25",
  "0.000012",
  "99999999999",
  "1e308",
];
// Accepted by the old transfer/quench parser (JavaScript's Number()) only by accident, and refused
// now: hexadecimal, binary and octal literals and the word Infinity (not finite: the entry schemas
// refused it at save anyway). Also "1e999", which the calculators' parser read as Infinity.
const NOW_REFUSED = ["0x10", "0b101", "0o17", "Infinity", "-Infinity", "1e999"];

describe("one parser for typed numbers", () => {
  it("reads every number any earlier parser accepted as the same value", () => {
    for (const text of INPUTS) {
      const olds = [oldFormToNumber(text), oldTypedNumber(text), oldReadNumber(text), oldKeypadNumber(text)];
      const accepted = olds.filter((x): x is number => typeof x === "number" && Number.isFinite(x));
      expect(accepted.length, `some old parser accepts "${text}"`).toBeGreaterThan(0);
      for (const v of accepted) expect(readTypedNumber(text), text).toBe(v);
    }
  });

  it("no earlier parser accepted a number the new one refuses, except the listed accidents", () => {
    const probes = [...INPUTS, ...NOW_REFUSED, "", " ", "-", "+", ".", ",", "1e", "e5", "1.2.3", "1,2,3", "1,000.5"];
    for (const text of probes) {
      const olds = [oldFormToNumber(text), oldTypedNumber(text), oldReadNumber(text), oldKeypadNumber(text)];
      const someAccepted = olds.some((x) => typeof x === "number" && !Number.isNaN(x));
      const now = parseTypedNumber(text);
      if (someAccepted && !NOW_REFUSED.includes(text)) expect(now.ok && now.value !== undefined, text).toBe(true);
    }
    for (const text of NOW_REFUSED) expect(parseTypedNumber(text).ok, text).toBe(false);
  });

  it("empty text is no value, not zero", () => {
    for (const text of ["", " ", "\t", "\u00a0"])
      expect(parseTypedNumber(text)).toEqual({ ok: true, value: undefined });
    expect(typedNumber("")).toBeUndefined();
    expect(readTypedNumber("  ")).toBeUndefined();
  });

  it("says in plain words what is wrong with text that is not a number", () => {
    expect(parseTypedNumber("abc")).toEqual({ ok: false, message: '"abc" is not a number.' });
    expect(parseTypedNumber("1e")).toEqual({ ok: false, message: '"1e" is not a number.' });
    expect(parseTypedNumber("1,000.5")).toEqual({
      ok: false,
      message: '"1,000.5" is not a number: use one decimal point or one decimal comma.',
    });
    expect(parseTypedNumber("1,2,3").ok).toBe(false);
    expect(parseTypedNumber("1e999")).toEqual({ ok: false, message: '"1e999" is too large to be used as a number.' });
    // The forms get NaN so that their schema names the field ("Enter the reading as a number").
    expect(typedNumber("abc")).toBeNaN();
    expect(readTypedNumber("abc")).toBeUndefined();
  });

  it("reads the minus sign the keypad shows (U+2212) as a minus", () => {
    expect(readTypedNumber("\u22124.2")).toBe(-4.2);
  });

  it("the keypad still waits while a value is half-typed, and reads the rest with the shared parser", () => {
    for (const text of ["", "-", ".", "-.", "3.", "-3.", "1e5", "3,5"]) expect(keypadNumber(text), text).toBeNull();
    expect(keypadNumber("0.05")).toBe(0.05);
    expect(keypadNumber("-12")).toBe(-12);
    expect(keypadNumber(".5")).toBe(0.5);
  });
});
