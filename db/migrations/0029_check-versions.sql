CREATE TABLE "check_versions" (
	"lab_id" uuid PRIMARY KEY NOT NULL,
	"version" uuid DEFAULT gen_random_uuid() NOT NULL
);
--> statement-breakpoint
ALTER TABLE "check_versions" ADD CONSTRAINT "check_versions_lab_id_labs_id_fk" FOREIGN KEY ("lab_id") REFERENCES "public"."labs"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
-- Hygrometer checks renew one token per lab instead of every chamber's: a check recorded during a long
-- import no longer waits holding the other chambers' tokens.
DROP TRIGGER IF EXISTS climate_versions_hygrometer_checks ON hygrometer_checks;--> statement-breakpoint
DROP FUNCTION IF EXISTS climate_versions_lab();--> statement-breakpoint
INSERT INTO "check_versions" ("lab_id") SELECT "id" FROM "labs";--> statement-breakpoint
CREATE OR REPLACE FUNCTION check_versions_renew() RETURNS trigger
LANGUAGE plpgsql AS $$
BEGIN
  IF TG_OP IN ('INSERT', 'UPDATE') THEN
    INSERT INTO check_versions (lab_id) SELECT DISTINCT lab_id FROM new_rows ORDER BY lab_id
      ON CONFLICT (lab_id) DO UPDATE SET version = gen_random_uuid();
  END IF;
  IF TG_OP IN ('DELETE', 'UPDATE') THEN
    UPDATE check_versions v SET version = gen_random_uuid() WHERE v.lab_id IN (SELECT lab_id FROM old_rows);
  END IF;
  IF TG_OP = 'TRUNCATE' THEN
    UPDATE check_versions SET version = gen_random_uuid();
  END IF;
  RETURN NULL;
END $$;--> statement-breakpoint
CREATE TRIGGER check_versions_insert AFTER INSERT ON hygrometer_checks REFERENCING NEW TABLE AS new_rows
  FOR EACH STATEMENT EXECUTE FUNCTION check_versions_renew();--> statement-breakpoint
CREATE TRIGGER check_versions_update AFTER UPDATE ON hygrometer_checks REFERENCING OLD TABLE AS old_rows NEW TABLE AS new_rows
  FOR EACH STATEMENT EXECUTE FUNCTION check_versions_renew();--> statement-breakpoint
CREATE TRIGGER check_versions_delete AFTER DELETE ON hygrometer_checks REFERENCING OLD TABLE AS old_rows
  FOR EACH STATEMENT EXECUTE FUNCTION check_versions_renew();--> statement-breakpoint
CREATE TRIGGER check_versions_truncate AFTER TRUNCATE ON hygrometer_checks
  FOR EACH STATEMENT EXECUTE FUNCTION check_versions_renew();
