CREATE TYPE "public"."audit_action" AS ENUM('create', 'update', 'delete');--> statement-breakpoint
CREATE TYPE "public"."chamber_kind" AS ENUM('saturated-salt', 'desiccant', 'water', 'vacuum', 'inert-gas', 'open-shelf', 'other');--> statement-breakpoint
CREATE TYPE "public"."desiccant_event_kind" AS ENUM('charged', 'regenerated', 'replaced', 'checked');--> statement-breakpoint
CREATE TYPE "public"."material_class" AS ENUM('iron-meteorite', 'stony-iron', 'chondrite', 'archaeological-iron', 'steel-coupon', 'other');--> statement-breakpoint
CREATE TYPE "public"."photo_status" AS ENUM('pending', 'ready', 'failed');--> statement-breakpoint
CREATE TYPE "public"."reading_source" AS ENUM('manual', 'csv', 'api');--> statement-breakpoint
CREATE TYPE "public"."role" AS ENUM('lead', 'researcher', 'technician', 'observer');--> statement-breakpoint
CREATE TYPE "public"."score_rule" AS ENUM('primary-scorer', 'consensus');--> statement-breakpoint
CREATE TYPE "public"."silicate_change" AS ENUM('none', 'slight', 'marked');--> statement-breakpoint
CREATE TYPE "public"."treatment_kind" AS ENUM('control', 'coating', 'cleaning', 'chloride-removal', 'storage-atmosphere', 'other');--> statement-breakpoint
CREATE TYPE "public"."trial_member_role" AS ENUM('technician', 'scorer');--> statement-breakpoint
CREATE TYPE "public"."trial_status" AS ENUM('draft', 'running', 'concluded');--> statement-breakpoint
CREATE TABLE "invitations" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"lab_id" uuid NOT NULL,
	"email" text NOT NULL,
	"role" "role" NOT NULL,
	"token_hash" text NOT NULL,
	"expires_at" timestamp with time zone NOT NULL,
	"accepted_at" timestamp with time zone,
	"revoked_at" timestamp with time zone,
	"invited_by" uuid,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "labs" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"name" text NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "memberships" (
	"user_id" uuid NOT NULL,
	"lab_id" uuid NOT NULL,
	"role" "role" NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "memberships_user_id_lab_id_pk" PRIMARY KEY("user_id","lab_id")
);
--> statement-breakpoint
CREATE TABLE "users" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"email" text NOT NULL,
	"name" text NOT NULL,
	"password_hash" text NOT NULL,
	"failed_sign_ins" integer DEFAULT 0 NOT NULL,
	"locked_until" timestamp with time zone,
	"reminders_opt_out" boolean DEFAULT false NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "audit_events" (
	"id" bigserial PRIMARY KEY NOT NULL,
	"lab_id" uuid NOT NULL,
	"user_id" uuid,
	"at" timestamp with time zone DEFAULT now() NOT NULL,
	"entity" text NOT NULL,
	"entity_id" text NOT NULL,
	"action" "audit_action" NOT NULL,
	"summary" text,
	"before" jsonb,
	"after" jsonb
);
--> statement-breakpoint
CREATE TABLE "chamber_tokens" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"lab_id" uuid NOT NULL,
	"chamber_id" uuid NOT NULL,
	"label" text NOT NULL,
	"token_hash" text NOT NULL,
	"last_used_at" timestamp with time zone,
	"revoked_at" timestamp with time zone,
	"created_by" uuid,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "chambers" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"lab_id" uuid NOT NULL,
	"name" text NOT NULL,
	"kind" "chamber_kind" NOT NULL,
	"salt_id" text,
	"desiccant_kind" text,
	"desiccant_mass_g" double precision,
	"nominal_temp_c" double precision NOT NULL,
	"volume_l" double precision,
	"setpoint_rh_percent" double precision NOT NULL,
	"tolerance_rh_percent" double precision NOT NULL,
	"air_exchange_per_day" double precision,
	"room_rh_percent" double precision,
	"notes" text DEFAULT '' NOT NULL,
	"archived_at" timestamp with time zone,
	"created_by" uuid,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "desiccant_events" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"lab_id" uuid NOT NULL,
	"chamber_id" uuid NOT NULL,
	"kind" "desiccant_event_kind" NOT NULL,
	"at" timestamp with time zone NOT NULL,
	"mass_g" double precision,
	"notes" text DEFAULT '' NOT NULL,
	"created_by" uuid,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "hygrometer_checks" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"lab_id" uuid NOT NULL,
	"instrument" text NOT NULL,
	"salt_id" text NOT NULL,
	"temp_c" double precision NOT NULL,
	"reading_rh_percent" double precision NOT NULL,
	"reference_rh_percent" double precision NOT NULL,
	"offset_rh_percent" double precision NOT NULL,
	"applied" boolean DEFAULT false NOT NULL,
	"checked_at" timestamp with time zone NOT NULL,
	"created_by" uuid,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "reading_imports" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"lab_id" uuid NOT NULL,
	"chamber_id" uuid NOT NULL,
	"filename" text NOT NULL,
	"rows_imported" integer DEFAULT 0 NOT NULL,
	"duplicates_skipped" integer DEFAULT 0 NOT NULL,
	"created_by" uuid,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "readings" (
	"id" bigserial PRIMARY KEY NOT NULL,
	"lab_id" uuid NOT NULL,
	"chamber_id" uuid NOT NULL,
	"taken_at" timestamp with time zone NOT NULL,
	"rh_percent" double precision NOT NULL,
	"temp_c" double precision,
	"dew_point_c" double precision,
	"source" "reading_source" NOT NULL,
	"instrument" text DEFAULT '' NOT NULL,
	"import_id" uuid,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "specimens" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"lab_id" uuid NOT NULL,
	"label" text NOT NULL,
	"material_class" "material_class" NOT NULL,
	"find_name" text DEFAULT '' NOT NULL,
	"description" text DEFAULT '' NOT NULL,
	"face" text DEFAULT '' NOT NULL,
	"surface_prep" text DEFAULT '' NOT NULL,
	"mass_g" double precision,
	"history" text DEFAULT '' NOT NULL,
	"contamination_notes" text DEFAULT '' NOT NULL,
	"created_by" uuid,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "treatments" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"lab_id" uuid NOT NULL,
	"name" text NOT NULL,
	"kind" "treatment_kind" NOT NULL,
	"description" text DEFAULT '' NOT NULL,
	"protocol" text DEFAULT '' NOT NULL,
	"created_by" uuid,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "inspections" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"lab_id" uuid NOT NULL,
	"trial_id" uuid NOT NULL,
	"day_number" integer NOT NULL,
	"planned_at" timestamp with time zone NOT NULL,
	"done_at" timestamp with time zone,
	"done_by" uuid,
	"reschedule_reason" text,
	"notes" text DEFAULT '' NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "placements" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"lab_id" uuid NOT NULL,
	"trial_id" uuid NOT NULL,
	"specimen_id" uuid NOT NULL,
	"arm_id" uuid,
	"chamber_id" uuid NOT NULL,
	"treatment_id" uuid NOT NULL,
	"from_at" timestamp with time zone,
	"to_at" timestamp with time zone,
	"reason" text DEFAULT '' NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "reminder_log" (
	"inspection_id" uuid NOT NULL,
	"user_id" uuid NOT NULL,
	"kind" text NOT NULL,
	"queued_at" timestamp with time zone DEFAULT now() NOT NULL,
	"sent_at" timestamp with time zone,
	"attempts" integer DEFAULT 0 NOT NULL,
	CONSTRAINT "reminder_log_inspection_id_user_id_kind_pk" PRIMARY KEY("inspection_id","user_id","kind")
);
--> statement-breakpoint
CREATE TABLE "trial_arms" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"lab_id" uuid NOT NULL,
	"trial_id" uuid NOT NULL,
	"chamber_id" uuid NOT NULL,
	"treatment_id" uuid NOT NULL,
	"label" text NOT NULL
);
--> statement-breakpoint
CREATE TABLE "trial_members" (
	"trial_id" uuid NOT NULL,
	"user_id" uuid NOT NULL,
	"lab_id" uuid NOT NULL,
	"role" "trial_member_role" NOT NULL,
	"blind" boolean DEFAULT false NOT NULL,
	CONSTRAINT "trial_members_trial_id_user_id_role_pk" PRIMARY KEY("trial_id","user_id","role")
);
--> statement-breakpoint
CREATE TABLE "trial_notes" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"lab_id" uuid NOT NULL,
	"trial_id" uuid NOT NULL,
	"body" text NOT NULL,
	"created_by" uuid,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "trials" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"lab_id" uuid NOT NULL,
	"title" text NOT NULL,
	"question" text NOT NULL,
	"hypothesis" text DEFAULT '' NOT NULL,
	"primary_outcome" text DEFAULT 'time-to-first-rust' NOT NULL,
	"status" "trial_status" DEFAULT 'draft' NOT NULL,
	"replicates_per_arm" integer DEFAULT 1 NOT NULL,
	"allocation_seed" text,
	"block_by_material" boolean DEFAULT true NOT NULL,
	"schedule_plan" jsonb NOT NULL,
	"score_rule" "score_rule" DEFAULT 'primary-scorer' NOT NULL,
	"primary_scorer_id" uuid,
	"photo_protocol" jsonb DEFAULT '[]'::jsonb NOT NULL,
	"started_at" timestamp with time zone,
	"concluded_at" timestamp with time zone,
	"created_by" uuid,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "marks" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"lab_id" uuid NOT NULL,
	"photo_id" uuid NOT NULL,
	"scorer_id" uuid,
	"geometry" jsonb NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "photos" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"lab_id" uuid NOT NULL,
	"trial_id" uuid,
	"inspection_id" uuid,
	"specimen_id" uuid NOT NULL,
	"object_key" text NOT NULL,
	"filename" text NOT NULL,
	"status" "photo_status" DEFAULT 'pending' NOT NULL,
	"content_type" text NOT NULL,
	"size_bytes" bigint NOT NULL,
	"sha256" text,
	"width" integer,
	"height" integer,
	"captured_at_raw" text,
	"captured_offset" text,
	"captured_at" timestamp with time zone,
	"camera" text,
	"lens" text,
	"exposure" text,
	"orientation" integer,
	"gps" jsonb,
	"derivatives" jsonb DEFAULT '{}'::jsonb NOT NULL,
	"uploaded_by" uuid,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "scores" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"lab_id" uuid NOT NULL,
	"trial_id" uuid NOT NULL,
	"inspection_id" uuid NOT NULL,
	"specimen_id" uuid NOT NULL,
	"photo_id" uuid,
	"scorer_id" uuid,
	"blind" boolean DEFAULT false NOT NULL,
	"spot_count" integer DEFAULT 0 NOT NULL,
	"area_percent" double precision DEFAULT 0 NOT NULL,
	"astm_grade" integer,
	"astm_letter" text,
	"iso_degree" integer,
	"auto_estimate_percent" double precision,
	"weeping" boolean DEFAULT false NOT NULL,
	"silicate_change" "silicate_change" DEFAULT 'none' NOT NULL,
	"no_change" boolean DEFAULT false NOT NULL,
	"notes" text DEFAULT '' NOT NULL,
	"is_record" boolean DEFAULT true NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
ALTER TABLE "invitations" ADD CONSTRAINT "invitations_lab_id_labs_id_fk" FOREIGN KEY ("lab_id") REFERENCES "public"."labs"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "invitations" ADD CONSTRAINT "invitations_invited_by_users_id_fk" FOREIGN KEY ("invited_by") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "memberships" ADD CONSTRAINT "memberships_user_id_users_id_fk" FOREIGN KEY ("user_id") REFERENCES "public"."users"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "memberships" ADD CONSTRAINT "memberships_lab_id_labs_id_fk" FOREIGN KEY ("lab_id") REFERENCES "public"."labs"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "audit_events" ADD CONSTRAINT "audit_events_lab_id_labs_id_fk" FOREIGN KEY ("lab_id") REFERENCES "public"."labs"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "audit_events" ADD CONSTRAINT "audit_events_user_id_users_id_fk" FOREIGN KEY ("user_id") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "chamber_tokens" ADD CONSTRAINT "chamber_tokens_lab_id_labs_id_fk" FOREIGN KEY ("lab_id") REFERENCES "public"."labs"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "chamber_tokens" ADD CONSTRAINT "chamber_tokens_chamber_id_chambers_id_fk" FOREIGN KEY ("chamber_id") REFERENCES "public"."chambers"("id") ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "chamber_tokens" ADD CONSTRAINT "chamber_tokens_created_by_users_id_fk" FOREIGN KEY ("created_by") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "chambers" ADD CONSTRAINT "chambers_lab_id_labs_id_fk" FOREIGN KEY ("lab_id") REFERENCES "public"."labs"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "chambers" ADD CONSTRAINT "chambers_created_by_users_id_fk" FOREIGN KEY ("created_by") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "desiccant_events" ADD CONSTRAINT "desiccant_events_lab_id_labs_id_fk" FOREIGN KEY ("lab_id") REFERENCES "public"."labs"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "desiccant_events" ADD CONSTRAINT "desiccant_events_chamber_id_chambers_id_fk" FOREIGN KEY ("chamber_id") REFERENCES "public"."chambers"("id") ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "desiccant_events" ADD CONSTRAINT "desiccant_events_created_by_users_id_fk" FOREIGN KEY ("created_by") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "hygrometer_checks" ADD CONSTRAINT "hygrometer_checks_lab_id_labs_id_fk" FOREIGN KEY ("lab_id") REFERENCES "public"."labs"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "hygrometer_checks" ADD CONSTRAINT "hygrometer_checks_created_by_users_id_fk" FOREIGN KEY ("created_by") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "reading_imports" ADD CONSTRAINT "reading_imports_lab_id_labs_id_fk" FOREIGN KEY ("lab_id") REFERENCES "public"."labs"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "reading_imports" ADD CONSTRAINT "reading_imports_chamber_id_chambers_id_fk" FOREIGN KEY ("chamber_id") REFERENCES "public"."chambers"("id") ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "reading_imports" ADD CONSTRAINT "reading_imports_created_by_users_id_fk" FOREIGN KEY ("created_by") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "readings" ADD CONSTRAINT "readings_lab_id_labs_id_fk" FOREIGN KEY ("lab_id") REFERENCES "public"."labs"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "readings" ADD CONSTRAINT "readings_chamber_id_chambers_id_fk" FOREIGN KEY ("chamber_id") REFERENCES "public"."chambers"("id") ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "specimens" ADD CONSTRAINT "specimens_lab_id_labs_id_fk" FOREIGN KEY ("lab_id") REFERENCES "public"."labs"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "specimens" ADD CONSTRAINT "specimens_created_by_users_id_fk" FOREIGN KEY ("created_by") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "treatments" ADD CONSTRAINT "treatments_lab_id_labs_id_fk" FOREIGN KEY ("lab_id") REFERENCES "public"."labs"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "treatments" ADD CONSTRAINT "treatments_created_by_users_id_fk" FOREIGN KEY ("created_by") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "inspections" ADD CONSTRAINT "inspections_lab_id_labs_id_fk" FOREIGN KEY ("lab_id") REFERENCES "public"."labs"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "inspections" ADD CONSTRAINT "inspections_trial_id_trials_id_fk" FOREIGN KEY ("trial_id") REFERENCES "public"."trials"("id") ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "inspections" ADD CONSTRAINT "inspections_done_by_users_id_fk" FOREIGN KEY ("done_by") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "placements" ADD CONSTRAINT "placements_lab_id_labs_id_fk" FOREIGN KEY ("lab_id") REFERENCES "public"."labs"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "placements" ADD CONSTRAINT "placements_trial_id_trials_id_fk" FOREIGN KEY ("trial_id") REFERENCES "public"."trials"("id") ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "placements" ADD CONSTRAINT "placements_specimen_id_specimens_id_fk" FOREIGN KEY ("specimen_id") REFERENCES "public"."specimens"("id") ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "placements" ADD CONSTRAINT "placements_arm_id_trial_arms_id_fk" FOREIGN KEY ("arm_id") REFERENCES "public"."trial_arms"("id") ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "placements" ADD CONSTRAINT "placements_chamber_id_chambers_id_fk" FOREIGN KEY ("chamber_id") REFERENCES "public"."chambers"("id") ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "placements" ADD CONSTRAINT "placements_treatment_id_treatments_id_fk" FOREIGN KEY ("treatment_id") REFERENCES "public"."treatments"("id") ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "reminder_log" ADD CONSTRAINT "reminder_log_inspection_id_inspections_id_fk" FOREIGN KEY ("inspection_id") REFERENCES "public"."inspections"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "reminder_log" ADD CONSTRAINT "reminder_log_user_id_users_id_fk" FOREIGN KEY ("user_id") REFERENCES "public"."users"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "trial_arms" ADD CONSTRAINT "trial_arms_lab_id_labs_id_fk" FOREIGN KEY ("lab_id") REFERENCES "public"."labs"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "trial_arms" ADD CONSTRAINT "trial_arms_trial_id_trials_id_fk" FOREIGN KEY ("trial_id") REFERENCES "public"."trials"("id") ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "trial_arms" ADD CONSTRAINT "trial_arms_chamber_id_chambers_id_fk" FOREIGN KEY ("chamber_id") REFERENCES "public"."chambers"("id") ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "trial_arms" ADD CONSTRAINT "trial_arms_treatment_id_treatments_id_fk" FOREIGN KEY ("treatment_id") REFERENCES "public"."treatments"("id") ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "trial_members" ADD CONSTRAINT "trial_members_trial_id_trials_id_fk" FOREIGN KEY ("trial_id") REFERENCES "public"."trials"("id") ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "trial_members" ADD CONSTRAINT "trial_members_user_id_users_id_fk" FOREIGN KEY ("user_id") REFERENCES "public"."users"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "trial_members" ADD CONSTRAINT "trial_members_lab_id_labs_id_fk" FOREIGN KEY ("lab_id") REFERENCES "public"."labs"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "trial_notes" ADD CONSTRAINT "trial_notes_lab_id_labs_id_fk" FOREIGN KEY ("lab_id") REFERENCES "public"."labs"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "trial_notes" ADD CONSTRAINT "trial_notes_trial_id_trials_id_fk" FOREIGN KEY ("trial_id") REFERENCES "public"."trials"("id") ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "trial_notes" ADD CONSTRAINT "trial_notes_created_by_users_id_fk" FOREIGN KEY ("created_by") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "trials" ADD CONSTRAINT "trials_lab_id_labs_id_fk" FOREIGN KEY ("lab_id") REFERENCES "public"."labs"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "trials" ADD CONSTRAINT "trials_primary_scorer_id_users_id_fk" FOREIGN KEY ("primary_scorer_id") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "trials" ADD CONSTRAINT "trials_created_by_users_id_fk" FOREIGN KEY ("created_by") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "marks" ADD CONSTRAINT "marks_lab_id_labs_id_fk" FOREIGN KEY ("lab_id") REFERENCES "public"."labs"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "marks" ADD CONSTRAINT "marks_photo_id_photos_id_fk" FOREIGN KEY ("photo_id") REFERENCES "public"."photos"("id") ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "marks" ADD CONSTRAINT "marks_scorer_id_users_id_fk" FOREIGN KEY ("scorer_id") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "photos" ADD CONSTRAINT "photos_lab_id_labs_id_fk" FOREIGN KEY ("lab_id") REFERENCES "public"."labs"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "photos" ADD CONSTRAINT "photos_trial_id_trials_id_fk" FOREIGN KEY ("trial_id") REFERENCES "public"."trials"("id") ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "photos" ADD CONSTRAINT "photos_inspection_id_inspections_id_fk" FOREIGN KEY ("inspection_id") REFERENCES "public"."inspections"("id") ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "photos" ADD CONSTRAINT "photos_specimen_id_specimens_id_fk" FOREIGN KEY ("specimen_id") REFERENCES "public"."specimens"("id") ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "photos" ADD CONSTRAINT "photos_uploaded_by_users_id_fk" FOREIGN KEY ("uploaded_by") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "scores" ADD CONSTRAINT "scores_lab_id_labs_id_fk" FOREIGN KEY ("lab_id") REFERENCES "public"."labs"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "scores" ADD CONSTRAINT "scores_trial_id_trials_id_fk" FOREIGN KEY ("trial_id") REFERENCES "public"."trials"("id") ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "scores" ADD CONSTRAINT "scores_inspection_id_inspections_id_fk" FOREIGN KEY ("inspection_id") REFERENCES "public"."inspections"("id") ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "scores" ADD CONSTRAINT "scores_specimen_id_specimens_id_fk" FOREIGN KEY ("specimen_id") REFERENCES "public"."specimens"("id") ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "scores" ADD CONSTRAINT "scores_photo_id_photos_id_fk" FOREIGN KEY ("photo_id") REFERENCES "public"."photos"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "scores" ADD CONSTRAINT "scores_scorer_id_users_id_fk" FOREIGN KEY ("scorer_id") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
CREATE UNIQUE INDEX "invitations_token_idx" ON "invitations" USING btree ("token_hash");--> statement-breakpoint
CREATE INDEX "invitations_lab_idx" ON "invitations" USING btree ("lab_id","created_at");--> statement-breakpoint
CREATE INDEX "memberships_lab_idx" ON "memberships" USING btree ("lab_id");--> statement-breakpoint
CREATE UNIQUE INDEX "users_email_idx" ON "users" USING btree ("email");--> statement-breakpoint
CREATE INDEX "audit_lab_at_idx" ON "audit_events" USING btree ("lab_id","at");--> statement-breakpoint
CREATE INDEX "audit_lab_entity_idx" ON "audit_events" USING btree ("lab_id","entity","entity_id");--> statement-breakpoint
CREATE INDEX "audit_lab_user_idx" ON "audit_events" USING btree ("lab_id","user_id","at");--> statement-breakpoint
CREATE UNIQUE INDEX "chamber_tokens_hash_idx" ON "chamber_tokens" USING btree ("token_hash");--> statement-breakpoint
CREATE INDEX "chamber_tokens_lab_idx" ON "chamber_tokens" USING btree ("lab_id","chamber_id");--> statement-breakpoint
CREATE INDEX "chambers_lab_idx" ON "chambers" USING btree ("lab_id","name");--> statement-breakpoint
CREATE INDEX "desiccant_events_lab_chamber_idx" ON "desiccant_events" USING btree ("lab_id","chamber_id","at");--> statement-breakpoint
CREATE INDEX "hygrometer_checks_lab_idx" ON "hygrometer_checks" USING btree ("lab_id","instrument","checked_at");--> statement-breakpoint
CREATE INDEX "reading_imports_lab_idx" ON "reading_imports" USING btree ("lab_id","created_at");--> statement-breakpoint
CREATE UNIQUE INDEX "readings_chamber_time_instrument_idx" ON "readings" USING btree ("chamber_id","taken_at","instrument");--> statement-breakpoint
CREATE INDEX "readings_lab_chamber_time_idx" ON "readings" USING btree ("lab_id","chamber_id","taken_at");--> statement-breakpoint
CREATE UNIQUE INDEX "specimens_lab_label_idx" ON "specimens" USING btree ("lab_id","label");--> statement-breakpoint
CREATE INDEX "specimens_lab_class_idx" ON "specimens" USING btree ("lab_id","material_class");--> statement-breakpoint
CREATE INDEX "specimens_lab_created_idx" ON "specimens" USING btree ("lab_id","created_at");--> statement-breakpoint
CREATE UNIQUE INDEX "treatments_lab_name_idx" ON "treatments" USING btree ("lab_id","name");--> statement-breakpoint
CREATE INDEX "inspections_lab_planned_idx" ON "inspections" USING btree ("lab_id","planned_at");--> statement-breakpoint
CREATE INDEX "inspections_lab_open_idx" ON "inspections" USING btree ("lab_id","done_at","planned_at");--> statement-breakpoint
CREATE INDEX "inspections_trial_idx" ON "inspections" USING btree ("trial_id","planned_at");--> statement-breakpoint
CREATE INDEX "placements_lab_trial_idx" ON "placements" USING btree ("lab_id","trial_id");--> statement-breakpoint
CREATE INDEX "placements_specimen_idx" ON "placements" USING btree ("specimen_id","from_at");--> statement-breakpoint
CREATE UNIQUE INDEX "trial_arms_combo_idx" ON "trial_arms" USING btree ("trial_id","chamber_id","treatment_id");--> statement-breakpoint
CREATE INDEX "trial_arms_lab_idx" ON "trial_arms" USING btree ("lab_id","trial_id");--> statement-breakpoint
CREATE INDEX "trial_members_lab_idx" ON "trial_members" USING btree ("lab_id","user_id");--> statement-breakpoint
CREATE INDEX "trial_notes_trial_idx" ON "trial_notes" USING btree ("lab_id","trial_id","created_at");--> statement-breakpoint
CREATE INDEX "trials_lab_status_idx" ON "trials" USING btree ("lab_id","status","created_at");--> statement-breakpoint
CREATE INDEX "marks_lab_photo_idx" ON "marks" USING btree ("lab_id","photo_id","scorer_id");--> statement-breakpoint
CREATE UNIQUE INDEX "photos_object_key_idx" ON "photos" USING btree ("object_key");--> statement-breakpoint
CREATE INDEX "photos_lab_specimen_idx" ON "photos" USING btree ("lab_id","specimen_id","created_at");--> statement-breakpoint
CREATE INDEX "photos_lab_inspection_idx" ON "photos" USING btree ("lab_id","inspection_id");--> statement-breakpoint
CREATE UNIQUE INDEX "scores_unique_idx" ON "scores" USING btree ("inspection_id","specimen_id","scorer_id");--> statement-breakpoint
CREATE INDEX "scores_lab_trial_idx" ON "scores" USING btree ("lab_id","trial_id","specimen_id");