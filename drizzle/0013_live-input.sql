CREATE TABLE "channel_input" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"campaign_id" uuid NOT NULL,
	"channel_id" uuid NOT NULL,
	"full_scale_volts" double precision NOT NULL,
	"ac_low_cut_hz" double precision,
	"version" integer DEFAULT 1 NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "sensitivity_check" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"campaign_id" uuid NOT NULL,
	"channel_id" uuid,
	"channel_number" integer NOT NULL,
	"kit_item_id" uuid,
	"reference_ms2_rms" double precision NOT NULL,
	"reference_hz" double precision NOT NULL,
	"measured_volts_rms" double precision NOT NULL,
	"measured_hz" double precision NOT NULL,
	"full_scale_volts" double precision NOT NULL,
	"sample_rate_hz" double precision NOT NULL,
	"duration_s" double precision NOT NULL,
	"measured_sensitivity" double precision NOT NULL,
	"kit_sensitivity" double precision NOT NULL,
	"deviation_percent" double precision NOT NULL,
	"deviation_db" double precision NOT NULL,
	"note" text DEFAULT '' NOT NULL,
	"checked_by" text,
	"checked_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
ALTER TABLE "channel_input" ADD CONSTRAINT "channel_input_campaign_id_campaign_id_fk" FOREIGN KEY ("campaign_id") REFERENCES "public"."campaign"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "channel_input" ADD CONSTRAINT "channel_input_channel_id_channel_id_fk" FOREIGN KEY ("channel_id") REFERENCES "public"."channel"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "sensitivity_check" ADD CONSTRAINT "sensitivity_check_campaign_id_campaign_id_fk" FOREIGN KEY ("campaign_id") REFERENCES "public"."campaign"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "sensitivity_check" ADD CONSTRAINT "sensitivity_check_channel_id_channel_id_fk" FOREIGN KEY ("channel_id") REFERENCES "public"."channel"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "sensitivity_check" ADD CONSTRAINT "sensitivity_check_kit_item_id_kit_item_id_fk" FOREIGN KEY ("kit_item_id") REFERENCES "public"."kit_item"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "sensitivity_check" ADD CONSTRAINT "sensitivity_check_checked_by_user_id_fk" FOREIGN KEY ("checked_by") REFERENCES "public"."user"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
CREATE UNIQUE INDEX "channel_input_channel_uq" ON "channel_input" USING btree ("channel_id");--> statement-breakpoint
CREATE INDEX "sensitivity_check_campaign_idx" ON "sensitivity_check" USING btree ("campaign_id","checked_at");