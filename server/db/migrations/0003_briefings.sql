CREATE TYPE "public"."briefing_state" AS ENUM('draft', 'issued');--> statement-breakpoint
CREATE TABLE "briefings" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"organisation_id" uuid NOT NULL,
	"site_id" uuid NOT NULL,
	"outlook_ids" jsonb NOT NULL,
	"version" integer DEFAULT 1 NOT NULL,
	"previous_id" uuid,
	"state" "briefing_state" DEFAULT 'draft' NOT NULL,
	"title" text NOT NULL,
	"audience" text DEFAULT '' NOT NULL,
	"local_context" text DEFAULT '' NOT NULL,
	"language" text NOT NULL,
	"units" text NOT NULL,
	"threshold_ids" jsonb NOT NULL,
	"years" jsonb NOT NULL,
	"document" jsonb,
	"share_token" text,
	"created_by" uuid NOT NULL,
	"issued_by" uuid,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL,
	"issued_at" timestamp with time zone,
	CONSTRAINT "briefings_share_token_unique" UNIQUE("share_token")
);
--> statement-breakpoint
ALTER TABLE "briefings" ADD CONSTRAINT "briefings_organisation_id_organisations_id_fk" FOREIGN KEY ("organisation_id") REFERENCES "public"."organisations"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "briefings" ADD CONSTRAINT "briefings_site_id_sites_id_fk" FOREIGN KEY ("site_id") REFERENCES "public"."sites"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "briefings" ADD CONSTRAINT "briefings_created_by_users_id_fk" FOREIGN KEY ("created_by") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "briefings" ADD CONSTRAINT "briefings_issued_by_users_id_fk" FOREIGN KEY ("issued_by") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "briefings_site_idx" ON "briefings" USING btree ("site_id");--> statement-breakpoint
CREATE INDEX "briefings_organisation_idx" ON "briefings" USING btree ("organisation_id");