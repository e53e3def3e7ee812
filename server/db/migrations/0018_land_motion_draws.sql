CREATE TABLE "land_motion_draws" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"site_id" uuid NOT NULL,
	"version" integer NOT NULL,
	"draws" jsonb NOT NULL,
	"summary" jsonb NOT NULL,
	"source" "land_motion_source" NOT NULL,
	"reference" text DEFAULT '' NOT NULL,
	"linked_release_id" uuid,
	"uploaded_by" uuid,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "land_motion_draws_site_version" UNIQUE("site_id","version")
);
--> statement-breakpoint
ALTER TABLE "land_motion_draws" ADD CONSTRAINT "land_motion_draws_site_id_sites_id_fk" FOREIGN KEY ("site_id") REFERENCES "public"."sites"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "land_motion_draws" ADD CONSTRAINT "land_motion_draws_linked_release_id_releases_id_fk" FOREIGN KEY ("linked_release_id") REFERENCES "public"."releases"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "land_motion_draws" ADD CONSTRAINT "land_motion_draws_uploaded_by_users_id_fk" FOREIGN KEY ("uploaded_by") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;