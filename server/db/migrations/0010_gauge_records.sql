CREATE TABLE "gauge_records" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"site_id" uuid NOT NULL,
	"version" integer NOT NULL,
	"resolution" text NOT NULL,
	"values" jsonb NOT NULL,
	"gaps" jsonb NOT NULL,
	"fit" jsonb,
	"fit_issue" text,
	"uploaded_by" uuid,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "gauge_records_site_version" UNIQUE("site_id","version")
);
--> statement-breakpoint
ALTER TABLE "gauge_records" ADD CONSTRAINT "gauge_records_site_id_sites_id_fk" FOREIGN KEY ("site_id") REFERENCES "public"."sites"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "gauge_records" ADD CONSTRAINT "gauge_records_uploaded_by_users_id_fk" FOREIGN KEY ("uploaded_by") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;