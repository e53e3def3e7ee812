CREATE TABLE "adaptation_measures" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"site_id" uuid NOT NULL,
	"name" text NOT NULL,
	"height" double precision,
	"kind" text NOT NULL,
	"lead_time_years" integer NOT NULL,
	"design_life_years" integer,
	"cost_band" text,
	"created_by" uuid NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "adaptation_pathways" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"site_id" uuid NOT NULL,
	"name" text NOT NULL,
	"measure_ids" jsonb NOT NULL,
	"tolerances" jsonb NOT NULL,
	"illustrative" boolean DEFAULT false NOT NULL,
	"created_by" uuid NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "decision_alerts" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"record_id" uuid NOT NULL,
	"site_id" uuid NOT NULL,
	"outlook_id" uuid NOT NULL,
	"reason" jsonb NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "decision_alerts_record_outlook" UNIQUE("record_id","outlook_id")
);
--> statement-breakpoint
CREATE TABLE "decision_records" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"site_id" uuid NOT NULL,
	"pathway_id" uuid NOT NULL,
	"measure_id" uuid NOT NULL,
	"from_measure_id" uuid NOT NULL,
	"scenario" text NOT NULL,
	"tolerance" double precision NOT NULL,
	"tipping_year" integer,
	"decision_year" integer,
	"horizon" integer NOT NULL,
	"lead_time_years" integer NOT NULL,
	"margin_years" integer NOT NULL,
	"rationale" text NOT NULL,
	"outlook_id" uuid NOT NULL,
	"outlook_input_hash" text NOT NULL,
	"engine_version" text NOT NULL,
	"releases" jsonb NOT NULL,
	"decided_by" uuid NOT NULL,
	"decided_by_name" text NOT NULL,
	"decided_at" timestamp with time zone DEFAULT now() NOT NULL,
	"review_date" text NOT NULL,
	"reviews_record_id" uuid
);
--> statement-breakpoint
ALTER TABLE "adaptation_measures" ADD CONSTRAINT "adaptation_measures_site_id_sites_id_fk" FOREIGN KEY ("site_id") REFERENCES "public"."sites"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "adaptation_measures" ADD CONSTRAINT "adaptation_measures_created_by_users_id_fk" FOREIGN KEY ("created_by") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "adaptation_pathways" ADD CONSTRAINT "adaptation_pathways_site_id_sites_id_fk" FOREIGN KEY ("site_id") REFERENCES "public"."sites"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "adaptation_pathways" ADD CONSTRAINT "adaptation_pathways_created_by_users_id_fk" FOREIGN KEY ("created_by") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "decision_alerts" ADD CONSTRAINT "decision_alerts_record_id_decision_records_id_fk" FOREIGN KEY ("record_id") REFERENCES "public"."decision_records"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "decision_alerts" ADD CONSTRAINT "decision_alerts_site_id_sites_id_fk" FOREIGN KEY ("site_id") REFERENCES "public"."sites"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "decision_records" ADD CONSTRAINT "decision_records_site_id_sites_id_fk" FOREIGN KEY ("site_id") REFERENCES "public"."sites"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "decision_records" ADD CONSTRAINT "decision_records_pathway_id_adaptation_pathways_id_fk" FOREIGN KEY ("pathway_id") REFERENCES "public"."adaptation_pathways"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "decision_records" ADD CONSTRAINT "decision_records_measure_id_adaptation_measures_id_fk" FOREIGN KEY ("measure_id") REFERENCES "public"."adaptation_measures"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "decision_records" ADD CONSTRAINT "decision_records_from_measure_id_adaptation_measures_id_fk" FOREIGN KEY ("from_measure_id") REFERENCES "public"."adaptation_measures"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "decision_records" ADD CONSTRAINT "decision_records_decided_by_users_id_fk" FOREIGN KEY ("decided_by") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "adaptation_measures_site_idx" ON "adaptation_measures" USING btree ("site_id");--> statement-breakpoint
CREATE INDEX "adaptation_pathways_site_idx" ON "adaptation_pathways" USING btree ("site_id");--> statement-breakpoint
CREATE INDEX "decision_alerts_site_idx" ON "decision_alerts" USING btree ("site_id");--> statement-breakpoint
CREATE INDEX "decision_records_site_idx" ON "decision_records" USING btree ("site_id");--> statement-breakpoint
-- Hand-written: decision records are immutable (a review is a new record), so the database refuses to change one.
CREATE FUNCTION decision_records_immutable() RETURNS trigger LANGUAGE plpgsql AS $$
BEGIN
  RAISE EXCEPTION 'decision records are immutable: record a review instead';
END;
$$;--> statement-breakpoint
CREATE TRIGGER decision_records_no_update BEFORE UPDATE ON decision_records FOR EACH ROW EXECUTE FUNCTION decision_records_immutable();
