ALTER TYPE "public"."role" ADD VALUE 'operator' BEFORE 'admin';--> statement-breakpoint
ALTER TABLE "correlation_sets" ADD COLUMN "coauthor_ids" uuid[] DEFAULT '{}'::uuid[] NOT NULL;--> statement-breakpoint
ALTER TABLE "releases" ADD COLUMN "coauthor_ids" uuid[] DEFAULT '{}'::uuid[] NOT NULL;--> statement-breakpoint
ALTER TABLE "scale_factor_grids" ADD COLUMN "coauthor_ids" uuid[] DEFAULT '{}'::uuid[] NOT NULL;--> statement-breakpoint
ALTER TABLE "users" ADD COLUMN "session_generation" integer DEFAULT 0 NOT NULL;