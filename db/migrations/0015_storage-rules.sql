CREATE TABLE "storage_rules" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"lab_id" uuid NOT NULL,
	"material_class" text NOT NULL,
	"treatment_id" uuid,
	"treatment_name" text NOT NULL,
	"version" integer NOT NULL,
	"threshold_rh_percent" double precision NOT NULL,
	"lower95_rh_percent" double precision,
	"upper95_rh_percent" double precision,
	"share_rusted" double precision NOT NULL,
	"horizon_days" double precision NOT NULL,
	"method" text NOT NULL,
	"statement" text NOT NULL,
	"source_trial_ids" uuid[] DEFAULT '{}'::uuid[] NOT NULL,
	"note" text DEFAULT '' NOT NULL,
	"accepted_by" uuid,
	"accepted_at" timestamp with time zone DEFAULT now() NOT NULL,
	"superseded_at" timestamp with time zone
);
--> statement-breakpoint
ALTER TABLE "storage_rules" ADD CONSTRAINT "storage_rules_lab_id_labs_id_fk" FOREIGN KEY ("lab_id") REFERENCES "public"."labs"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "storage_rules" ADD CONSTRAINT "storage_rules_treatment_id_treatments_id_fk" FOREIGN KEY ("treatment_id") REFERENCES "public"."treatments"("id") ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "storage_rules" ADD CONSTRAINT "storage_rules_accepted_by_users_id_fk" FOREIGN KEY ("accepted_by") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
CREATE UNIQUE INDEX "storage_rules_version_key" ON "storage_rules" USING btree ("lab_id","material_class","treatment_name","version");--> statement-breakpoint
CREATE UNIQUE INDEX "storage_rules_current_key" ON "storage_rules" USING btree ("lab_id","material_class","treatment_name") WHERE superseded_at is null;--> statement-breakpoint
CREATE INDEX "storage_rules_lab_idx" ON "storage_rules" USING btree ("lab_id","accepted_at");