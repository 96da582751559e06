CREATE TABLE "dof_note" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"campaign_id" uuid NOT NULL,
	"entry_id" uuid,
	"excitation_dof" text NOT NULL,
	"response_dof" text NOT NULL,
	"topic" text DEFAULT 'other' NOT NULL,
	"text" text DEFAULT '' NOT NULL,
	"author_id" text,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "dof_photo" (
	"note_id" uuid NOT NULL,
	"mime" text NOT NULL,
	"bytes" "bytea" NOT NULL,
	"size" integer NOT NULL,
	"sha256" text NOT NULL,
	CONSTRAINT "dof_photo_note_id_pk" PRIMARY KEY("note_id")
);
--> statement-breakpoint
CREATE TABLE "kit_policy" (
	"campaign_id" uuid PRIMARY KEY NOT NULL,
	"calibration" text DEFAULT 'warn' NOT NULL,
	"change_tolerance_pct" double precision DEFAULT 5 NOT NULL,
	"version" integer DEFAULT 1 NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "lab_booking" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"lab_item_id" uuid NOT NULL,
	"campaign_id" uuid NOT NULL,
	"from_on" date NOT NULL,
	"to_on" date NOT NULL,
	"kit_item_id" uuid,
	"booked_by" text,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "lab_booking_dates" CHECK ("lab_booking"."to_on" >= "lab_booking"."from_on")
);
--> statement-breakpoint
CREATE TABLE "lab_calibration" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"lab_item_id" uuid NOT NULL,
	"calibrated_on" date NOT NULL,
	"due_on" date NOT NULL,
	"certificate_ref" text NOT NULL,
	"performed_by" text NOT NULL,
	"sensitivity" double precision,
	"sensitivity_unit" text,
	"axis_sensitivities" jsonb DEFAULT '{}'::jsonb NOT NULL,
	"recorded_by" text,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "lab_item" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"kind" text NOT NULL,
	"model" text NOT NULL,
	"serial" text NOT NULL,
	"sensitivity" double precision,
	"sensitivity_unit" text,
	"sensitivity_base" double precision,
	"axis_sensitivities" jsonb DEFAULT '{}'::jsonb NOT NULL,
	"tips" text[] DEFAULT '{}' NOT NULL,
	"axes" text[] DEFAULT '{}' NOT NULL,
	"notes" text DEFAULT '' NOT NULL,
	"retired" boolean DEFAULT false NOT NULL,
	"version" integer DEFAULT 1 NOT NULL,
	"created_by" text,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
ALTER TABLE "kit_item" ADD COLUMN "lab_item_id" uuid;--> statement-breakpoint
ALTER TABLE "kit_item" ADD COLUMN "axis_sensitivities" jsonb DEFAULT '{}'::jsonb NOT NULL;--> statement-breakpoint
ALTER TABLE "dof_note" ADD CONSTRAINT "dof_note_campaign_id_campaign_id_fk" FOREIGN KEY ("campaign_id") REFERENCES "public"."campaign"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "dof_note" ADD CONSTRAINT "dof_note_entry_id_schedule_entry_id_fk" FOREIGN KEY ("entry_id") REFERENCES "public"."schedule_entry"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "dof_note" ADD CONSTRAINT "dof_note_author_id_user_id_fk" FOREIGN KEY ("author_id") REFERENCES "public"."user"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "dof_photo" ADD CONSTRAINT "dof_photo_note_id_dof_note_id_fk" FOREIGN KEY ("note_id") REFERENCES "public"."dof_note"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "kit_policy" ADD CONSTRAINT "kit_policy_campaign_id_campaign_id_fk" FOREIGN KEY ("campaign_id") REFERENCES "public"."campaign"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "lab_booking" ADD CONSTRAINT "lab_booking_lab_item_id_lab_item_id_fk" FOREIGN KEY ("lab_item_id") REFERENCES "public"."lab_item"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "lab_booking" ADD CONSTRAINT "lab_booking_campaign_id_campaign_id_fk" FOREIGN KEY ("campaign_id") REFERENCES "public"."campaign"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "lab_booking" ADD CONSTRAINT "lab_booking_booked_by_user_id_fk" FOREIGN KEY ("booked_by") REFERENCES "public"."user"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "lab_calibration" ADD CONSTRAINT "lab_calibration_lab_item_id_lab_item_id_fk" FOREIGN KEY ("lab_item_id") REFERENCES "public"."lab_item"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "lab_calibration" ADD CONSTRAINT "lab_calibration_recorded_by_user_id_fk" FOREIGN KEY ("recorded_by") REFERENCES "public"."user"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "lab_item" ADD CONSTRAINT "lab_item_created_by_user_id_fk" FOREIGN KEY ("created_by") REFERENCES "public"."user"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "dof_note_entry_idx" ON "dof_note" USING btree ("campaign_id","entry_id");--> statement-breakpoint
CREATE INDEX "lab_booking_item_idx" ON "lab_booking" USING btree ("lab_item_id");--> statement-breakpoint
CREATE INDEX "lab_booking_campaign_idx" ON "lab_booking" USING btree ("campaign_id");--> statement-breakpoint
CREATE INDEX "lab_calibration_item_idx" ON "lab_calibration" USING btree ("lab_item_id");--> statement-breakpoint
CREATE UNIQUE INDEX "lab_item_identity_uq" ON "lab_item" USING btree ("kind",lower("model"),lower("serial"));--> statement-breakpoint
ALTER TABLE "kit_item" ADD CONSTRAINT "kit_item_lab_item_id_lab_item_id_fk" FOREIGN KEY ("lab_item_id") REFERENCES "public"."lab_item"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
-- The lab inventory starts with the kit the campaigns already registered: one lab item per kind,
-- model and serial (the newest campaign entry's values), linked from each campaign item, with
-- the calibration history of all of them (one row per date and certificate). Campaign kit stays
-- as it was; only bookings made from now on follow the inventory's later calibrations.
INSERT INTO "lab_item" ("kind", "model", "serial", "sensitivity", "sensitivity_unit", "sensitivity_base", "tips", "axes", "notes", "retired", "created_at", "updated_at")
SELECT DISTINCT ON (k."kind", lower(k."model"), lower(k."serial")) k."kind", k."model", k."serial", k."sensitivity", k."sensitivity_unit", k."sensitivity_base", k."tips", k."axes", '', false, k."created_at", k."updated_at"
FROM "kit_item" k
ORDER BY k."kind", lower(k."model"), lower(k."serial"), k."updated_at" DESC;--> statement-breakpoint
UPDATE "kit_item" k SET "lab_item_id" = l."id"
FROM "lab_item" l
WHERE l."kind" = k."kind" AND lower(l."model") = lower(k."model") AND lower(l."serial") = lower(k."serial");--> statement-breakpoint
INSERT INTO "lab_calibration" ("lab_item_id", "calibrated_on", "due_on", "certificate_ref", "performed_by", "sensitivity", "sensitivity_unit", "recorded_by", "created_at")
SELECT DISTINCT ON (k."lab_item_id", c."calibrated_on", c."certificate_ref") k."lab_item_id", c."calibrated_on", c."due_on", c."certificate_ref", c."performed_by", c."sensitivity", c."sensitivity_unit", c."recorded_by", c."created_at"
FROM "calibration_record" c JOIN "kit_item" k ON k."id" = c."kit_item_id"
WHERE k."lab_item_id" IS NOT NULL
ORDER BY k."lab_item_id", c."calibrated_on", c."certificate_ref", c."created_at" DESC;
