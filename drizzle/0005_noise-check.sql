CREATE TABLE "noise_check" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"campaign_id" uuid NOT NULL,
	"settings_version" integer NOT NULL,
	"sample_rate_hz" double precision NOT NULL,
	"samples_per_channel" integer NOT NULL,
	"channels" jsonb NOT NULL,
	"samples" "bytea" NOT NULL,
	"source" text NOT NULL,
	"idempotency_key" text NOT NULL,
	"results" jsonb NOT NULL,
	"recorded_by" text,
	"recorded_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
ALTER TABLE "noise_check" ADD CONSTRAINT "noise_check_campaign_id_campaign_id_fk" FOREIGN KEY ("campaign_id") REFERENCES "public"."campaign"("id") ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "noise_check" ADD CONSTRAINT "noise_check_recorded_by_user_id_fk" FOREIGN KEY ("recorded_by") REFERENCES "public"."user"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
CREATE UNIQUE INDEX "noise_check_idempotency_uq" ON "noise_check" USING btree ("campaign_id","idempotency_key");--> statement-breakpoint
CREATE INDEX "noise_check_campaign_idx" ON "noise_check" USING btree ("campaign_id","recorded_at");