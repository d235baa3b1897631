CREATE TYPE "public"."chloride_state" AS ENUM('unknown', 'not-detected', 'present', 'active', 'desalinated');--> statement-breakpoint
CREATE TYPE "public"."location_kind" AS ENUM('trial-jar', 'room', 'cabinet', 'case', 'drawer', 'sealed-box');--> statement-breakpoint
CREATE TABLE "object_locations" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"lab_id" uuid NOT NULL,
	"specimen_id" uuid NOT NULL,
	"location_id" uuid NOT NULL,
	"from_at" timestamp with time zone NOT NULL,
	"to_at" timestamp with time zone,
	"reason" text DEFAULT '' NOT NULL,
	"created_by" uuid,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "object_locations_order" CHECK ("object_locations"."to_at" is null or "object_locations"."to_at" > "object_locations"."from_at")
);
--> statement-breakpoint
ALTER TABLE "chambers" ADD COLUMN "location_kind" "location_kind" DEFAULT 'trial-jar' NOT NULL;--> statement-breakpoint
ALTER TABLE "chambers" ADD COLUMN "parent_id" uuid;--> statement-breakpoint
ALTER TABLE "chambers" ADD COLUMN "keeper_id" uuid;--> statement-breakpoint
ALTER TABLE "specimens" ADD COLUMN "accession_number" text;--> statement-breakpoint
ALTER TABLE "specimens" ADD COLUMN "treatments_applied" text DEFAULT '' NOT NULL;--> statement-breakpoint
ALTER TABLE "specimens" ADD COLUMN "chloride_state" "chloride_state" DEFAULT 'unknown' NOT NULL;--> statement-breakpoint
ALTER TABLE "specimens" ADD COLUMN "storage_notes" text DEFAULT '' NOT NULL;--> statement-breakpoint
ALTER TABLE "object_locations" ADD CONSTRAINT "object_locations_lab_id_labs_id_fk" FOREIGN KEY ("lab_id") REFERENCES "public"."labs"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "object_locations" ADD CONSTRAINT "object_locations_specimen_id_specimens_id_fk" FOREIGN KEY ("specimen_id") REFERENCES "public"."specimens"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "object_locations" ADD CONSTRAINT "object_locations_location_id_chambers_id_fk" FOREIGN KEY ("location_id") REFERENCES "public"."chambers"("id") ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "object_locations" ADD CONSTRAINT "object_locations_created_by_users_id_fk" FOREIGN KEY ("created_by") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
CREATE UNIQUE INDEX "object_locations_open_idx" ON "object_locations" USING btree ("specimen_id") WHERE "object_locations"."to_at" is null;--> statement-breakpoint
CREATE INDEX "object_locations_lab_location_idx" ON "object_locations" USING btree ("lab_id","location_id","from_at");--> statement-breakpoint
CREATE INDEX "object_locations_lab_specimen_idx" ON "object_locations" USING btree ("lab_id","specimen_id","from_at");--> statement-breakpoint
ALTER TABLE "chambers" ADD CONSTRAINT "chambers_parent_id_chambers_id_fk" FOREIGN KEY ("parent_id") REFERENCES "public"."chambers"("id") ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "chambers" ADD CONSTRAINT "chambers_keeper_id_users_id_fk" FOREIGN KEY ("keeper_id") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "chambers_parent_idx" ON "chambers" USING btree ("parent_id");--> statement-breakpoint
CREATE UNIQUE INDEX "specimens_lab_accession_idx" ON "specimens" USING btree ("lab_id","accession_number");