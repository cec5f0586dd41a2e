// Reading a number a person typed: the one parser behind the entry forms, the procedure keypad,
// the calculators and the admin forms. Accepts what any of the earlier per-screen parsers took:
// a decimal point or a decimal comma ("4.2", "4,2"), a sign, digits before or after the point
// only ("12.", ".5"), an exponent ("3e-5", "3E5"), and spaces anywhere ("1 000", thin and
// no-break spaces too, as a pasted figure carries them). The minus sign "−" the keypad shows is
// read as "-". Empty text is no value (undefined), not zero.

export type TypedNumber = { ok: true; value: number | undefined } | { ok: false; message: string };

const NUMBER = /^[+-]?(\d+\.?\d*|\.\d+)(e[+-]?\d+)?$/i;

/** The text as a number; `value: undefined` when it is empty; a message in plain words when it is not a number. */
export function parseTypedNumber(text: string): TypedNumber {
  const t = text.replace(/\s/g, "").replace(/\u2212/g, "-");
  if (t === "") return { ok: true, value: undefined };
  const commas = t.split(",").length - 1;
  if (commas > 1 || (commas === 1 && t.includes(".")))
    return { ok: false, message: `"${text}" is not a number: use one decimal point or one decimal comma.` };
  const plain = t.replace(",", ".");
  if (!NUMBER.test(plain)) return { ok: false, message: `"${text}" is not a number.` };
  const value = Number(plain);
  if (!Number.isFinite(value)) return { ok: false, message: `"${text}" is too large to be used as a number.` };
  return { ok: true, value };
}

/** The number, or undefined when the text is empty or not (yet) a number: for live figures. */
export function readTypedNumber(text: string): number | undefined {
  const r = parseTypedNumber(text);
  return r.ok ? r.value : undefined;
}

/**
 * The number; undefined when the text is empty; NaN when it is not a number, so that the
 * schema the value goes to refuses it with the field's own message.
 */
export function typedNumber(text: string): number | undefined {
  const r = parseTypedNumber(text);
  return r.ok ? r.value : Number.NaN;
}
