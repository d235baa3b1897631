CREATE TABLE "location_status" (
	"location_id" uuid PRIMARY KEY NOT NULL,
	"lab_id" uuid NOT NULL,
	"computed_at" timestamp with time zone NOT NULL,
	"rule_id" uuid,
	"threshold_rh_percent" double precision,
	"rule_ids" uuid[] DEFAULT '{}'::uuid[] NOT NULL,
	"summary" jsonb NOT NULL,
	"detail" jsonb NOT NULL
);
--> statement-breakpoint
ALTER TABLE "location_status" ADD CONSTRAINT "location_status_location_id_chambers_id_fk" FOREIGN KEY ("location_id") REFERENCES "public"."chambers"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "location_status" ADD CONSTRAINT "location_status_lab_id_labs_id_fk" FOREIGN KEY ("lab_id") REFERENCES "public"."labs"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "location_status_lab_idx" ON "location_status" USING btree ("lab_id");--> statement-breakpoint
-- A stored location status is forgotten when its past changes, whatever the writer. Readings appended
-- after the computation do not count as a change of the past: the reader looks at those itself.
CREATE OR REPLACE FUNCTION location_status_forget_readings() RETURNS trigger
LANGUAGE plpgsql AS $$
BEGIN
  IF TG_OP IN ('INSERT', 'UPDATE') THEN
    DELETE FROM location_status s USING (SELECT chamber_id, min(taken_at) AS first_at FROM new_rows GROUP BY chamber_id) n
      WHERE s.location_id = n.chamber_id AND n.first_at <= s.computed_at;
  END IF;
  IF TG_OP IN ('DELETE', 'UPDATE') THEN
    DELETE FROM location_status s USING (SELECT DISTINCT chamber_id FROM old_rows) o WHERE s.location_id = o.chamber_id;
  END IF;
  RETURN NULL;
END $$;--> statement-breakpoint
CREATE TRIGGER location_status_readings_insert AFTER INSERT ON readings REFERENCING NEW TABLE AS new_rows
  FOR EACH STATEMENT EXECUTE FUNCTION location_status_forget_readings();--> statement-breakpoint
CREATE TRIGGER location_status_readings_update AFTER UPDATE ON readings REFERENCING OLD TABLE AS old_rows NEW TABLE AS new_rows
  FOR EACH STATEMENT EXECUTE FUNCTION location_status_forget_readings();--> statement-breakpoint
CREATE TRIGGER location_status_readings_delete AFTER DELETE ON readings REFERENCING OLD TABLE AS old_rows
  FOR EACH STATEMENT EXECUTE FUNCTION location_status_forget_readings();--> statement-breakpoint
-- A row naming one location (TG_ARGV[0] is the column): upkeep, stays, the location itself.
CREATE OR REPLACE FUNCTION location_status_forget_location() RETURNS trigger
LANGUAGE plpgsql AS $$
BEGIN
  DELETE FROM location_status WHERE location_id IN (
    (CASE WHEN TG_OP <> 'DELETE' THEN (to_jsonb(NEW) ->> TG_ARGV[0])::uuid END),
    (CASE WHEN TG_OP <> 'INSERT' THEN (to_jsonb(OLD) ->> TG_ARGV[0])::uuid END));
  RETURN NULL;
END $$;--> statement-breakpoint
CREATE TRIGGER location_status_desiccant_events AFTER INSERT OR UPDATE OR DELETE ON desiccant_events
  FOR EACH ROW EXECUTE FUNCTION location_status_forget_location('chamber_id');--> statement-breakpoint
CREATE TRIGGER location_status_object_locations AFTER INSERT OR UPDATE OR DELETE ON object_locations
  FOR EACH ROW EXECUTE FUNCTION location_status_forget_location('location_id');--> statement-breakpoint
CREATE TRIGGER location_status_chambers AFTER UPDATE ON chambers
  FOR EACH ROW EXECUTE FUNCTION location_status_forget_location('id');--> statement-breakpoint
-- A change that may touch every location of a lab: hygrometer checks (they follow the instrument) and rules.
CREATE OR REPLACE FUNCTION location_status_forget_lab() RETURNS trigger
LANGUAGE plpgsql AS $$
BEGIN
  DELETE FROM location_status WHERE lab_id IN (
    (CASE WHEN TG_OP <> 'DELETE' THEN NEW.lab_id END), (CASE WHEN TG_OP <> 'INSERT' THEN OLD.lab_id END));
  RETURN NULL;
END $$;--> statement-breakpoint
CREATE TRIGGER location_status_hygrometer_checks AFTER INSERT OR UPDATE OR DELETE ON hygrometer_checks
  FOR EACH ROW EXECUTE FUNCTION location_status_forget_lab();--> statement-breakpoint
CREATE TRIGGER location_status_storage_rules AFTER INSERT OR UPDATE OR DELETE ON storage_rules
  FOR EACH ROW EXECUTE FUNCTION location_status_forget_lab();--> statement-breakpoint
-- A register entry the rule matching or the objects-at-risk list reads: the places the object is now.
CREATE OR REPLACE FUNCTION location_status_forget_object() RETURNS trigger
LANGUAGE plpgsql AS $$
BEGIN
  DELETE FROM location_status WHERE location_id IN (SELECT location_id FROM object_locations WHERE specimen_id = NEW.id AND to_at IS NULL);
  RETURN NULL;
END $$;--> statement-breakpoint
CREATE TRIGGER location_status_specimens AFTER UPDATE OF material_class, treatments_applied, label, accession_number ON specimens
  FOR EACH ROW EXECUTE FUNCTION location_status_forget_object();
