CREATE TABLE "mode_table" (
	"campaign_id" uuid PRIMARY KEY NOT NULL,
	"version" integer DEFAULT 1 NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "mode_table_row" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"campaign_id" uuid NOT NULL,
	"fit_id" uuid,
	"band_low_hz" double precision NOT NULL,
	"band_high_hz" double precision NOT NULL,
	"references" jsonb NOT NULL,
	"model_order" integer NOT NULL,
	"pole_index" integer NOT NULL,
	"input_hash" text NOT NULL,
	"f_hz" double precision NOT NULL,
	"zeta_percent_raw" double precision NOT NULL,
	"zeta_percent" double precision NOT NULL,
	"mpc" double precision NOT NULL,
	"shape" jsonb NOT NULL,
	"mass_shape" jsonb,
	"mass_note" text DEFAULT '' NOT NULL,
	"model" jsonb NOT NULL,
	"duplicate" boolean DEFAULT false NOT NULL,
	"duplicate_of" uuid,
	"duplicate_note" text DEFAULT '' NOT NULL,
	"added_by" text,
	"added_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
ALTER TABLE "modal_fit" ADD COLUMN "draft" jsonb;--> statement-breakpoint
ALTER TABLE "modal_fit" ADD COLUMN "draft_version" integer DEFAULT 1 NOT NULL;--> statement-breakpoint
ALTER TABLE "mode_table" ADD CONSTRAINT "mode_table_campaign_id_campaign_id_fk" FOREIGN KEY ("campaign_id") REFERENCES "public"."campaign"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "mode_table_row" ADD CONSTRAINT "mode_table_row_campaign_id_campaign_id_fk" FOREIGN KEY ("campaign_id") REFERENCES "public"."campaign"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "mode_table_row" ADD CONSTRAINT "mode_table_row_fit_id_modal_fit_id_fk" FOREIGN KEY ("fit_id") REFERENCES "public"."modal_fit"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "mode_table_row" ADD CONSTRAINT "mode_table_row_added_by_user_id_fk" FOREIGN KEY ("added_by") REFERENCES "public"."user"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "mode_table_row_campaign_idx" ON "mode_table_row" USING btree ("campaign_id","f_hz");