CREATE TYPE "public"."land_motion_source" AS ENUM('gps', 'insar', 'model', 'other');--> statement-breakpoint
CREATE TYPE "public"."outlook_state" AS ENUM('running', 'done', 'failed');--> statement-breakpoint
CREATE TABLE "annual_maxima" (
	"site_id" uuid NOT NULL,
	"year" integer NOT NULL,
	"value" double precision NOT NULL,
	CONSTRAINT "annual_maxima_site_year" UNIQUE("site_id","year")
);
--> statement-breakpoint
CREATE TABLE "outlooks" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"site_id" uuid NOT NULL,
	"scenario" text NOT NULL,
	"samples" integer NOT NULL,
	"seed" integer NOT NULL,
	"input_hash" text NOT NULL,
	"engine_version" text NOT NULL,
	"state" "outlook_state" DEFAULT 'running' NOT NULL,
	"input" jsonb NOT NULL,
	"release_refs" jsonb NOT NULL,
	"correlation_set_id" uuid,
	"notes" jsonb DEFAULT '[]'::jsonb NOT NULL,
	"result" jsonb,
	"headline" jsonb,
	"error" text,
	"duration_ms" integer,
	"requested_by" uuid,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"finished_at" timestamp with time zone,
	CONSTRAINT "outlooks_site_input" UNIQUE("site_id","input_hash")
);
--> statement-breakpoint
CREATE TABLE "sites" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"organisation_id" uuid NOT NULL,
	"name" text NOT NULL,
	"latitude" double precision NOT NULL,
	"longitude" double precision NOT NULL,
	"reference_level" text NOT NULL,
	"land_motion_rate" double precision NOT NULL,
	"land_motion_sigma" double precision NOT NULL,
	"land_motion_source" "land_motion_source" NOT NULL,
	"land_motion_reference" text DEFAULT '' NOT NULL,
	"land_motion_epoch" integer NOT NULL,
	"gumbel_location" double precision,
	"gumbel_scale" double precision,
	"gumbel_source" text,
	"created_by" uuid NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "thresholds" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"site_id" uuid NOT NULL,
	"label" text NOT NULL,
	"height" double precision NOT NULL,
	"design_life_years" integer,
	"position" integer DEFAULT 0 NOT NULL
);
--> statement-breakpoint
ALTER TABLE "annual_maxima" ADD CONSTRAINT "annual_maxima_site_id_sites_id_fk" FOREIGN KEY ("site_id") REFERENCES "public"."sites"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "outlooks" ADD CONSTRAINT "outlooks_site_id_sites_id_fk" FOREIGN KEY ("site_id") REFERENCES "public"."sites"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "outlooks" ADD CONSTRAINT "outlooks_correlation_set_id_correlation_sets_id_fk" FOREIGN KEY ("correlation_set_id") REFERENCES "public"."correlation_sets"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "outlooks" ADD CONSTRAINT "outlooks_requested_by_users_id_fk" FOREIGN KEY ("requested_by") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "sites" ADD CONSTRAINT "sites_organisation_id_organisations_id_fk" FOREIGN KEY ("organisation_id") REFERENCES "public"."organisations"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "sites" ADD CONSTRAINT "sites_created_by_users_id_fk" FOREIGN KEY ("created_by") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "thresholds" ADD CONSTRAINT "thresholds_site_id_sites_id_fk" FOREIGN KEY ("site_id") REFERENCES "public"."sites"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "outlooks_site_idx" ON "outlooks" USING btree ("site_id");--> statement-breakpoint
CREATE INDEX "sites_organisation_idx" ON "sites" USING btree ("organisation_id");--> statement-breakpoint
CREATE INDEX "thresholds_site_idx" ON "thresholds" USING btree ("site_id");