CREATE TABLE "device_users" (
	"device_id" text NOT NULL,
	"user_id" text NOT NULL,
	"first_signed_in_at" timestamp with time zone DEFAULT now() NOT NULL,
	"last_signed_in_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "device_users_device_id_user_id_pk" PRIMARY KEY("device_id","user_id")
);
--> statement-breakpoint
ALTER TABLE "devices" ADD COLUMN "secret_hash" text;--> statement-breakpoint
ALTER TABLE "devices" ADD COLUMN "pending_count" integer;--> statement-breakpoint
ALTER TABLE "devices" ADD COLUMN "pending_at" timestamp with time zone;--> statement-breakpoint
ALTER TABLE "devices" ADD COLUMN "revoked_by" text;--> statement-breakpoint
ALTER TABLE "devices" ADD COLUMN "revoked_reason" text;--> statement-breakpoint
ALTER TABLE "device_users" ADD CONSTRAINT "device_users_device_id_devices_id_fk" FOREIGN KEY ("device_id") REFERENCES "public"."devices"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "device_users" ADD CONSTRAINT "device_users_user_id_users_id_fk" FOREIGN KEY ("user_id") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "devices" ADD CONSTRAINT "devices_revoked_by_users_id_fk" FOREIGN KEY ("revoked_by") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;