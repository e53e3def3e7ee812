CREATE TABLE "correlation_adoptions" (
	"organisation_id" uuid NOT NULL,
	"scenario" text NOT NULL,
	"source_organisation_id" uuid,
	"adopted_by" uuid,
	"adopted_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "correlation_adoptions_pk" PRIMARY KEY("organisation_id","scenario")
);
--> statement-breakpoint
CREATE TABLE "series_adoptions" (
	"organisation_id" uuid NOT NULL,
	"scenario" text NOT NULL,
	"component" text NOT NULL,
	"series_id" uuid NOT NULL,
	"adopted_by" uuid,
	"adopted_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "series_adoptions_pk" PRIMARY KEY("organisation_id","scenario","component")
);
--> statement-breakpoint
ALTER TABLE "correlation_sets" ADD COLUMN "made_for_series" jsonb DEFAULT '{}'::jsonb NOT NULL;--> statement-breakpoint
ALTER TABLE "correlation_adoptions" ADD CONSTRAINT "correlation_adoptions_organisation_id_organisations_id_fk" FOREIGN KEY ("organisation_id") REFERENCES "public"."organisations"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "correlation_adoptions" ADD CONSTRAINT "correlation_adoptions_source_organisation_id_organisations_id_fk" FOREIGN KEY ("source_organisation_id") REFERENCES "public"."organisations"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "correlation_adoptions" ADD CONSTRAINT "correlation_adoptions_adopted_by_users_id_fk" FOREIGN KEY ("adopted_by") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "series_adoptions" ADD CONSTRAINT "series_adoptions_organisation_id_organisations_id_fk" FOREIGN KEY ("organisation_id") REFERENCES "public"."organisations"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "series_adoptions" ADD CONSTRAINT "series_adoptions_series_id_series_id_fk" FOREIGN KEY ("series_id") REFERENCES "public"."series"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "series_adoptions" ADD CONSTRAINT "series_adoptions_adopted_by_users_id_fk" FOREIGN KEY ("adopted_by") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "series_adoptions_series_idx" ON "series_adoptions" USING btree ("series_id");--> statement-breakpoint
-- Backfill (hand-written). A correlation set names the series it was made for: the series of each of
-- its components whose release was published last at or before the set was (or now, if not published).
UPDATE "correlation_sets" cs SET "made_for_series" = coalesce((
  SELECT jsonb_object_agg(c.component, pick.series_id)
  FROM jsonb_array_elements_text(cs."components") AS c(component)
  CROSS JOIN LATERAL (
    SELECT r."series_id" FROM "releases" r JOIN "series" s ON s."id" = r."series_id"
    WHERE s."component" = c.component AND s."scenario" = cs."scenario" AND r."published_at" IS NOT NULL
      AND r."published_at" <= coalesce(cs."published_at", now())
    ORDER BY r."published_at" DESC LIMIT 1
  ) AS pick
), '{}'::jsonb);
--> statement-breakpoint
-- Every organisation adopts, per scenario and component, the series its latest finished outlook used,
-- so existing outlooks keep their inputs (and input hashes).
INSERT INTO "series_adoptions" ("organisation_id", "scenario", "component", "series_id", "adopted_by", "adopted_at")
SELECT DISTINCT ON (st."organisation_id", o."scenario", ref->>'component')
  st."organisation_id", o."scenario", ref->>'component', (ref->>'seriesId')::uuid, NULL, now()
FROM "outlooks" o
JOIN "sites" st ON st."id" = o."site_id"
CROSS JOIN LATERAL jsonb_array_elements(o."release_refs") AS ref
WHERE o."state" = 'done' AND ref->>'seriesId' IS NOT NULL AND ref->>'component' IS NOT NULL
  AND EXISTS (SELECT 1 FROM "series" s WHERE s."id"::text = ref->>'seriesId')
ORDER BY st."organisation_id", o."scenario", ref->>'component', o."finished_at" DESC NULLS LAST, o."created_at" DESC;
--> statement-breakpoint
-- … and the correlation sets that outlook used: their organisation's, or none when it used none.
INSERT INTO "correlation_adoptions" ("organisation_id", "scenario", "source_organisation_id", "adopted_by", "adopted_at")
SELECT DISTINCT ON (st."organisation_id", o."scenario") st."organisation_id", o."scenario", cs."organisation_id", NULL, now()
FROM "outlooks" o
JOIN "sites" st ON st."id" = o."site_id"
LEFT JOIN "correlation_sets" cs ON cs."id" = o."correlation_set_id"
WHERE o."state" = 'done'
ORDER BY st."organisation_id", o."scenario", o."finished_at" DESC NULLS LAST, o."created_at" DESC;
--> statement-breakpoint
INSERT INTO "audit_log" ("organisation_id", "action", "target_type", "target_id", "detail")
SELECT a."organisation_id", 'science.adopted', 'organisation', a."organisation_id"::text,
  jsonb_build_object('scenario', a."scenario", 'automatic', true, 'source', 'the series its outlooks used before adoption existed')
FROM (SELECT DISTINCT "organisation_id", "scenario" FROM "series_adoptions") a;
