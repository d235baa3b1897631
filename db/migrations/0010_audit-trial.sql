ALTER TABLE "audit_events" ADD COLUMN "trial_id" uuid;--> statement-breakpoint
CREATE INDEX "audit_lab_trial_idx" ON "audit_events" USING btree ("lab_id","trial_id");