CREATE TABLE "modal_fit" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"campaign_id" uuid NOT NULL,
	"status" text DEFAULT 'queued' NOT NULL,
	"progress" real DEFAULT 0 NOT NULL,
	"message" text DEFAULT '' NOT NULL,
	"input_hash" text NOT NULL,
	"request" jsonb NOT NULL,
	"result" jsonb,
	"modes" jsonb,
	"created_by" text,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"finished_at" timestamp with time zone,
	"elapsed_ms" integer
);
--> statement-breakpoint
ALTER TABLE "modal_fit" ADD CONSTRAINT "modal_fit_campaign_id_campaign_id_fk" FOREIGN KEY ("campaign_id") REFERENCES "public"."campaign"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "modal_fit" ADD CONSTRAINT "modal_fit_created_by_user_id_fk" FOREIGN KEY ("created_by") REFERENCES "public"."user"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "modal_fit_campaign_idx" ON "modal_fit" USING btree ("campaign_id","created_at");