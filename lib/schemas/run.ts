// Entry kinds of a procedure run: start (pins the template version), one entry per step action,
// abort and completion. A run's state is never stored on the tablet: it is derived from these
// entries (lib/procedures/state.ts), so two tablets writing to one run both keep their entries.
import { z } from "zod";
import { CRYOSTAT_KINDS } from "./cryostat";
import { REQUIRED_RECORD_FIELDS, SINGLE_RECORD_FIELDS, templateStepSchema } from "./template";
import { UNITS } from "./units";

// Kept here (not imported from db/schema) so lib/ stays free of the database layer.

const finite = z.number().refine(Number.isFinite, "must be a finite number");
const stepId = z.string().min(1).max(60);

export const runStartPayload = z.object({
  templateId: z.uuid(),
  templateKey: z.string().min(1).max(60),
  templateVersion: z.number().int().positive(),
  title: z.string().trim().min(1).max(200),
});

/** One action on one step. `kind` repeats the template step's kind so the record reads on its own. */
export const runStepPayload = z.discriminatedUnion("kind", [
  z.object({
    stepId,
    kind: z.literal("check"),
    /**
     * The second person present, for steps the template marks "requires a second person": a
     * facility user's id, or "visitor:" and a visitor's name (rule: lib/record/people.ts).
     */
    secondPersonId: z.string().min(1).max(60).optional(),
    comment: z.string().max(1000).optional(),
  }),
  z.object({
    stepId,
    kind: z.literal("reading"),
    quantity: z.string().min(1).max(80),
    value: finite,
    unit: z.enum(UNITS),
    /** Set by the tablet against the pinned template's range; the server re-checks it. */
    outOfRange: z.boolean(),
    comment: z.string().max(1000).optional(),
  }),
  z.object({ stepId, kind: z.literal("note"), text: z.string().trim().min(1).max(4000) }),
  z.object({
    stepId,
    kind: z.literal("photo"),
    attachmentId: z.uuid(),
    caption: z.string().max(400).optional(),
  }),
  /** The caution text was shown and read. */
  z.object({ stepId, kind: z.literal("caution"), acknowledged: z.literal(true) }),
  /** A hold point released: the record a signature of the required role binds to. */
  z.object({ stepId, kind: z.literal("hold"), statement: z.string().trim().min(1).max(600) }),
]);
export type RunStepPayload = z.infer<typeof runStepPayload>;

export const runAbortPayload = z.object({ reason: z.string().trim().min(1).max(2000) });
export const runCompletePayload = z.object({ comment: z.string().max(2000).optional() });

export type RunStartPayload = z.infer<typeof runStartPayload>;
export type RunAbortPayload = z.infer<typeof runAbortPayload>;
export type RunCompletePayload = z.infer<typeof runCompletePayload>;

export const RUN_KINDS = ["run.start", "run.step", "run.abort", "run.complete"] as const;
export type RunKind = (typeof RUN_KINDS)[number];

/** A template as the facility admin writes it (a save makes the next version of its key). */
export const templateInputSchema = z
  .object({
    key: z
      .string()
      .trim()
      .min(2)
      .max(60)
      .regex(/^[a-z0-9][a-z0-9-]*$/, "lower-case letters, digits and dashes"),
    title: z.string().trim().min(2).max(200),
    purpose: z.string().trim().min(2).max(1000),
    cryostatKinds: z.array(z.enum(CRYOSTAT_KINDS)).min(1, "choose at least one cryostat kind"),
    steps: z.array(templateStepSchema).min(1, "a procedure needs at least one step").max(80),
  })
  .superRefine((t, ctx) => {
    const seen = new Set<string>();
    t.steps.forEach((s, i) => {
      if (seen.has(s.id))
        ctx.addIssue({ code: "custom", path: ["steps", i, "id"], message: "step ids must be unique" });
      seen.add(s.id);
      if ("recordField" in s && s.recordField && (SINGLE_RECORD_FIELDS as readonly string[]).includes(s.recordField)) {
        if (t.steps.slice(0, i).some((o) => "recordField" in o && o.recordField === s.recordField))
          ctx.addIssue({
            code: "custom",
            path: ["steps", i, "recordField"],
            message: `only one step may fill the transfer record's ${s.recordField}`,
          });
      }
      if (s.kind === "reading" && s.min !== undefined && s.max !== undefined && s.min > s.max) {
        ctx.addIssue({
          code: "custom",
          path: ["steps", i, "max"],
          message: "the upper limit is below the lower limit",
        });
      }
    });
    const mapped = new Set(t.steps.flatMap((s) => ("recordField" in s && s.recordField ? [s.recordField] : [])));
    if (mapped.size) {
      const missing = REQUIRED_RECORD_FIELDS.filter((f) => !mapped.has(f));
      if (missing.length)
        ctx.addIssue({
          code: "custom",
          path: ["steps"],
          message: `a procedure that makes a transfer record needs steps for: ${missing.join(", ")}`,
        });
    }
  });
export type TemplateInput = z.infer<typeof templateInputSchema>;
