CREATE TABLE "hit_exclusion" (
	"hit_id" uuid PRIMARY KEY NOT NULL,
	"campaign_id" uuid NOT NULL,
	"schedule_entry_id" uuid NOT NULL,
	"redo_id" uuid NOT NULL,
	"excluded_by" text,
	"reason" text NOT NULL,
	"excluded_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
ALTER TABLE "hit_exclusion" ADD CONSTRAINT "hit_exclusion_hit_id_hit_id_fk" FOREIGN KEY ("hit_id") REFERENCES "public"."hit"("id") ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "hit_exclusion" ADD CONSTRAINT "hit_exclusion_campaign_id_campaign_id_fk" FOREIGN KEY ("campaign_id") REFERENCES "public"."campaign"("id") ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "hit_exclusion" ADD CONSTRAINT "hit_exclusion_schedule_entry_id_schedule_entry_id_fk" FOREIGN KEY ("schedule_entry_id") REFERENCES "public"."schedule_entry"("id") ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "hit_exclusion" ADD CONSTRAINT "hit_exclusion_excluded_by_user_id_fk" FOREIGN KEY ("excluded_by") REFERENCES "public"."user"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "hit_exclusion_entry_idx" ON "hit_exclusion" USING btree ("schedule_entry_id");