CREATE TYPE "public"."datum_kind" AS ENUM('mean-sea-level', 'land-survey', 'chart');--> statement-breakpoint
CREATE TYPE "public"."threshold_kind" AS ENUM('mean-sea-level', 'flood-level');--> statement-breakpoint
ALTER TABLE "sites" ADD COLUMN "datum_kind" "datum_kind";--> statement-breakpoint
ALTER TABLE "sites" ADD COLUMN "datum_offset" double precision;--> statement-breakpoint
ALTER TABLE "sites" ADD COLUMN "reference_epoch" integer;--> statement-breakpoint
-- Sites stored before datums existed keep their meaning: heights above mean sea level at the year their
-- reference level names ("Mean sea level 2020 at …"), or at their land-motion epoch when it names none.
UPDATE "sites" SET "datum_kind" = 'mean-sea-level', "datum_offset" = 0,
  "reference_epoch" = coalesce(substring("reference_level" from '(?:19|20)[0-9][0-9]')::integer, "land_motion_epoch");--> statement-breakpoint
ALTER TABLE "sites" ALTER COLUMN "datum_kind" SET NOT NULL;--> statement-breakpoint
ALTER TABLE "sites" ALTER COLUMN "datum_offset" SET NOT NULL;--> statement-breakpoint
ALTER TABLE "sites" ALTER COLUMN "reference_epoch" SET NOT NULL;--> statement-breakpoint
ALTER TABLE "sites" ADD COLUMN "gumbel_trend" double precision;--> statement-breakpoint
ALTER TABLE "sites" ADD COLUMN "gumbel_location_se" double precision;--> statement-breakpoint
ALTER TABLE "sites" ADD COLUMN "gumbel_scale_se" double precision;--> statement-breakpoint
ALTER TABLE "sites" ADD COLUMN "gumbel_trend_se" double precision;--> statement-breakpoint
ALTER TABLE "thresholds" ADD COLUMN "kind" "threshold_kind" DEFAULT 'mean-sea-level' NOT NULL;--> statement-breakpoint
ALTER TABLE "thresholds" ADD COLUMN "build_year" integer;--> statement-breakpoint
-- A threshold with a design life on a site with extreme-water statistics was compared with the total
-- water level over a life that started in the year of the computation: it becomes a flood level whose
-- life starts in the year of this migration. Elsewhere a design life had no effect and is dropped.
UPDATE "thresholds" SET "kind" = 'flood-level', "build_year" = extract(year from now())::integer
  WHERE "design_life_years" IS NOT NULL AND "site_id" IN (SELECT "id" FROM "sites" WHERE "gumbel_location" IS NOT NULL AND "gumbel_scale" IS NOT NULL);--> statement-breakpoint
UPDATE "thresholds" SET "design_life_years" = NULL WHERE "kind" = 'mean-sea-level';
