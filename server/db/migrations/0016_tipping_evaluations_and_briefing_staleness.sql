CREATE TABLE "tipping_evaluations" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"outlook_id" uuid NOT NULL,
	"site_id" uuid NOT NULL,
	"measures_key" text NOT NULL,
	"heights" jsonb NOT NULL,
	"state" text DEFAULT 'running' NOT NULL,
	"horizon" integer,
	"chances" jsonb,
	"error" text,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"finished_at" timestamp with time zone,
	CONSTRAINT "tipping_evaluations_outlook_measures" UNIQUE("outlook_id","measures_key")
);
--> statement-breakpoint
ALTER TABLE "briefings" ADD COLUMN "staleness" jsonb;--> statement-breakpoint
ALTER TABLE "briefings" ADD COLUMN "staleness_checked_at" timestamp with time zone;--> statement-breakpoint
ALTER TABLE "tipping_evaluations" ADD CONSTRAINT "tipping_evaluations_outlook_id_outlooks_id_fk" FOREIGN KEY ("outlook_id") REFERENCES "public"."outlooks"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "tipping_evaluations" ADD CONSTRAINT "tipping_evaluations_site_id_sites_id_fk" FOREIGN KEY ("site_id") REFERENCES "public"."sites"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "tipping_evaluations_site_idx" ON "tipping_evaluations" USING btree ("site_id");