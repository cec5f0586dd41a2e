// Procedure template steps. A run pins the template version it started from.
import { z } from "zod";
import { UNITS } from "./units";

const base = { id: z.string().min(1).max(60), text: z.string().min(1).max(600) };

export const templateStepSchema = z.discriminatedUnion("kind", [
  z.object({ ...base, kind: z.literal("check"), secondPerson: z.boolean().default(false) }),
  z.object({
    ...base,
    kind: z.literal("reading"),
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
  z.object({ ...base, kind: z.literal("note") }),
  z.object({ ...base, kind: z.literal("photo") }),
  z.object({
    ...base,
    kind: z.literal("caution"),
    topic: z.enum(["cryogen", "oxygen", "pressure", "transfer_line", "magnet"]),
  }),
]);
export type TemplateStep = z.infer<typeof templateStepSchema>;
