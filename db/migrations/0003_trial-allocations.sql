CREATE TABLE "trial_allocations" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"lab_id" uuid NOT NULL,
	"trial_id" uuid NOT NULL,
	"specimen_id" uuid NOT NULL,
	"arm_id" uuid,
	"block_key" text DEFAULT '' NOT NULL,
	"swap_reason" text,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
ALTER TABLE "trial_allocations" ADD CONSTRAINT "trial_allocations_lab_id_labs_id_fk" FOREIGN KEY ("lab_id") REFERENCES "public"."labs"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "trial_allocations" ADD CONSTRAINT "trial_allocations_trial_id_trials_id_fk" FOREIGN KEY ("trial_id") REFERENCES "public"."trials"("id") ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "trial_allocations" ADD CONSTRAINT "trial_allocations_specimen_id_specimens_id_fk" FOREIGN KEY ("specimen_id") REFERENCES "public"."specimens"("id") ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "trial_allocations" ADD CONSTRAINT "trial_allocations_arm_id_trial_arms_id_fk" FOREIGN KEY ("arm_id") REFERENCES "public"."trial_arms"("id") ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
CREATE UNIQUE INDEX "trial_allocations_specimen_idx" ON "trial_allocations" USING btree ("trial_id","specimen_id");--> statement-breakpoint
CREATE INDEX "trial_allocations_lab_idx" ON "trial_allocations" USING btree ("lab_id","trial_id");