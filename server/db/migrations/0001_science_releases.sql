CREATE TYPE "public"."amount_unit" AS ENUM('m', 'mm', 'Gt');--> statement-breakpoint
CREATE TYPE "public"."release_form" AS ENUM('normal', 'lognormal', 'quantiles', 'samples');--> statement-breakpoint
CREATE TYPE "public"."review_state" AS ENUM('draft', 'in-review', 'published', 'superseded', 'withdrawn');--> statement-breakpoint
CREATE TABLE "correlation_sets" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"scenario" text NOT NULL,
	"title" text NOT NULL,
	"components" jsonb NOT NULL,
	"matrix" jsonb NOT NULL,
	"organisation_id" uuid NOT NULL,
	"version" integer NOT NULL,
	"state" "review_state" DEFAULT 'draft' NOT NULL,
	"method" text NOT NULL,
	"citation" text NOT NULL,
	"doi" text,
	"licence" text NOT NULL,
	"author_id" uuid NOT NULL,
	"reviewer_id" uuid,
	"review_note" text,
	"withdrawal_reason" text,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL,
	"submitted_at" timestamp with time zone,
	"published_at" timestamp with time zone,
	"superseded_at" timestamp with time zone,
	"withdrawn_at" timestamp with time zone,
	CONSTRAINT "correlation_sets_version" UNIQUE("organisation_id","scenario","version")
);
--> statement-breakpoint
CREATE TABLE "release_draws" (
	"release_id" uuid PRIMARY KEY NOT NULL,
	"draw_count" integer NOT NULL,
	"anchor_count" integer NOT NULL,
	"values" "bytea" NOT NULL
);
--> statement-breakpoint
CREATE TABLE "releases" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"series_id" uuid NOT NULL,
	"form" "release_form" NOT NULL,
	"baseline_year" integer NOT NULL,
	"anchor_years" jsonb NOT NULL,
	"parameters" jsonb NOT NULL,
	"entered_unit" "amount_unit" DEFAULT 'm' NOT NULL,
	"summary" jsonb NOT NULL,
	"organisation_id" uuid NOT NULL,
	"version" integer NOT NULL,
	"state" "review_state" DEFAULT 'draft' NOT NULL,
	"method" text NOT NULL,
	"citation" text NOT NULL,
	"doi" text,
	"licence" text NOT NULL,
	"author_id" uuid NOT NULL,
	"reviewer_id" uuid,
	"review_note" text,
	"withdrawal_reason" text,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL,
	"submitted_at" timestamp with time zone,
	"published_at" timestamp with time zone,
	"superseded_at" timestamp with time zone,
	"withdrawn_at" timestamp with time zone,
	CONSTRAINT "releases_series_version" UNIQUE("series_id","version")
);
--> statement-breakpoint
CREATE TABLE "scale_factor_grids" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"component" text NOT NULL,
	"title" text NOT NULL,
	"latitudes" jsonb NOT NULL,
	"longitudes" jsonb NOT NULL,
	"factors" jsonb NOT NULL,
	"organisation_id" uuid NOT NULL,
	"version" integer NOT NULL,
	"state" "review_state" DEFAULT 'draft' NOT NULL,
	"method" text NOT NULL,
	"citation" text NOT NULL,
	"doi" text,
	"licence" text NOT NULL,
	"author_id" uuid NOT NULL,
	"reviewer_id" uuid,
	"review_note" text,
	"withdrawal_reason" text,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL,
	"submitted_at" timestamp with time zone,
	"published_at" timestamp with time zone,
	"superseded_at" timestamp with time zone,
	"withdrawn_at" timestamp with time zone,
	CONSTRAINT "scale_factor_grids_version" UNIQUE("organisation_id","component","version")
);
--> statement-breakpoint
CREATE TABLE "series" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"component" text NOT NULL,
	"scenario" text NOT NULL,
	"organisation_id" uuid NOT NULL,
	"title" text NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "series_identity" UNIQUE("organisation_id","component","scenario","title")
);
--> statement-breakpoint
ALTER TABLE "organisations" ALTER COLUMN "kind" SET DATA TYPE text;--> statement-breakpoint
DROP TYPE "public"."organisation_kind";--> statement-breakpoint
CREATE TYPE "public"."organisation_kind" AS ENUM('council', 'port', 'science', 'consultancy', 'other');--> statement-breakpoint
ALTER TABLE "organisations" ALTER COLUMN "kind" SET DATA TYPE "public"."organisation_kind" USING "kind"::"public"."organisation_kind";--> statement-breakpoint
ALTER TABLE "correlation_sets" ADD CONSTRAINT "correlation_sets_organisation_id_organisations_id_fk" FOREIGN KEY ("organisation_id") REFERENCES "public"."organisations"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "correlation_sets" ADD CONSTRAINT "correlation_sets_author_id_users_id_fk" FOREIGN KEY ("author_id") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "correlation_sets" ADD CONSTRAINT "correlation_sets_reviewer_id_users_id_fk" FOREIGN KEY ("reviewer_id") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "release_draws" ADD CONSTRAINT "release_draws_release_id_releases_id_fk" FOREIGN KEY ("release_id") REFERENCES "public"."releases"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "releases" ADD CONSTRAINT "releases_series_id_series_id_fk" FOREIGN KEY ("series_id") REFERENCES "public"."series"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "releases" ADD CONSTRAINT "releases_organisation_id_organisations_id_fk" FOREIGN KEY ("organisation_id") REFERENCES "public"."organisations"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "releases" ADD CONSTRAINT "releases_author_id_users_id_fk" FOREIGN KEY ("author_id") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "releases" ADD CONSTRAINT "releases_reviewer_id_users_id_fk" FOREIGN KEY ("reviewer_id") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "scale_factor_grids" ADD CONSTRAINT "scale_factor_grids_organisation_id_organisations_id_fk" FOREIGN KEY ("organisation_id") REFERENCES "public"."organisations"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "scale_factor_grids" ADD CONSTRAINT "scale_factor_grids_author_id_users_id_fk" FOREIGN KEY ("author_id") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "scale_factor_grids" ADD CONSTRAINT "scale_factor_grids_reviewer_id_users_id_fk" FOREIGN KEY ("reviewer_id") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "series" ADD CONSTRAINT "series_organisation_id_organisations_id_fk" FOREIGN KEY ("organisation_id") REFERENCES "public"."organisations"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "releases_state_idx" ON "releases" USING btree ("state");