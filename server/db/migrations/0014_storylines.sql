CREATE TABLE "storylines" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"scenario" text NOT NULL,
	"name" text NOT NULL,
	"description" text NOT NULL,
	"baseline_year" integer NOT NULL,
	"anchor_years" jsonb NOT NULL,
	"values" jsonb NOT NULL,
	"organisation_id" uuid NOT NULL,
	"version" integer NOT NULL,
	"state" "review_state" DEFAULT 'draft' NOT NULL,
	"method" text NOT NULL,
	"citation" text NOT NULL,
	"doi" text,
	"licence" text NOT NULL,
	"author_id" uuid NOT NULL,
	"coauthor_ids" uuid[] DEFAULT '{}'::uuid[] NOT NULL,
	"reviewer_id" uuid,
	"review_note" text,
	"withdrawal_reason" text,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL,
	"submitted_at" timestamp with time zone,
	"published_at" timestamp with time zone,
	"superseded_at" timestamp with time zone,
	"withdrawn_at" timestamp with time zone,
	CONSTRAINT "storylines_version" UNIQUE("organisation_id","scenario","name","version")
);
--> statement-breakpoint
ALTER TABLE "storylines" ADD CONSTRAINT "storylines_organisation_id_organisations_id_fk" FOREIGN KEY ("organisation_id") REFERENCES "public"."organisations"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "storylines" ADD CONSTRAINT "storylines_author_id_users_id_fk" FOREIGN KEY ("author_id") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "storylines" ADD CONSTRAINT "storylines_reviewer_id_users_id_fk" FOREIGN KEY ("reviewer_id") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
CREATE UNIQUE INDEX "storylines_one_unpublished" ON "storylines" USING btree ("organisation_id","scenario","name") WHERE state in ('draft', 'in-review');
