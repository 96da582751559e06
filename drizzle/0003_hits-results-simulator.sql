CREATE TABLE "frf_result" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"campaign_id" uuid NOT NULL,
	"schedule_entry_id" uuid NOT NULL,
	"input_hash" text NOT NULL,
	"settings_version" integer NOT NULL,
	"hit_ids" uuid[] NOT NULL,
	"averages" integer NOT NULL,
	"sample_rate_hz" double precision NOT NULL,
	"samples" integer NOT NULL,
	"channels" jsonb NOT NULL,
	"data" "bytea" NOT NULL,
	"computed_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
ALTER TABLE "campaign" ADD COLUMN "simulator" text DEFAULT 'generic' NOT NULL;--> statement-breakpoint
ALTER TABLE "frf_result" ADD CONSTRAINT "frf_result_campaign_id_campaign_id_fk" FOREIGN KEY ("campaign_id") REFERENCES "public"."campaign"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "frf_result" ADD CONSTRAINT "frf_result_schedule_entry_id_schedule_entry_id_fk" FOREIGN KEY ("schedule_entry_id") REFERENCES "public"."schedule_entry"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
CREATE UNIQUE INDEX "frf_result_entry_uq" ON "frf_result" USING btree ("schedule_entry_id");