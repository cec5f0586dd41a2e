// Procedure template steps. A run pins the template version it started from.
import { z } from "zod";
import { UNITS } from "./units";

const base = { id: z.string().min(1).max(60), text: z.string().min(1).max(600) };

/**
 * Where a step's result goes in the transfer record a procedure makes (a field of the `transfer`
 * entry's payload, lib/schemas/entry.ts). A template with any such step makes one transfer
 * record when a run of it completes; lib/procedures/transfer-record.ts builds it. Optional:
 * templates and versions without it stay valid and make no record.
 *
 * - check steps: `peoplePresent` (who recorded the check and the second person named),
 *   `ppeConfirmed` and `oxygenMonitorChecked` (true once done), `durationMin` (the time from the
 *   first to the last of the steps so marked);
 * - reading steps: the figure itself (`levelBeforePercent`, `pressureAfterMbar`, the supply
 *   dewar's masses…); `oxygenLowestPercent` (the lowest of such readings); `oxygenMonitorChecked`
 *   (true once read, and the reading counts toward the lowest oxygen too);
 * - note steps: `anomalies`.
 */
export const CHECK_RECORD_FIELDS = ["peoplePresent", "ppeConfirmed", "oxygenMonitorChecked", "durationMin"] as const;
export const READING_RECORD_FIELDS = [
  "oxygenMonitorChecked",
  "oxygenLowestPercent",
  "levelBeforePercent",
  "levelAfterPercent",
  "pressureBeforeMbar",
  "pressureAfterMbar",
  "supplyMassBeforeKg",
  "supplyMassAfterKg",
] as const;
export const NOTE_RECORD_FIELDS = ["anomalies"] as const;
export type RecordField =
  | (typeof CHECK_RECORD_FIELDS)[number]
  | (typeof READING_RECORD_FIELDS)[number]
  | (typeof NOTE_RECORD_FIELDS)[number];
/** Fields a transfer record cannot do without: a template that maps any field maps each of these. */
export const REQUIRED_RECORD_FIELDS = [
  "levelBeforePercent",
  "levelAfterPercent",
  "supplyMassBeforeKg",
  "supplyMassAfterKg",
] as const satisfies readonly RecordField[];
/** Fields that take one step's figure: at most one step maps each. */
export const SINGLE_RECORD_FIELDS = [
  "levelBeforePercent",
  "levelAfterPercent",
  "pressureBeforeMbar",
  "pressureAfterMbar",
  "supplyMassBeforeKg",
  "supplyMassAfterKg",
] as const satisfies readonly RecordField[];

export const templateStepSchema = z.discriminatedUnion("kind", [
  z.object({
    ...base,
    kind: z.literal("check"),
    secondPerson: z.boolean().default(false),
    recordField: z.enum(CHECK_RECORD_FIELDS).optional(),
  }),
  z.object({
    ...base,
    kind: z.literal("reading"),
    recordField: z.enum(READING_RECORD_FIELDS).optional(),
    quantity: z.string().min(1).max(80),
    unit: z.enum(UNITS),
    min: z.number().optional(),
    max: z.number().optional(),
    ifOutOfRange: z.string().max(400).default(""),
  }),
  z.object({
    ...base,
    kind: z.literal("hold"),
    role: z.enum(["technician", "researcher", "safety_officer", "facility_admin"]),
  }),
  z.object({ ...base, kind: z.literal("note"), recordField: z.enum(NOTE_RECORD_FIELDS).optional() }),
  z.object({ ...base, kind: z.literal("photo") }),
  z.object({
    ...base,
    kind: z.literal("caution"),
    topic: z.enum(["cryogen", "oxygen", "pressure", "transfer_line", "magnet"]),
  }),
]);
export type TemplateStep = z.infer<typeof templateStepSchema>;
