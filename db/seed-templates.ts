// The default procedure templates the demo lab starts with (written by the team, per cryostat kind).
// Filled in by the procedures work; each becomes version 1 of its key.
import type { CryostatKind } from "./schema";
import type { TemplateStep } from "@/lib/schemas/template";

export type TemplateDraft = { key: string; title: string; purpose: string; cryostatKinds: CryostatKind[]; steps: TemplateStep[] };

export const DEFAULT_TEMPLATES: TemplateDraft[] = [];
