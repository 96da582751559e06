CREATE TABLE "fe_mode" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"campaign_id" uuid NOT NULL,
	"model_id" uuid NOT NULL,
	"number" integer NOT NULL,
	"frequency_hz" double precision NOT NULL,
	"modal_mass_kg" double precision,
	"shape" jsonb NOT NULL
);
--> statement-breakpoint
CREATE TABLE "fe_model" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"campaign_id" uuid NOT NULL,
	"name" text NOT NULL,
	"version_label" text NOT NULL,
	"file_units" jsonb NOT NULL,
	"normalisation" text NOT NULL,
	"source_format" text NOT NULL,
	"source_file_name" text DEFAULT '' NOT NULL,
	"source" "bytea" NOT NULL,
	"nodes" jsonb NOT NULL,
	"node_count" integer NOT NULL,
	"mode_count" integer NOT NULL,
	"map_version" integer DEFAULT 1 NOT NULL,
	"uploaded_by" text,
	"uploaded_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "fe_point_link" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"campaign_id" uuid NOT NULL,
	"model_id" uuid NOT NULL,
	"point_label" text NOT NULL,
	"node_label" text,
	"distance_mm" double precision,
	"source" text NOT NULL
);
--> statement-breakpoint
ALTER TABLE "fe_mode" ADD CONSTRAINT "fe_mode_campaign_id_campaign_id_fk" FOREIGN KEY ("campaign_id") REFERENCES "public"."campaign"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "fe_mode" ADD CONSTRAINT "fe_mode_model_id_fe_model_id_fk" FOREIGN KEY ("model_id") REFERENCES "public"."fe_model"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "fe_model" ADD CONSTRAINT "fe_model_campaign_id_campaign_id_fk" FOREIGN KEY ("campaign_id") REFERENCES "public"."campaign"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "fe_model" ADD CONSTRAINT "fe_model_uploaded_by_user_id_fk" FOREIGN KEY ("uploaded_by") REFERENCES "public"."user"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "fe_point_link" ADD CONSTRAINT "fe_point_link_campaign_id_campaign_id_fk" FOREIGN KEY ("campaign_id") REFERENCES "public"."campaign"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "fe_point_link" ADD CONSTRAINT "fe_point_link_model_id_fe_model_id_fk" FOREIGN KEY ("model_id") REFERENCES "public"."fe_model"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
CREATE UNIQUE INDEX "fe_mode_model_number_uq" ON "fe_mode" USING btree ("model_id","number");--> statement-breakpoint
CREATE UNIQUE INDEX "fe_model_campaign_version_uq" ON "fe_model" USING btree ("campaign_id","version_label");--> statement-breakpoint
CREATE INDEX "fe_model_campaign_idx" ON "fe_model" USING btree ("campaign_id","uploaded_at");--> statement-breakpoint
CREATE UNIQUE INDEX "fe_point_link_model_point_uq" ON "fe_point_link" USING btree ("model_id","point_label");