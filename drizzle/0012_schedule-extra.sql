CREATE TABLE "schedule_extra" (
	"entry_id" uuid PRIMARY KEY NOT NULL,
	"purpose" text NOT NULL,
	"of_entry_id" uuid,
	"added_by" text,
	"added_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
ALTER TABLE "schedule_extra" ADD CONSTRAINT "schedule_extra_entry_id_schedule_entry_id_fk" FOREIGN KEY ("entry_id") REFERENCES "public"."schedule_entry"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "schedule_extra" ADD CONSTRAINT "schedule_extra_of_entry_id_schedule_entry_id_fk" FOREIGN KEY ("of_entry_id") REFERENCES "public"."schedule_entry"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "schedule_extra" ADD CONSTRAINT "schedule_extra_added_by_user_id_fk" FOREIGN KEY ("added_by") REFERENCES "public"."user"("id") ON DELETE set null ON UPDATE no action;