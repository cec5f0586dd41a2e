// Log entries: the envelope every fact travels in, and one payload schema per entry kind.
// The same schemas validate on the tablet (before the outbox), on the server (push) and in Dexie.
import { z } from "zod";
import { CRYOSTAT_STATES } from "./cryostat";
import { facilityRulesValuesSchema } from "./rules";
import { runAbortPayload, runCompletePayload, runStartPayload, runStepPayload } from "./run";
import { UNITS } from "./units";

const text = (max: number) => z.string().trim().min(1).max(max);
const finite = z.number().refine(Number.isFinite, "must be a finite number");

export const notePayload = z.object({ text: text(4000) });

export const readingPayload = z.object({
  quantity: text(80),
  /** Thermometer stage key from the cryostat's config, when the reading belongs to one. */
  stage: z.string().max(40).optional(),
  value: finite,
  unit: z.enum(UNITS),
  comment: z.string().max(1000).optional(),
});

export const heliumLevelPayload = z.object({
  percent: finite.min(0).max(100),
  litres: finite.min(0).optional(),
});

export const fieldSettingPayload = z.object({
  currentA: finite,
  fieldT: finite,
  persistent: z.boolean(),
  rampRateTPerMin: finite.positive().optional(),
  comment: z.string().max(1000).optional(),
  /**
   * Why a setting beyond the magnet's rating or the ramp limit was made anyway (lib/record/magnet.ts):
   * without it such a setting is refused.
   */
  limitOverrideReason: z.string().trim().min(1).max(1000).optional(),
});

export const statePayload = z.object({ state: z.enum(CRYOSTAT_STATES), comment: z.string().max(1000).optional() });

export const handoverPayload = z.object({
  summary: z.object({
    state: z.enum(CRYOSTAT_STATES).optional(),
    stages: z.array(z.object({ stage: z.string(), valueK: finite, at: z.string() })).default([]),
    heliumPercent: finite.optional(),
    heliumLitres: finite.optional(),
    forecastDays: finite.optional(),
    fieldT: finite.optional(),
    persistent: z.boolean().optional(),
    openRuns: z.array(z.string()).default([]),
    openIssues: z.array(z.string()).default([]),
  }),
  note: z.string().max(4000),
  toUserId: z.string().min(1).optional(),
});

export const transferPayload = z.object({
  supplyDewar: text(40),
  /**
   * Who was present: each a facility user's id ("u-priya"), or a visitor written as
   * "visitor:" and their name ("visitor:Jane Roe"). The rule (known active users, named visitors,
   * nobody twice) is lib/record/people.ts; the server enforces it, the audit flags visitors.
   */
  peoplePresent: z.array(z.string().min(1)).min(1),
  ppeConfirmed: z.boolean(),
  oxygenMonitorChecked: z.boolean(),
  /** Lowest oxygen reading during the transfer (percent), if read. */
  oxygenLowestPercent: finite.min(0).max(25).optional(),
  levelBeforePercent: finite.min(0).max(100),
  levelAfterPercent: finite.min(0).max(100),
  pressureBeforeMbar: finite.optional(),
  pressureAfterMbar: finite.optional(),
  /** Litres taken from the supply, by level difference or by weight. */
  suppliedLitres: finite.min(0),
  suppliedBy: z.enum(["level", "weight"]),
  supplyMassBeforeKg: finite.optional(),
  supplyMassAfterKg: finite.optional(),
  gainedLitres: finite.min(0),
  durationMin: finite.min(0),
  anomalies: z.string().max(2000).default(""),
});

export const quenchPayload = z.object({
  at: z.string(),
  fieldT: finite,
  currentA: finite.optional(),
  levelBeforePercent: finite.min(0).max(100).optional(),
  levelAfterPercent: finite.min(0).max(100).optional(),
  heliumLostLitres: finite.min(0).optional(),
  oxygenLowestPercent: finite.min(0).max(25).optional(),
  actions: z.string().max(4000),
});

export const incidentPayload = z.object({
  title: text(200),
  description: z.string().max(4000),
  actions: z.string().max(4000),
});

export const SIGNATURE_MEANINGS = ["performed", "verified", "handed_over", "accepted", "audited"] as const;
export type SignatureMeaning = (typeof SIGNATURE_MEANINGS)[number];

export const signaturePayload = z.object({
  signedEntryId: z.uuid(),
  meaning: z.enum(SIGNATURE_MEANINGS),
  signerName: text(120),
  signerRole: z.enum(["technician", "researcher", "safety_officer", "facility_admin"]),
  /** SHA-256 of the RFC 8785 canonical JSON of the signed record (see lib/sync/hash.ts). */
  signedHash: z.string().regex(/^[0-9a-f]{64}$/),
  /** Stylus image as a PNG data URL: the mark, not the signature itself. */
  image: z.string().startsWith("data:image/png;base64,").max(400_000).optional(),
  /** How the signer proved who they are just before signing (lib/signing): never the image alone. */
  confirmedBy: z.enum(["pin", "password"]).optional(),
  /** HMAC proof of that confirmation, re-verified by the server (lib/signing/proof.ts). */
  confirmProof: z
    .string()
    .regex(/^[0-9a-f]{64}$/)
    .optional(),
});

export const auditFindingPayload = z.object({
  targetEntryId: z.uuid(),
  verdict: z.enum(["acceptable", "needs_action"]),
  findings: z.string().max(4000),
  flags: z.array(z.string()).default([]),
});

/** A change to the facility rules (facility chain): old and new value of each changed setting. */
export const rulesChangePayload = z.object({
  version: z.number().int().positive(),
  reason: text(1000),
  changes: z.array(z.object({ field: z.string().min(1).max(60), from: z.unknown(), to: z.unknown() })),
  values: facilityRulesValuesSchema,
  documentAttachmentId: z.uuid().nullable(),
  previousDocumentAttachmentId: z.uuid().nullable(),
});

/** A facility admin changed someone's role or access (audit trail; that user's sessions end). */
export const userChangePayload = z.object({
  userId: z.string().min(1),
  userName: z.string().min(1),
  changes: z
    .array(
      z.object({
        field: z.enum(["role", "active"]),
        from: z.union([z.string(), z.boolean()]),
        to: z.union([z.string(), z.boolean()]),
      }),
    )
    .min(1),
});

/** Payload schema per entry kind. Feature modules add their kinds here. */
export const payloadSchemas = {
  note: notePayload,
  reading: readingPayload,
  "helium.level": heliumLevelPayload,
  "field.setting": fieldSettingPayload,
  state: statePayload,
  handover: handoverPayload,
  transfer: transferPayload,
  quench: quenchPayload,
  incident: incidentPayload,
  signature: signaturePayload,
  "audit.finding": auditFindingPayload,
  "run.start": runStartPayload,
  "run.step": runStepPayload,
  "run.abort": runAbortPayload,
  "run.complete": runCompletePayload,
  "rules.change": rulesChangePayload,
  "user.change": userChangePayload,
} as const;
export type EntryKind = keyof typeof payloadSchemas;
export const ENTRY_KINDS = Object.keys(payloadSchemas) as EntryKind[];

/** What a tablet sends: the entry as it was written locally. */
export const entryInputSchema = z.object({
  id: z.uuid(),
  cryostatId: z.string().min(1).max(60).nullable(),
  runId: z.uuid().nullable().default(null),
  kind: z.enum(ENTRY_KINDS as [EntryKind, ...EntryKind[]]),
  payload: z.record(z.string(), z.unknown()),
  authorId: z.string().min(1).max(60),
  deviceId: z.string().min(1).max(80),
  recordedAt: z.iso
    .datetime()
    .refine(
      (s) => Number.isFinite(Date.parse(s)) && new Date(s).toISOString() === s,
      "must be a UTC time as toISOString() writes it",
    ),
  supersedes: z.uuid().nullable().default(null),
  reason: z.string().max(1000).nullable().default(null),
});

/** A kind's payload, parsed and stored (defaults filled in). */
export type Payload<K extends EntryKind> = z.output<(typeof payloadSchemas)[K]>;
/** A kind's payload, the way a form hands it over (before defaults). */
export type PayloadInput<K extends EntryKind> = z.input<(typeof payloadSchemas)[K]>;

/** The envelope fields every entry carries, whatever its kind. */
type Envelope = Omit<z.output<typeof entryInputSchema>, "kind" | "payload">;
/** What the server adds once an entry is in the log. */
export type ServerFields = { seq: number; receivedAt: string; prevHash: string; hash: string; chain: string };

/**
 * The envelope as checked before its payload: any payload object. What the hash reads
 * (lib/sync/hash.ts) and what a raw database row or a forged test entry is; not yet known to
 * match its kind's schema.
 */
export type UncheckedEntry = z.output<typeof entryInputSchema>;

/**
 * An entry of the given kind(s), its payload typed by that kind's schema: a union over the kinds,
 * so testing `e.kind` narrows `e.payload`. (Written as a mapped type indexed by K so that generic
 * code building `{ kind: k, payload: p }` for one K type-checks.)
 */
export type EntryInputOf<K extends EntryKind = EntryKind> = {
  [P in K]: Envelope & { kind: P; payload: Payload<P> };
}[K];
/** What a tablet sends: the entry as it was written locally (a union over kinds, or of the given kinds). */
export type EntryInput<K extends EntryKind = EntryKind> = EntryInputOf<K>;

/** An entry as stored by the server, of the given kind(s); a union over all kinds by default. */
export type Entry<K extends EntryKind = EntryKind> = { [P in K]: EntryInputOf<P> & ServerFields }[K];
/** An entry as stored by the server (any kind). */
export type StoredEntry = Entry;

/**
 * Some envelope fields of an entry, with its kind and payload, kept per kind: `Pick` on the union
 * would merge the kinds and lose which payload goes with which kind.
 */
export type EntryFields<F extends keyof UncheckedEntry> = {
  [P in EntryKind]: Pick<EntryInputOf<P>, F | "kind" | "payload">;
}[EntryKind];

/** Anything that carries a kind and the payload of that kind (input, stored or tablet entries). */
type Kinded = { kind: EntryKind; payload: unknown };

/** Type guard: `e` is an entry of `kind` (its payload typed accordingly). */
export function isKind<E extends Kinded, K extends E["kind"]>(e: E, kind: K): e is Extract<E, { kind: K }> {
  return e.kind === kind;
}

/** Type guard over several kinds. */
export function isKindOf<E extends Kinded, K extends E["kind"]>(
  e: E,
  kinds: readonly K[],
): e is Extract<E, { kind: K }> {
  return (kinds as readonly string[]).includes(e.kind);
}

/** The payload of `e` if it is an entry of `kind`, else undefined (also for a missing entry). */
export function payloadOf<E extends Kinded, K extends E["kind"]>(
  e: E | null | undefined,
  kind: K,
): Extract<E, { kind: K }>["payload"] | undefined {
  return e && isKind(e, kind) ? e.payload : undefined;
}

/**
 * Validate the envelope and the kind's payload together. Returns the parsed entry or a list of
 * human-readable problems (path: message).
 */
export function parseEntry(raw: unknown): { ok: true; entry: EntryInput } | { ok: false; problems: string[] } {
  const env = entryInputSchema.safeParse(raw);
  if (!env.success) return { ok: false, problems: formatIssues(env.error) };
  const schema = payloadSchemas[env.data.kind];
  const body = schema.safeParse(env.data.payload);
  if (!body.success) return { ok: false, problems: formatIssues(body.error, "payload") };
  if (env.data.supersedes && !env.data.reason) return { ok: false, problems: ["reason: a correction needs a reason"] };
  // The payload was parsed by the schema of env.data.kind, so kind and payload agree (TypeScript
  // cannot follow that through the lookup by a kind known only at run time).
  return { ok: true, entry: { ...env.data, payload: body.data } as EntryInput };
}

export function formatIssues(error: z.ZodError, prefix?: string): string[] {
  return error.issues.map((i) => {
    const path = [prefix, ...i.path.map(String)].filter(Boolean).join(".");
    return path ? `${path}: ${i.message}` : i.message;
  });
}
