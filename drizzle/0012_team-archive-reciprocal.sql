CREATE TABLE "campaign_archive" (
	"campaign_id" uuid PRIMARY KEY NOT NULL,
	"archived_at" timestamp with time zone DEFAULT now() NOT NULL,
	"archived_by" text,
	"reason" text DEFAULT '' NOT NULL
);
--> statement-breakpoint
CREATE TABLE "schedule_extra" (
	"entry_id" uuid PRIMARY KEY NOT NULL,
	"purpose" text NOT NULL,
	"of_entry_id" uuid,
	"added_by" text,
	"added_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
ALTER TABLE "campaign_archive" ADD CONSTRAINT "campaign_archive_campaign_id_campaign_id_fk" FOREIGN KEY ("campaign_id") REFERENCES "public"."campaign"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "campaign_archive" ADD CONSTRAINT "campaign_archive_archived_by_user_id_fk" FOREIGN KEY ("archived_by") REFERENCES "public"."user"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "schedule_extra" ADD CONSTRAINT "schedule_extra_entry_id_schedule_entry_id_fk" FOREIGN KEY ("entry_id") REFERENCES "public"."schedule_entry"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "schedule_extra" ADD CONSTRAINT "schedule_extra_of_entry_id_schedule_entry_id_fk" FOREIGN KEY ("of_entry_id") REFERENCES "public"."schedule_entry"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "schedule_extra" ADD CONSTRAINT "schedule_extra_added_by_user_id_fk" FOREIGN KEY ("added_by") REFERENCES "public"."user"("id") ON DELETE set null ON UPDATE no action;