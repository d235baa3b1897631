ALTER TABLE "hygrometer_checks" ADD COLUMN "salt2_id" text;--> statement-breakpoint
ALTER TABLE "hygrometer_checks" ADD COLUMN "reading2_rh_percent" double precision;--> statement-breakpoint
ALTER TABLE "hygrometer_checks" ADD COLUMN "reference2_rh_percent" double precision;--> statement-breakpoint
ALTER TABLE "hygrometer_checks" ADD COLUMN "slope" double precision;