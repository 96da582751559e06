CREATE TABLE "upload_key" (
	"campaign_id" uuid NOT NULL,
	"key" text NOT NULL,
	"purpose" text NOT NULL,
	"schedule_entry_id" uuid,
	"request_sha256" text,
	"hit_ids" uuid[] DEFAULT '{}' NOT NULL,
	"noise_check_id" uuid,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "upload_key_pk" PRIMARY KEY("campaign_id","key")
);
--> statement-breakpoint
ALTER TABLE "upload_key" ADD CONSTRAINT "upload_key_campaign_id_campaign_id_fk" FOREIGN KEY ("campaign_id") REFERENCES "public"."campaign"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "upload_key" ADD CONSTRAINT "upload_key_schedule_entry_id_schedule_entry_id_fk" FOREIGN KEY ("schedule_entry_id") REFERENCES "public"."schedule_entry"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "upload_key" ADD CONSTRAINT "upload_key_noise_check_id_noise_check_id_fk" FOREIGN KEY ("noise_check_id") REFERENCES "public"."noise_check"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
-- Keys stored before this table existed (written by hand, not generated): the hits of one
-- upload carry `key` (one hit) or `key#1`…`key#n`; their request hash is unknown (NULL).
INSERT INTO "upload_key" ("campaign_id", "key", "purpose", "schedule_entry_id", "request_sha256", "hit_ids", "created_at")
SELECT "campaign_id", regexp_replace("idempotency_key", '#[0-9]+$', ''), 'hits', "schedule_entry_id", NULL, array_agg("id" ORDER BY "sequence"), min("recorded_at")
FROM "hit"
GROUP BY "campaign_id", regexp_replace("idempotency_key", '#[0-9]+$', ''), "schedule_entry_id"
ON CONFLICT DO NOTHING;--> statement-breakpoint
INSERT INTO "upload_key" ("campaign_id", "key", "purpose", "schedule_entry_id", "request_sha256", "noise_check_id", "created_at")
SELECT "campaign_id", "idempotency_key", 'noise-check', NULL, NULL, "id", "recorded_at"
FROM "noise_check"
ON CONFLICT DO NOTHING;
