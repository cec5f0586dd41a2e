// Errors as codes: `type:surface`, mapped to an HTTP status in one place. Database details are
// logged, never returned to the client. On the wire an error is
// `{ error: { code, message, details: string[], fields: FieldError[] } }`: `message` says what to
// do, `details` lists each problem as "path: problem", and `fields` carries the same problems per
// field so a form can show each one beside its input.
import type { z } from "zod";

export type ErrorType =
  | "bad_request"
  | "unauthorized"
  | "forbidden"
  | "not_found"
  | "conflict"
  | "too_large"
  | "rate_limited"
  | "unsupported"
  | "unavailable";

const STATUS: Record<ErrorType, number> = {
  bad_request: 400,
  unauthorized: 401,
  forbidden: 403,
  not_found: 404,
  conflict: 409,
  too_large: 413,
  unsupported: 415,
  rate_limited: 429,
  unavailable: 503,
};

/** One field's problem: `path` is the field's place in what was sent ("payload.supplyDewar"; "" for the whole). */
export type FieldError = { path: string; message: string };

export class AppError extends Error {
  constructor(
    public readonly type: ErrorType,
    public readonly surface: string,
    message: string,
    public readonly details?: string[],
    public readonly fields?: FieldError[],
  ) {
    super(message);
  }
  get code(): string {
    return `${this.type}:${this.surface}`;
  }
  get status(): number {
    return STATUS[this.type];
  }
}

export function statusOf(type: ErrorType): number {
  return STATUS[type];
}

/** The field problems of a zod failure; `prefix` puts them under a field of a larger body. */
export function fieldErrors(
  error: { issues: readonly { path: readonly PropertyKey[]; message: string }[] },
  prefix?: string,
): FieldError[] {
  return error.issues.map((i) => ({
    path: [prefix, ...i.path.map(String)].filter(Boolean).join("."),
    message: i.message,
  }));
}

/** Field problems as the `details` lines: "path: problem" (or the problem alone for the whole). */
export function detailLines(fields: readonly FieldError[]): string[] {
  return fields.map((f) => (f.path ? `${f.path}: ${f.message}` : f.message));
}

const KIND_WORDS: Record<string, string> = {
  string: "Enter text.",
  number: "Enter a number.",
  int: "Enter a whole number.",
  bigint: "Enter a whole number.",
  boolean: "Choose yes or no.",
  array: "Send a list here.",
  object: "Send a group of fields here.",
  date: "Enter a date.",
};

const FORMAT_WORDS: Record<string, string> = {
  email: "Enter an email address.",
  uuid: "This is not a valid id.",
  guid: "This is not a valid id.",
  datetime: "Enter a date and time, like 2026-11-30T14:05:00Z.",
  date: "Enter a date, like 2026-11-30.",
  time: "Enter a time, like 14:05.",
  url: "Enter a web address.",
};

const count = (n: number | bigint, one: string, many: string) => `${n} ${Number(n) === 1 ? one : many}`;

/**
 * Plain words for zod's problems, for a technician rather than a programmer ("Enter a number."
 * instead of "Invalid input: expected number, received NaN"). Pass it as the `error` option of
 * `safeParse`; a message the schema itself gives (`z.string().min(2, "Enter the full name")`)
 * still wins.
 */
export const plainWords: z.core.$ZodErrorMap = (iss) => {
  switch (iss.code) {
    case "invalid_type":
      if (iss.input === undefined || iss.input === null) return "Fill this in.";
      return KIND_WORDS[iss.expected] ?? "This is not the kind of value expected here.";
    case "too_small": {
      const min = iss.minimum;
      if (iss.origin === "string")
        return Number(min) <= 1 ? "Fill this in." : `Use at least ${count(min, "character", "characters")}.`;
      if (iss.origin === "array" || iss.origin === "set")
        return Number(min) <= 1 ? "Add at least one." : `Add at least ${count(min, "item", "items")}.`;
      if (iss.origin === "number" || iss.origin === "int" || iss.origin === "bigint")
        return iss.inclusive ? `Must be at least ${min}.` : `Must be more than ${min}.`;
      return "This is too small.";
    }
    case "too_big": {
      const max = iss.maximum;
      if (iss.origin === "string") return `Use at most ${count(max, "character", "characters")}.`;
      if (iss.origin === "array" || iss.origin === "set") return `Send at most ${count(max, "item", "items")}.`;
      if (iss.origin === "number" || iss.origin === "int" || iss.origin === "bigint")
        return iss.inclusive ? `Must be at most ${max}.` : `Must be less than ${max}.`;
      return "This is too large.";
    }
    case "invalid_format":
      if (iss.format === "starts_with" && "prefix" in iss) return `Must start with "${String(iss.prefix)}".`;
      if (iss.format === "ends_with" && "suffix" in iss) return `Must end with "${String(iss.suffix)}".`;
      if (iss.format === "includes" && "includes" in iss) return `Must contain "${String(iss.includes)}".`;
      return FORMAT_WORDS[iss.format] ?? "This is not in the expected form.";
    case "not_multiple_of":
      return `Must be a multiple of ${iss.divisor}.`;
    case "invalid_value":
      return iss.values.length === 1
        ? `Must be ${String(iss.values[0])}.`
        : `Choose one of: ${iss.values.map(String).join(", ")}.`;
    case "unrecognized_keys":
      return `Not expected here: ${iss.keys.join(", ")}.`;
    case "invalid_union":
      return "This does not match any of the accepted forms.";
    case "invalid_key":
    case "invalid_element":
      return "This is not valid.";
    case "custom":
      return "This is not accepted.";
    default:
      return undefined;
  }
};
