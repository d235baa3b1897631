ALTER TABLE "marks" ADD COLUMN "role" text DEFAULT 'spot' NOT NULL;--> statement-breakpoint
ALTER TABLE "marks" ADD COLUMN "seq" integer DEFAULT 0 NOT NULL;--> statement-breakpoint
ALTER TABLE "scores" ADD COLUMN "area_source" text;--> statement-breakpoint
CREATE UNIQUE INDEX "scores_record_idx" ON "scores" USING btree ("inspection_id","specimen_id") WHERE "scores"."is_record";--> statement-breakpoint
CREATE UNIQUE INDEX "scores_consensus_idx" ON "scores" USING btree ("inspection_id","specimen_id") WHERE "scores"."scorer_id" is null;