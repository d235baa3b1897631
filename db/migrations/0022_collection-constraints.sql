-- Collection rules the database enforces whatever the writer (queries, seeds, SQL by hand):
-- 1. an object is in one place at a time: no two stays of one object overlap (btree_gist exclusion);
-- 2. a stay's location and object belong to the stay's lab;
-- 3. the location tree stays a tree inside one lab: a parent of the same lab, never itself or a descendant.
CREATE EXTENSION IF NOT EXISTS btree_gist;--> statement-breakpoint
ALTER TABLE "object_locations" ADD CONSTRAINT "object_locations_no_overlap"
  EXCLUDE USING gist ("specimen_id" WITH =, tstzrange("from_at", coalesce("to_at", 'infinity'::timestamptz), '[)') WITH &&);--> statement-breakpoint
CREATE OR REPLACE FUNCTION object_locations_same_lab() RETURNS trigger
LANGUAGE plpgsql AS $$
BEGIN
  IF NOT EXISTS (SELECT 1 FROM chambers WHERE id = NEW.location_id AND lab_id = NEW.lab_id) THEN
    RAISE EXCEPTION 'location % is not in lab %', NEW.location_id, NEW.lab_id
      USING ERRCODE = '23514', CONSTRAINT = 'object_locations_location_lab';
  END IF;
  IF NOT EXISTS (SELECT 1 FROM specimens WHERE id = NEW.specimen_id AND lab_id = NEW.lab_id) THEN
    RAISE EXCEPTION 'object % is not in lab %', NEW.specimen_id, NEW.lab_id
      USING ERRCODE = '23514', CONSTRAINT = 'object_locations_object_lab';
  END IF;
  RETURN NEW;
END $$;--> statement-breakpoint
CREATE TRIGGER object_locations_same_lab BEFORE INSERT OR UPDATE OF lab_id, location_id, specimen_id ON object_locations
  FOR EACH ROW EXECUTE FUNCTION object_locations_same_lab();--> statement-breakpoint
CREATE OR REPLACE FUNCTION chambers_tree_check() RETURNS trigger
LANGUAGE plpgsql AS $$
BEGIN
  IF NEW.parent_id IS NULL THEN
    RETURN NEW;
  END IF;
  -- One lab's tree changes one at a time, so two moves cannot each pass and together close a loop.
  PERFORM pg_advisory_xact_lock(728191, hashtext(NEW.lab_id::text));
  IF NOT EXISTS (SELECT 1 FROM chambers WHERE id = NEW.parent_id AND lab_id = NEW.lab_id) THEN
    RAISE EXCEPTION 'parent % is not in lab %', NEW.parent_id, NEW.lab_id
      USING ERRCODE = '23514', CONSTRAINT = 'chambers_parent_lab';
  END IF;
  IF EXISTS (
    WITH RECURSIVE up(id, parent_id, depth) AS (
      SELECT id, parent_id, 1 FROM chambers WHERE id = NEW.parent_id
      UNION ALL
      SELECT c.id, c.parent_id, up.depth + 1 FROM chambers c JOIN up ON c.id = up.parent_id WHERE up.depth < 1000
    )
    SELECT 1 FROM up WHERE id = NEW.id
  ) THEN
    RAISE EXCEPTION 'location % would be inside itself', NEW.id
      USING ERRCODE = '23514', CONSTRAINT = 'chambers_tree_cycle';
  END IF;
  RETURN NEW;
END $$;--> statement-breakpoint
CREATE TRIGGER chambers_tree_check BEFORE INSERT OR UPDATE OF parent_id, lab_id ON chambers
  FOR EACH ROW EXECUTE FUNCTION chambers_tree_check();
