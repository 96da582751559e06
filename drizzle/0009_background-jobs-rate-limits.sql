CREATE TABLE "background_job" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"campaign_id" uuid NOT NULL,
	"kind" text NOT NULL,
	"status" text DEFAULT 'queued' NOT NULL,
	"progress" real DEFAULT 0 NOT NULL,
	"message" text DEFAULT '' NOT NULL,
	"input" jsonb DEFAULT '{}'::jsonb NOT NULL,
	"input_data" "bytea",
	"parts" integer DEFAULT 1 NOT NULL,
	"done_parts" integer[] DEFAULT '{}' NOT NULL,
	"result" jsonb,
	"file" "bytea",
	"file_name" text,
	"file_type" text,
	"attempts" integer DEFAULT 0 NOT NULL,
	"created_by" text,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"started_at" timestamp with time zone,
	"finished_at" timestamp with time zone,
	"elapsed_ms" integer
);
--> statement-breakpoint
CREATE TABLE "job_lease" (
	"queue_job_id" uuid PRIMARY KEY NOT NULL,
	"queue" text NOT NULL,
	"job_id" uuid NOT NULL,
	"worker" text NOT NULL,
	"lease_until" timestamp with time zone NOT NULL
);
--> statement-breakpoint
CREATE TABLE "rate_limit_window" (
	"key" text PRIMARY KEY NOT NULL,
	"window_start" timestamp with time zone NOT NULL,
	"count" integer NOT NULL
);
--> statement-breakpoint
ALTER TABLE "background_job" ADD CONSTRAINT "background_job_campaign_id_campaign_id_fk" FOREIGN KEY ("campaign_id") REFERENCES "public"."campaign"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "background_job" ADD CONSTRAINT "background_job_created_by_user_id_fk" FOREIGN KEY ("created_by") REFERENCES "public"."user"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "background_job_campaign_idx" ON "background_job" USING btree ("campaign_id","created_at");