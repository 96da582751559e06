CREATE TABLE "campaign_invitation" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"campaign_id" uuid NOT NULL,
	"email" text NOT NULL,
	"role" text NOT NULL,
	"token_hash" text NOT NULL,
	"invited_by" text,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"expires_at" timestamp with time zone NOT NULL,
	"accepted_at" timestamp with time zone,
	"accepted_by" text,
	"revoked_at" timestamp with time zone,
	CONSTRAINT "campaign_invitation_token_hash_unique" UNIQUE("token_hash")
);
--> statement-breakpoint
CREATE TABLE "line" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"campaign_id" uuid NOT NULL,
	"point_a" uuid NOT NULL,
	"point_b" uuid NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "point" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"campaign_id" uuid NOT NULL,
	"label" text NOT NULL,
	"x" double precision NOT NULL,
	"y" double precision NOT NULL,
	"z" double precision NOT NULL,
	"directions" text[] DEFAULT '{}' NOT NULL,
	"retired_at" timestamp with time zone,
	"version" integer DEFAULT 1 NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "schedule_entry" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"campaign_id" uuid NOT NULL,
	"position" integer NOT NULL,
	"response_point_id" uuid NOT NULL,
	"response_direction" text NOT NULL,
	"excitation_point_id" uuid NOT NULL,
	"excitation_direction" text NOT NULL,
	"driving_point" boolean DEFAULT false NOT NULL,
	"status" text DEFAULT 'planned' NOT NULL,
	"required_hits" integer DEFAULT 5 NOT NULL,
	"assignee_id" text,
	"note" text DEFAULT '' NOT NULL,
	"version" integer DEFAULT 1 NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "acquisition_settings" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"campaign_id" uuid NOT NULL,
	"version" integer NOT NULL,
	"settings" jsonb NOT NULL,
	"reason" text DEFAULT '' NOT NULL,
	"created_by" text,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "calibration_record" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"kit_item_id" uuid NOT NULL,
	"calibrated_on" date NOT NULL,
	"due_on" date NOT NULL,
	"certificate_ref" text NOT NULL,
	"performed_by" text NOT NULL,
	"sensitivity" double precision,
	"recorded_by" text,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "channel" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"campaign_id" uuid NOT NULL,
	"channel" smallint NOT NULL,
	"kit_item_id" uuid NOT NULL,
	"axis" text,
	"dof" text,
	"sign" smallint DEFAULT 1 NOT NULL,
	"label" text DEFAULT '' NOT NULL,
	"version" integer DEFAULT 1 NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "kit_item" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"campaign_id" uuid NOT NULL,
	"kind" text NOT NULL,
	"model" text NOT NULL,
	"serial" text NOT NULL,
	"sensitivity" double precision NOT NULL,
	"sensitivity_unit" text NOT NULL,
	"sensitivity_base" double precision NOT NULL,
	"tips" text[] DEFAULT '{}' NOT NULL,
	"axes" text[] DEFAULT '{}' NOT NULL,
	"mass_g" double precision,
	"notes" text DEFAULT '' NOT NULL,
	"retired" boolean DEFAULT false NOT NULL,
	"version" integer DEFAULT 1 NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "audit_event" (
	"id" bigserial PRIMARY KEY NOT NULL,
	"campaign_id" uuid,
	"actor_id" text,
	"at" timestamp with time zone DEFAULT now() NOT NULL,
	"entity" text NOT NULL,
	"entity_id" text NOT NULL,
	"action" text NOT NULL,
	"before" jsonb,
	"after" jsonb
);
--> statement-breakpoint
CREATE TABLE "hit" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"campaign_id" uuid NOT NULL,
	"schedule_entry_id" uuid NOT NULL,
	"sequence" integer NOT NULL,
	"settings_version" integer NOT NULL,
	"sample_rate_hz" double precision NOT NULL,
	"samples_per_channel" integer NOT NULL,
	"channels" jsonb NOT NULL,
	"samples" "bytea" NOT NULL,
	"source" text NOT NULL,
	"idempotency_key" text NOT NULL,
	"auto_verdict" text NOT NULL,
	"verdict" text NOT NULL,
	"reasons" jsonb NOT NULL,
	"metrics" jsonb NOT NULL,
	"override_note" text,
	"overridden_by" text,
	"version" integer DEFAULT 1 NOT NULL,
	"recorded_by" text,
	"recorded_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
ALTER TABLE "campaign_invitation" ADD CONSTRAINT "campaign_invitation_campaign_id_campaign_id_fk" FOREIGN KEY ("campaign_id") REFERENCES "public"."campaign"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "campaign_invitation" ADD CONSTRAINT "campaign_invitation_invited_by_user_id_fk" FOREIGN KEY ("invited_by") REFERENCES "public"."user"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "campaign_invitation" ADD CONSTRAINT "campaign_invitation_accepted_by_user_id_fk" FOREIGN KEY ("accepted_by") REFERENCES "public"."user"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "line" ADD CONSTRAINT "line_campaign_id_campaign_id_fk" FOREIGN KEY ("campaign_id") REFERENCES "public"."campaign"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "line" ADD CONSTRAINT "line_point_a_point_id_fk" FOREIGN KEY ("point_a") REFERENCES "public"."point"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "line" ADD CONSTRAINT "line_point_b_point_id_fk" FOREIGN KEY ("point_b") REFERENCES "public"."point"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "point" ADD CONSTRAINT "point_campaign_id_campaign_id_fk" FOREIGN KEY ("campaign_id") REFERENCES "public"."campaign"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "schedule_entry" ADD CONSTRAINT "schedule_entry_campaign_id_campaign_id_fk" FOREIGN KEY ("campaign_id") REFERENCES "public"."campaign"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "schedule_entry" ADD CONSTRAINT "schedule_entry_response_point_id_point_id_fk" FOREIGN KEY ("response_point_id") REFERENCES "public"."point"("id") ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "schedule_entry" ADD CONSTRAINT "schedule_entry_excitation_point_id_point_id_fk" FOREIGN KEY ("excitation_point_id") REFERENCES "public"."point"("id") ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "schedule_entry" ADD CONSTRAINT "schedule_entry_assignee_id_user_id_fk" FOREIGN KEY ("assignee_id") REFERENCES "public"."user"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "acquisition_settings" ADD CONSTRAINT "acquisition_settings_campaign_id_campaign_id_fk" FOREIGN KEY ("campaign_id") REFERENCES "public"."campaign"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "acquisition_settings" ADD CONSTRAINT "acquisition_settings_created_by_user_id_fk" FOREIGN KEY ("created_by") REFERENCES "public"."user"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "calibration_record" ADD CONSTRAINT "calibration_record_kit_item_id_kit_item_id_fk" FOREIGN KEY ("kit_item_id") REFERENCES "public"."kit_item"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "calibration_record" ADD CONSTRAINT "calibration_record_recorded_by_user_id_fk" FOREIGN KEY ("recorded_by") REFERENCES "public"."user"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "channel" ADD CONSTRAINT "channel_campaign_id_campaign_id_fk" FOREIGN KEY ("campaign_id") REFERENCES "public"."campaign"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "channel" ADD CONSTRAINT "channel_kit_item_id_kit_item_id_fk" FOREIGN KEY ("kit_item_id") REFERENCES "public"."kit_item"("id") ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "kit_item" ADD CONSTRAINT "kit_item_campaign_id_campaign_id_fk" FOREIGN KEY ("campaign_id") REFERENCES "public"."campaign"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "audit_event" ADD CONSTRAINT "audit_event_campaign_id_campaign_id_fk" FOREIGN KEY ("campaign_id") REFERENCES "public"."campaign"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "audit_event" ADD CONSTRAINT "audit_event_actor_id_user_id_fk" FOREIGN KEY ("actor_id") REFERENCES "public"."user"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "hit" ADD CONSTRAINT "hit_campaign_id_campaign_id_fk" FOREIGN KEY ("campaign_id") REFERENCES "public"."campaign"("id") ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "hit" ADD CONSTRAINT "hit_schedule_entry_id_schedule_entry_id_fk" FOREIGN KEY ("schedule_entry_id") REFERENCES "public"."schedule_entry"("id") ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "hit" ADD CONSTRAINT "hit_overridden_by_user_id_fk" FOREIGN KEY ("overridden_by") REFERENCES "public"."user"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "hit" ADD CONSTRAINT "hit_recorded_by_user_id_fk" FOREIGN KEY ("recorded_by") REFERENCES "public"."user"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "campaign_invitation_campaign_idx" ON "campaign_invitation" USING btree ("campaign_id");--> statement-breakpoint
CREATE UNIQUE INDEX "line_pair_uq" ON "line" USING btree ("campaign_id",least("point_a", "point_b"),greatest("point_a", "point_b"));--> statement-breakpoint
CREATE UNIQUE INDEX "point_campaign_label_uq" ON "point" USING btree ("campaign_id","label");--> statement-breakpoint
CREATE UNIQUE INDEX "schedule_pair_uq" ON "schedule_entry" USING btree ("campaign_id","response_point_id","response_direction","excitation_point_id","excitation_direction");--> statement-breakpoint
CREATE INDEX "schedule_campaign_position_idx" ON "schedule_entry" USING btree ("campaign_id","position");--> statement-breakpoint
CREATE UNIQUE INDEX "settings_campaign_version_uq" ON "acquisition_settings" USING btree ("campaign_id","version");--> statement-breakpoint
CREATE INDEX "calibration_item_idx" ON "calibration_record" USING btree ("kit_item_id");--> statement-breakpoint
CREATE UNIQUE INDEX "channel_campaign_number_uq" ON "channel" USING btree ("campaign_id","channel");--> statement-breakpoint
CREATE INDEX "kit_item_campaign_idx" ON "kit_item" USING btree ("campaign_id");--> statement-breakpoint
CREATE INDEX "audit_campaign_at_idx" ON "audit_event" USING btree ("campaign_id","at");--> statement-breakpoint
CREATE UNIQUE INDEX "hit_idempotency_uq" ON "hit" USING btree ("campaign_id","idempotency_key");--> statement-breakpoint
CREATE INDEX "hit_entry_idx" ON "hit" USING btree ("schedule_entry_id","sequence");