ALTER TABLE "sites" ADD COLUMN "planning_scenario" text DEFAULT 'SSP2-4.5' NOT NULL;--> statement-breakpoint
ALTER TABLE "sites" ADD COLUMN "planning_tolerance" double precision DEFAULT 0.1 NOT NULL;--> statement-breakpoint
-- Existing sites plan for the scenario their planners have run most (SSP2-4.5 first on a tie, then the
-- earliest run), so their headline stays on the scenario they work with; sites without a finished
-- outlook keep the SSP2-4.5 default.
UPDATE "sites" SET "planning_scenario" = ranked."scenario"
FROM (
  SELECT DISTINCT ON ("site_id") "site_id", "scenario"
  FROM "outlooks" WHERE "state" = 'done'
  GROUP BY "site_id", "scenario"
  ORDER BY "site_id", count(*) DESC, ("scenario" = 'SSP2-4.5') DESC, min("finished_at") ASC
) AS ranked
WHERE ranked."site_id" = "sites"."id";
