// Form-side versions of the shared payload schemas: the same rules, but numbers arrive as typed
// text ("3,9" or "3.9") and empty optional fields as "". Parsed values go to recordEntry, which
// validates again with the shared schema.
import { z } from "zod";
import { fieldSettingPayload, heliumLevelPayload, notePayload, readingPayload } from "@/lib/schemas/entry";
import { typedNumber } from "@/lib/typed-number";

// Each field's input is the text of its control (z.input: strings), its output what the shared
// payload schema takes (z.output: numbers, undefined for an empty optional field).

/** Typed text as a number (lib/typed-number.ts): undefined when empty, NaN when not a number. */
const typed = () => z.string().transform(typedNumber);
const num = (msg = "Enter a number") => typed().pipe(z.number({ message: msg }).refine(Number.isFinite, msg));
const optNum = () =>
  typed().pipe(z.number({ message: "Enter a number" }).refine(Number.isFinite, "Enter a number").optional());
const optText = (max: number) =>
  z
    .string()
    .transform((v) => (v.trim() === "" ? undefined : v))
    .pipe(z.string().max(max).optional());

export const readingForm = readingPayload.extend({
  quantity: z.string().trim().min(1, "Say what was read").max(80),
  value: num("Enter the reading as a number"),
  stage: optText(40),
  comment: optText(1000),
});
export const noteForm = notePayload.extend({ text: z.string().trim().min(1, "Write the note").max(4000) });
export const heliumForm = heliumLevelPayload.extend({
  percent: num("Enter the level in percent").pipe(z.number().min(0, "0 to 100 %").max(100, "0 to 100 %")),
  litres: optNum().pipe(z.number().min(0).optional()),
});
export const fieldForm = fieldSettingPayload.extend({
  currentA: num("Enter the current in amperes"),
  fieldT: num("Enter the field in tesla"),
  rampRateTPerMin: optNum().pipe(z.number().positive("A ramp rate is above zero").optional()),
  comment: optText(1000),
  limitOverrideReason: optText(1000),
});

/** What a form's controls hold, and what its submit hands over. */
export type FormIn<S extends z.ZodType> = z.input<S>;
export type FormOut<S extends z.ZodType> = z.output<S>;
