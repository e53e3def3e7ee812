ALTER TABLE "outlooks" ADD COLUMN "claimed_at" timestamp with time zone;--> statement-breakpoint
ALTER TABLE "watches" ADD COLUMN "briefing_id" uuid;--> statement-breakpoint
ALTER TABLE "watches" ADD COLUMN "ended_reason" text;--> statement-breakpoint
ALTER TABLE "watches" ADD COLUMN "undeliverable_at" timestamp with time zone;--> statement-breakpoint
ALTER TABLE "watches" ADD CONSTRAINT "watches_briefing_id_briefings_id_fk" FOREIGN KEY ("briefing_id") REFERENCES "public"."briefings"("id") ON DELETE cascade ON UPDATE no action;
