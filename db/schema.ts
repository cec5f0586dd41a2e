// The database schema (Drizzle, PostgreSQL core only, so the same app can move from PGlite to a
// PostgreSQL server by configuration). Each table is followed by its inferred row type.
// `entries` is the append-only log; every other table is reference data or a projection of it.
import { sql } from "drizzle-orm";
import {
  bigint,
  boolean,
  index,
  integer,
  jsonb,
  pgTable,
  primaryKey,
  text,
  timestamp,
  uniqueIndex,
  uuid,
} from "drizzle-orm/pg-core";
import type { CalibrationTable } from "@/lib/cryo";
import type { CryostatConfig, CryostatKind } from "@/lib/schemas/cryostat";
import type { FacilityRulesValues } from "@/lib/schemas/rules";
import type { TemplateStep } from "@/lib/schemas/template";
import type { Role } from "@/lib/schemas/user";

export { ROLES, type Role } from "@/lib/schemas/user";

export const users = pgTable("users", {
  id: text("id").primaryKey(),
  email: text("email").notNull().unique(),
  name: text("name").notNull(),
  role: text("role").$type<Role>().notNull(),
  passwordHash: text("password_hash").notNull(),
  pinHash: text("pin_hash"),
  active: boolean("active").notNull().default(true),
  // Bumped on disable or role change: JWTs carrying an older version are refused.
  sessionVersion: integer("session_version").notNull().default(1),
  // Set by an admin's password reset: until the person picks a new password, pages lead to the
  // change form and every API but the change answers 403.
  mustChangePassword: boolean("must_change_password").notNull().default(false),
  passwordChangedAt: timestamp("password_changed_at", { withTimezone: true }),
  createdAt: timestamp("created_at", { withTimezone: true }).notNull().defaultNow(),
});
export type User = typeof users.$inferSelect;

export { CRYOSTAT_KINDS, type CryostatKind } from "@/lib/schemas/cryostat";

export const cryostats = pgTable("cryostats", {
  id: text("id").primaryKey(),
  name: text("name").notNull().unique(),
  kind: text("kind").$type<CryostatKind>().notNull(),
  location: text("location").notNull(),
  config: jsonb("config").$type<CryostatConfig>().notNull(),
  updatedAt: timestamp("updated_at", { withTimezone: true }).notNull().defaultNow(),
});
export type Cryostat = typeof cryostats.$inferSelect;

export const procedureTemplates = pgTable(
  "procedure_templates",
  {
    id: uuid("id").primaryKey(),
    key: text("key").notNull(),
    version: integer("version").notNull(),
    title: text("title").notNull(),
    purpose: text("purpose").notNull(),
    cryostatKinds: jsonb("cryostat_kinds").$type<CryostatKind[]>().notNull(),
    steps: jsonb("steps").$type<TemplateStep[]>().notNull(),
    createdBy: text("created_by").notNull(),
    createdAt: timestamp("created_at", { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [uniqueIndex("procedure_templates_key_version").on(t.key, t.version)],
);
export type ProcedureTemplate = typeof procedureTemplates.$inferSelect;

/** The append-only log. UPDATE and DELETE are refused by a trigger (migration 0001). */
export const entries = pgTable(
  "entries",
  {
    id: uuid("id").primaryKey(),
    chain: text("chain").notNull(),
    cryostatId: text("cryostat_id").references(() => cryostats.id),
    runId: uuid("run_id"),
    kind: text("kind").notNull(),
    payload: jsonb("payload").$type<Record<string, unknown>>().notNull(),
    authorId: text("author_id")
      .notNull()
      .references(() => users.id),
    deviceId: text("device_id").notNull(),
    recordedAt: timestamp("recorded_at", { withTimezone: true, precision: 3 }).notNull(),
    supersedes: uuid("supersedes"),
    reason: text("reason"),
    seq: bigint("seq", { mode: "number" }).notNull().unique(),
    receivedAt: timestamp("received_at", { withTimezone: true, precision: 3 }).notNull(),
    prevHash: text("prev_hash").notNull().unique(),
    hash: text("hash").notNull().unique(),
  },
  (t) => [
    index("entries_cryostat_seq").on(t.cryostatId, t.seq),
    index("entries_run").on(t.runId),
    index("entries_kind").on(t.kind),
  ],
);
export type EntryRow = typeof entries.$inferSelect;

/** Head of each hash chain, advanced in the same transaction as the entry it points at. */
export const chainHeads = pgTable("chain_heads", {
  chain: text("chain").primaryKey(),
  seq: bigint("seq", { mode: "number" }).notNull(),
  hash: text("hash").notNull(),
});

/** Signed chain heads (Ed25519); the key lives outside the database. */
export const chainCheckpoints = pgTable("chain_checkpoints", {
  id: uuid("id").primaryKey().defaultRandom(),
  chain: text("chain").notNull(),
  seq: bigint("seq", { mode: "number" }).notNull(),
  hash: text("hash").notNull(),
  signature: text("signature").notNull(),
  publicKey: text("public_key").notNull(),
  signedAt: timestamp("signed_at", { withTimezone: true }).notNull().defaultNow(),
});

/** Projection: one row per run, updated with each run entry. */
export const runs = pgTable(
  "runs",
  {
    id: uuid("id").primaryKey(),
    cryostatId: text("cryostat_id")
      .notNull()
      .references(() => cryostats.id),
    templateId: uuid("template_id")
      .notNull()
      .references(() => procedureTemplates.id),
    title: text("title").notNull(),
    status: text("status").$type<"open" | "completed" | "aborted">().notNull(),
    startedBy: text("started_by").notNull(),
    startedAt: timestamp("started_at", { withTimezone: true, mode: "string" }).notNull(),
    endedAt: timestamp("ended_at", { withTimezone: true, mode: "string" }),
  },
  (t) => [index("runs_cryostat").on(t.cryostatId)],
);
export type Run = typeof runs.$inferSelect;

/** Projection of signature entries, for fast look-up of what is signed by whom. */
export const signatures = pgTable(
  "signatures",
  {
    entryId: uuid("entry_id")
      .primaryKey()
      .references(() => entries.id),
    signedEntryId: uuid("signed_entry_id").notNull(),
    signerId: text("signer_id").notNull(),
    meaning: text("meaning").notNull(),
    signedHash: text("signed_hash").notNull(),
    signedAt: timestamp("signed_at", { withTimezone: true, mode: "string" }).notNull(),
  },
  (t) => [index("signatures_signed_entry").on(t.signedEntryId)],
);

export const attachments = pgTable("attachments", {
  id: uuid("id").primaryKey(),
  entryId: uuid("entry_id"),
  fileName: text("file_name").notNull(),
  mime: text("mime").notNull(),
  bytes: integer("bytes").notNull(),
  sha256: text("sha256").notNull(),
  storageKey: text("storage_key").notNull(),
  uploadedBy: text("uploaded_by").notNull(),
  createdAt: timestamp("created_at", { withTimezone: true }).notNull().defaultNow(),
});
export type Attachment = typeof attachments.$inferSelect;

/** Facility rules, versioned: the newest row is in force; every change is also a log entry. */
export const facilityRules = pgTable("facility_rules", {
  version: integer("version").primaryKey(),
  values: jsonb("values").$type<FacilityRulesValues>().notNull(),
  documentAttachmentId: uuid("document_attachment_id"),
  changedBy: text("changed_by").notNull(),
  changedAt: timestamp("changed_at", { withTimezone: true }).notNull().defaultNow(),
});
export type FacilityRules = typeof facilityRules.$inferSelect;

/** Outgoing mail; `eventKey` makes each event send once. */
export const mailOutbox = pgTable("mail_outbox", {
  id: uuid("id").primaryKey().defaultRandom(),
  eventKey: text("event_key").notNull().unique(),
  to: text("to").notNull(),
  subject: text("subject").notNull(),
  body: text("body").notNull(),
  createdAt: timestamp("created_at", { withTimezone: true }).notNull().defaultNow(),
  sentAt: timestamp("sent_at", { withTimezone: true }),
  error: text("error"),
});

/**
 * Tablets registered with the server (POST /api/devices: server/devices/register.ts). The id is
 * issued by the server; the tablet proves it holds the registration with a secret, of which only
 * the SHA-256 is kept. `userId` is who registered it first. A row without `secretHash` is a
 * device id from before registration existed (made by its first push); its first user may adopt
 * it once. A revoked device's pushes are refused and it cannot register again; who revoked it,
 * when and why stay in the row.
 */
export const devices = pgTable("devices", {
  id: text("id").primaryKey(),
  userId: text("user_id").notNull(),
  firstSeenAt: timestamp("first_seen_at", { withTimezone: true }).notNull().defaultNow(),
  lastSeenAt: timestamp("last_seen_at", { withTimezone: true }).notNull().defaultNow(),
  revokedAt: timestamp("revoked_at", { withTimezone: true }),
  secretHash: text("secret_hash"),
  /** Entries waiting in the tablet's outbox, as it said at its last registration (null: never said). */
  pendingCount: integer("pending_count"),
  pendingAt: timestamp("pending_at", { withTimezone: true }),
  revokedBy: text("revoked_by").references(() => users.id),
  revokedReason: text("revoked_reason"),
});
export type Device = typeof devices.$inferSelect;

/** Who has signed in on which tablet (online, so the server bound them): their entries from it are accepted. */
export const deviceUsers = pgTable(
  "device_users",
  {
    deviceId: text("device_id")
      .notNull()
      .references(() => devices.id),
    userId: text("user_id")
      .notNull()
      .references(() => users.id),
    firstSignedInAt: timestamp("first_signed_in_at", { withTimezone: true }).notNull().defaultNow(),
    lastSignedInAt: timestamp("last_signed_in_at", { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [primaryKey({ columns: [t.deviceId, t.userId] })],
);
export type DeviceUser = typeof deviceUsers.$inferSelect;

/**
 * Sign-in attempts, for the limits per account and per address and for the audit trail. A row is
 * written before the password is checked (ok false until it matches), so parallel attempts count
 * each other; `limited` marks an attempt refused by a limit without checking (it does not count).
 */
export const signInAttempts = pgTable(
  "sign_in_attempts",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    email: text("email").notNull(),
    address: text("address"),
    ok: boolean("ok").notNull(),
    limited: boolean("limited").notNull().default(false),
    at: timestamp("at", { withTimezone: true }).notNull().default(sql`now()`),
  },
  (t) => [
    index("sign_in_attempts_email_at").on(t.email, t.at),
    index("sign_in_attempts_address_at").on(t.address, t.at),
  ],
);

/**
 * Server-side sessions: the session cookie (a JWT) carries the row's id, and every request that
 * reads the session checks the row. Ended (sign-out, an admin) or past `expiresAt` (the absolute
 * lifetime, which refreshing never moves) is signed out, for every copy of the cookie.
 */
export const sessions = pgTable(
  "sessions",
  {
    id: text("id").primaryKey(),
    userId: text("user_id")
      .notNull()
      .references(() => users.id),
    createdAt: timestamp("created_at", { withTimezone: true }).notNull(),
    expiresAt: timestamp("expires_at", { withTimezone: true }).notNull(),
    endedAt: timestamp("ended_at", { withTimezone: true }),
    /** Why it ended: "sign-out", "admin", "password". */
    endedReason: text("ended_reason"),
    deviceId: text("device_id"),
    lastSeenAt: timestamp("last_seen_at", { withTimezone: true }).notNull(),
  },
  (t) => [index("sessions_user").on(t.userId)],
);
export type SessionRow = typeof sessions.$inferSelect;

/** PIN proofs the server refused (a signature whose PIN confirmation does not check out). */
export const pinProofRejections = pgTable(
  "pin_proof_rejections",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    userId: text("user_id").notNull(),
    entryId: uuid("entry_id"),
    at: timestamp("at", { withTimezone: true }).notNull(),
  },
  (t) => [index("pin_proof_rejections_user_at").on(t.userId, t.at)],
);

/**
 * Accepted sensor calibration tables, one row per upload; the newest row per (cryostat, stage)
 * is in force. `table` is the parsed table (lib/cryo CalibrationTable) the tablet converts with;
 * `sourceText` keeps the file as uploaded; `attachmentId` points at the stored file when the
 * storage layer holds it.
 */
export const calibrations = pgTable(
  "calibrations",
  {
    id: uuid("id").primaryKey(),
    cryostatId: text("cryostat_id")
      .notNull()
      .references(() => cryostats.id),
    stage: text("stage").notNull(),
    sensorKind: text("sensor_kind").notNull(),
    sensorLabel: text("sensor_label").notNull(),
    attachmentId: uuid("attachment_id"),
    fileName: text("file_name").notNull(),
    sourceText: text("source_text").notNull(),
    table: jsonb("table").$type<CalibrationTable>().notNull(),
    acceptedBy: text("accepted_by")
      .notNull()
      .references(() => users.id),
    acceptedAt: timestamp("accepted_at", { withTimezone: true, precision: 3 }).notNull().defaultNow(),
  },
  (t) => [index("calibrations_cryostat_stage").on(t.cryostatId, t.stage, t.acceptedAt)],
);
export type CalibrationRow = typeof calibrations.$inferSelect;
