CREATE TABLE "attachments" (
	"id" uuid PRIMARY KEY NOT NULL,
	"entry_id" uuid,
	"file_name" text NOT NULL,
	"mime" text NOT NULL,
	"bytes" integer NOT NULL,
	"sha256" text NOT NULL,
	"storage_key" text NOT NULL,
	"uploaded_by" text NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "chain_checkpoints" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"chain" text NOT NULL,
	"seq" bigint NOT NULL,
	"hash" text NOT NULL,
	"signature" text NOT NULL,
	"public_key" text NOT NULL,
	"signed_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "chain_heads" (
	"chain" text PRIMARY KEY NOT NULL,
	"seq" bigint NOT NULL,
	"hash" text NOT NULL
);
--> statement-breakpoint
CREATE TABLE "cryostats" (
	"id" text PRIMARY KEY NOT NULL,
	"name" text NOT NULL,
	"kind" text NOT NULL,
	"location" text NOT NULL,
	"config" jsonb NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "cryostats_name_unique" UNIQUE("name")
);
--> statement-breakpoint
CREATE TABLE "devices" (
	"id" text PRIMARY KEY NOT NULL,
	"user_id" text NOT NULL,
	"first_seen_at" timestamp with time zone DEFAULT now() NOT NULL,
	"last_seen_at" timestamp with time zone DEFAULT now() NOT NULL,
	"revoked_at" timestamp with time zone
);
--> statement-breakpoint
CREATE TABLE "entries" (
	"id" uuid PRIMARY KEY NOT NULL,
	"chain" text NOT NULL,
	"cryostat_id" text,
	"run_id" uuid,
	"kind" text NOT NULL,
	"payload" jsonb NOT NULL,
	"author_id" text NOT NULL,
	"device_id" text NOT NULL,
	"recorded_at" timestamp (3) with time zone NOT NULL,
	"supersedes" uuid,
	"reason" text,
	"seq" bigint NOT NULL,
	"received_at" timestamp (3) with time zone NOT NULL,
	"prev_hash" text NOT NULL,
	"hash" text NOT NULL,
	CONSTRAINT "entries_seq_unique" UNIQUE("seq"),
	CONSTRAINT "entries_prev_hash_unique" UNIQUE("prev_hash"),
	CONSTRAINT "entries_hash_unique" UNIQUE("hash")
);
--> statement-breakpoint
CREATE TABLE "facility_rules" (
	"version" integer PRIMARY KEY NOT NULL,
	"values" jsonb NOT NULL,
	"document_attachment_id" uuid,
	"changed_by" text NOT NULL,
	"changed_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "mail_outbox" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"event_key" text NOT NULL,
	"to" text NOT NULL,
	"subject" text NOT NULL,
	"body" text NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"sent_at" timestamp with time zone,
	"error" text,
	CONSTRAINT "mail_outbox_event_key_unique" UNIQUE("event_key")
);
--> statement-breakpoint
CREATE TABLE "procedure_templates" (
	"id" uuid PRIMARY KEY NOT NULL,
	"key" text NOT NULL,
	"version" integer NOT NULL,
	"title" text NOT NULL,
	"purpose" text NOT NULL,
	"cryostat_kinds" jsonb NOT NULL,
	"steps" jsonb NOT NULL,
	"created_by" text NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "runs" (
	"id" uuid PRIMARY KEY NOT NULL,
	"cryostat_id" text NOT NULL,
	"template_id" uuid NOT NULL,
	"title" text NOT NULL,
	"status" text NOT NULL,
	"started_by" text NOT NULL,
	"started_at" timestamp with time zone NOT NULL,
	"ended_at" timestamp with time zone
);
--> statement-breakpoint
CREATE TABLE "sign_in_attempts" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"email" text NOT NULL,
	"ok" boolean NOT NULL,
	"at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "signatures" (
	"entry_id" uuid PRIMARY KEY NOT NULL,
	"signed_entry_id" uuid NOT NULL,
	"signer_id" text NOT NULL,
	"meaning" text NOT NULL,
	"signed_hash" text NOT NULL,
	"signed_at" timestamp with time zone NOT NULL
);
--> statement-breakpoint
CREATE TABLE "users" (
	"id" text PRIMARY KEY NOT NULL,
	"email" text NOT NULL,
	"name" text NOT NULL,
	"role" text NOT NULL,
	"password_hash" text NOT NULL,
	"pin_hash" text,
	"active" boolean DEFAULT true NOT NULL,
	"session_version" integer DEFAULT 1 NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "users_email_unique" UNIQUE("email")
);
--> statement-breakpoint
ALTER TABLE "entries" ADD CONSTRAINT "entries_cryostat_id_cryostats_id_fk" FOREIGN KEY ("cryostat_id") REFERENCES "public"."cryostats"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "entries" ADD CONSTRAINT "entries_author_id_users_id_fk" FOREIGN KEY ("author_id") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "runs" ADD CONSTRAINT "runs_cryostat_id_cryostats_id_fk" FOREIGN KEY ("cryostat_id") REFERENCES "public"."cryostats"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "runs" ADD CONSTRAINT "runs_template_id_procedure_templates_id_fk" FOREIGN KEY ("template_id") REFERENCES "public"."procedure_templates"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "signatures" ADD CONSTRAINT "signatures_entry_id_entries_id_fk" FOREIGN KEY ("entry_id") REFERENCES "public"."entries"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "entries_cryostat_seq" ON "entries" USING btree ("cryostat_id","seq");--> statement-breakpoint
CREATE INDEX "entries_run" ON "entries" USING btree ("run_id");--> statement-breakpoint
CREATE INDEX "entries_kind" ON "entries" USING btree ("kind");--> statement-breakpoint
CREATE UNIQUE INDEX "procedure_templates_key_version" ON "procedure_templates" USING btree ("key","version");--> statement-breakpoint
CREATE INDEX "runs_cryostat" ON "runs" USING btree ("cryostat_id");--> statement-breakpoint
CREATE INDEX "sign_in_attempts_email_at" ON "sign_in_attempts" USING btree ("email","at");--> statement-breakpoint
CREATE INDEX "signatures_signed_entry" ON "signatures" USING btree ("signed_entry_id");