CREATE TABLE "calibrations" (
	"id" uuid PRIMARY KEY NOT NULL,
	"cryostat_id" text NOT NULL,
	"stage" text NOT NULL,
	"sensor_kind" text NOT NULL,
	"sensor_label" text NOT NULL,
	"attachment_id" uuid,
	"file_name" text NOT NULL,
	"source_text" text NOT NULL,
	"table" jsonb NOT NULL,
	"accepted_by" text NOT NULL,
	"accepted_at" timestamp (3) with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
ALTER TABLE "calibrations" ADD CONSTRAINT "calibrations_cryostat_id_cryostats_id_fk" FOREIGN KEY ("cryostat_id") REFERENCES "public"."cryostats"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "calibrations" ADD CONSTRAINT "calibrations_accepted_by_users_id_fk" FOREIGN KEY ("accepted_by") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "calibrations_cryostat_stage" ON "calibrations" USING btree ("cryostat_id","stage","accepted_at");