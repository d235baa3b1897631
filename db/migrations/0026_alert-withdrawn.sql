ALTER TABLE "location_alerts" ADD COLUMN "withdrawn_at" timestamp with time zone;--> statement-breakpoint
ALTER TABLE "location_alerts" ADD COLUMN "withdrawn_reason" text;