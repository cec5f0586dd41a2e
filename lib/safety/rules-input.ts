// What the admin's rules form sends: the full set of values, why they changed, and the version
// the admin started from (so two admins cannot silently overwrite each other).
import { z } from "zod";
import { facilityRulesValuesSchema } from "@/lib/schemas/rules";

export const rulesChangeInputSchema = z.object({
  values: facilityRulesValuesSchema,
  reason: z.string().trim().min(3, "Say why the rules change (at least a few words).").max(1000),
  expectedVersion: z.number().int().positive().nullable(),
  /** A newly uploaded document's id, null to remove the document, absent to keep it. */
  documentAttachmentId: z.uuid().nullable().optional(),
});
export type RulesChangeInput = z.infer<typeof rulesChangeInputSchema>;
