CREATE TABLE "akaganeite_checks" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"lab_id" uuid NOT NULL,
	"specimen_id" uuid NOT NULL,
	"notes" text DEFAULT '' NOT NULL,
	"created_by" uuid,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"checked_on" date NOT NULL,
	"method" text NOT NULL,
	"seen" boolean NOT NULL,
	CONSTRAINT "akaganeite_checks_method_check" CHECK ("akaganeite_checks"."method" in ('visual', 'microscope', 'raman', 'xrd', 'other'))
);
--> statement-breakpoint
CREATE TABLE "chloride_tests" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"lab_id" uuid NOT NULL,
	"specimen_id" uuid NOT NULL,
	"notes" text DEFAULT '' NOT NULL,
	"created_by" uuid,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"tested_on" date NOT NULL,
	"method" text NOT NULL,
	"result" text NOT NULL,
	CONSTRAINT "chloride_tests_method_check" CHECK ("chloride_tests"."method" in ('silver-nitrate-spot', 'chloride-strip', 'ion-chromatography', 'titration', 'other')),
	CONSTRAINT "chloride_tests_result_check" CHECK ("chloride_tests"."result" in ('present', 'absent', 'inconclusive'))
);
--> statement-breakpoint
CREATE TABLE "mass_measurements" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"lab_id" uuid NOT NULL,
	"specimen_id" uuid NOT NULL,
	"notes" text DEFAULT '' NOT NULL,
	"created_by" uuid,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"measured_on" date NOT NULL,
	"mass_g" numeric(12, 4) NOT NULL,
	CONSTRAINT "mass_measurements_positive" CHECK ("mass_measurements"."mass_g" > 0)
);
--> statement-breakpoint
CREATE TABLE "prior_treatments" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"lab_id" uuid NOT NULL,
	"specimen_id" uuid NOT NULL,
	"notes" text DEFAULT '' NOT NULL,
	"created_by" uuid,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"treated_on" date NOT NULL,
	"treatment" text NOT NULL
);
--> statement-breakpoint
ALTER TABLE "specimens" ADD COLUMN "parent_piece" text DEFAULT '' NOT NULL;--> statement-breakpoint
ALTER TABLE "specimens" ADD COLUMN "slice" text DEFAULT '' NOT NULL;--> statement-breakpoint
ALTER TABLE "specimens" ADD COLUMN "provenance" text DEFAULT '' NOT NULL;--> statement-breakpoint
ALTER TABLE "trials" ADD COLUMN "block_factors" jsonb DEFAULT '[]'::jsonb NOT NULL;--> statement-breakpoint
ALTER TABLE "akaganeite_checks" ADD CONSTRAINT "akaganeite_checks_lab_id_labs_id_fk" FOREIGN KEY ("lab_id") REFERENCES "public"."labs"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "akaganeite_checks" ADD CONSTRAINT "akaganeite_checks_specimen_id_specimens_id_fk" FOREIGN KEY ("specimen_id") REFERENCES "public"."specimens"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "akaganeite_checks" ADD CONSTRAINT "akaganeite_checks_created_by_users_id_fk" FOREIGN KEY ("created_by") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "chloride_tests" ADD CONSTRAINT "chloride_tests_lab_id_labs_id_fk" FOREIGN KEY ("lab_id") REFERENCES "public"."labs"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "chloride_tests" ADD CONSTRAINT "chloride_tests_specimen_id_specimens_id_fk" FOREIGN KEY ("specimen_id") REFERENCES "public"."specimens"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "chloride_tests" ADD CONSTRAINT "chloride_tests_created_by_users_id_fk" FOREIGN KEY ("created_by") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "mass_measurements" ADD CONSTRAINT "mass_measurements_lab_id_labs_id_fk" FOREIGN KEY ("lab_id") REFERENCES "public"."labs"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "mass_measurements" ADD CONSTRAINT "mass_measurements_specimen_id_specimens_id_fk" FOREIGN KEY ("specimen_id") REFERENCES "public"."specimens"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "mass_measurements" ADD CONSTRAINT "mass_measurements_created_by_users_id_fk" FOREIGN KEY ("created_by") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "prior_treatments" ADD CONSTRAINT "prior_treatments_lab_id_labs_id_fk" FOREIGN KEY ("lab_id") REFERENCES "public"."labs"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "prior_treatments" ADD CONSTRAINT "prior_treatments_specimen_id_specimens_id_fk" FOREIGN KEY ("specimen_id") REFERENCES "public"."specimens"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "prior_treatments" ADD CONSTRAINT "prior_treatments_created_by_users_id_fk" FOREIGN KEY ("created_by") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "akaganeite_checks_specimen_idx" ON "akaganeite_checks" USING btree ("lab_id","specimen_id","checked_on");--> statement-breakpoint
CREATE INDEX "chloride_tests_specimen_idx" ON "chloride_tests" USING btree ("lab_id","specimen_id","tested_on");--> statement-breakpoint
CREATE INDEX "mass_measurements_specimen_idx" ON "mass_measurements" USING btree ("lab_id","specimen_id","measured_on");--> statement-breakpoint
CREATE INDEX "prior_treatments_specimen_idx" ON "prior_treatments" USING btree ("lab_id","specimen_id","treated_on");