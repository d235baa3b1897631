ALTER TABLE "storage_rules" ALTER COLUMN "share_rusted" DROP NOT NULL;--> statement-breakpoint
ALTER TABLE "storage_rules" ALTER COLUMN "horizon_days" DROP NOT NULL;--> statement-breakpoint
ALTER TABLE "storage_rules" ADD COLUMN "origin" text DEFAULT 'trial' NOT NULL;--> statement-breakpoint
ALTER TABLE "storage_rules" ADD COLUMN "source" text DEFAULT '' NOT NULL;--> statement-breakpoint
ALTER TABLE "storage_rules" ADD COLUMN "source_date" date;--> statement-breakpoint
ALTER TABLE "storage_rules" ADD CONSTRAINT "storage_rules_origin_check" CHECK (origin in ('trial', 'entered'));--> statement-breakpoint
ALTER TABLE "storage_rules" ADD CONSTRAINT "storage_rules_source_check" CHECK ((origin = 'trial' and share_rusted is not null and horizon_days is not null) or (origin = 'entered' and length(btrim(source)) > 0 and source_date is not null));