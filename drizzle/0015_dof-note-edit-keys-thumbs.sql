CREATE TABLE "dof_note_key" (
	"campaign_id" uuid NOT NULL,
	"key" text NOT NULL,
	"entry_id" uuid,
	"request_sha256" text NOT NULL,
	"note_id" uuid,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "dof_note_key_pk" PRIMARY KEY("campaign_id","key")
);
--> statement-breakpoint
CREATE TABLE "dof_photo_thumb" (
	"note_id" uuid PRIMARY KEY NOT NULL,
	"mime" text NOT NULL,
	"bytes" "bytea" NOT NULL,
	"size" integer NOT NULL
);
--> statement-breakpoint
ALTER TABLE "dof_note" ADD COLUMN "version" integer DEFAULT 1 NOT NULL;--> statement-breakpoint
ALTER TABLE "dof_note" ADD COLUMN "edited_at" timestamp with time zone;--> statement-breakpoint
ALTER TABLE "dof_note_key" ADD CONSTRAINT "dof_note_key_campaign_id_campaign_id_fk" FOREIGN KEY ("campaign_id") REFERENCES "public"."campaign"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "dof_note_key" ADD CONSTRAINT "dof_note_key_note_id_dof_note_id_fk" FOREIGN KEY ("note_id") REFERENCES "public"."dof_note"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "dof_photo_thumb" ADD CONSTRAINT "dof_photo_thumb_note_id_dof_note_id_fk" FOREIGN KEY ("note_id") REFERENCES "public"."dof_note"("id") ON DELETE cascade ON UPDATE no action;