CREATE TABLE "climate_versions" (
	"chamber_id" uuid PRIMARY KEY NOT NULL,
	"lab_id" uuid NOT NULL,
	"version" uuid DEFAULT gen_random_uuid() NOT NULL
);
--> statement-breakpoint
ALTER TABLE "climate_versions" ADD CONSTRAINT "climate_versions_chamber_id_chambers_id_fk" FOREIGN KEY ("chamber_id") REFERENCES "public"."chambers"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "climate_versions" ADD CONSTRAINT "climate_versions_lab_id_labs_id_fk" FOREIGN KEY ("lab_id") REFERENCES "public"."labs"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "climate_versions_lab_idx" ON "climate_versions" USING btree ("lab_id");--> statement-breakpoint
-- Every chamber there is now starts with a token; one made later gets its first with its first reading
-- (until then it has no token and its chart is not reused).
INSERT INTO "climate_versions" ("chamber_id", "lab_id") SELECT "id", "lab_id" FROM "chambers";--> statement-breakpoint
-- Readings written, corrected or removed, by any writer: a new token for each chamber they belong to.
-- Removals only renew tokens that exist (a chamber being deleted takes its readings and token with it).
CREATE OR REPLACE FUNCTION climate_versions_readings() RETURNS trigger
LANGUAGE plpgsql AS $$
BEGIN
  IF TG_OP IN ('INSERT', 'UPDATE') THEN
    INSERT INTO climate_versions (chamber_id, lab_id) SELECT DISTINCT chamber_id, lab_id FROM new_rows
      ON CONFLICT (chamber_id) DO UPDATE SET version = gen_random_uuid();
  END IF;
  IF TG_OP IN ('DELETE', 'UPDATE') THEN
    UPDATE climate_versions v SET version = gen_random_uuid() WHERE v.chamber_id IN (SELECT chamber_id FROM old_rows);
  END IF;
  RETURN NULL;
END $$;--> statement-breakpoint
CREATE TRIGGER climate_versions_readings_insert AFTER INSERT ON readings REFERENCING NEW TABLE AS new_rows
  FOR EACH STATEMENT EXECUTE FUNCTION climate_versions_readings();--> statement-breakpoint
CREATE TRIGGER climate_versions_readings_update AFTER UPDATE ON readings REFERENCING OLD TABLE AS old_rows NEW TABLE AS new_rows
  FOR EACH STATEMENT EXECUTE FUNCTION climate_versions_readings();--> statement-breakpoint
CREATE TRIGGER climate_versions_readings_delete AFTER DELETE ON readings REFERENCING OLD TABLE AS old_rows
  FOR EACH STATEMENT EXECUTE FUNCTION climate_versions_readings();--> statement-breakpoint
CREATE OR REPLACE FUNCTION climate_versions_all() RETURNS trigger
LANGUAGE plpgsql AS $$
BEGIN
  UPDATE climate_versions SET version = gen_random_uuid();
  RETURN NULL;
END $$;--> statement-breakpoint
CREATE TRIGGER climate_versions_readings_truncate AFTER TRUNCATE ON readings
  FOR EACH STATEMENT EXECUTE FUNCTION climate_versions_all();--> statement-breakpoint
-- A hygrometer check follows its instrument into every chamber of the lab.
CREATE OR REPLACE FUNCTION climate_versions_lab() RETURNS trigger
LANGUAGE plpgsql AS $$
BEGIN
  UPDATE climate_versions SET version = gen_random_uuid() WHERE lab_id IN (
    (CASE WHEN TG_OP <> 'DELETE' THEN NEW.lab_id END), (CASE WHEN TG_OP <> 'INSERT' THEN OLD.lab_id END));
  RETURN NULL;
END $$;--> statement-breakpoint
CREATE TRIGGER climate_versions_hygrometer_checks AFTER INSERT OR UPDATE OR DELETE ON hygrometer_checks
  FOR EACH ROW EXECUTE FUNCTION climate_versions_lab();
