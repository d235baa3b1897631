-- Keeps reading_blocks (one row per chamber, hour and instrument) equal to a summary of readings.
-- Statement triggers recompute every hour touched by an insert, update or delete from the readings
-- of that hour, so any writer (imports, the logger API, seeds, SQL by hand) keeps it current.
-- Writers of the same chamber are serialised by a transaction advisory lock taken before the
-- recompute; each statement of the function then reads with a fresh snapshot (read committed), so
-- the second writer's summary includes the first writer's committed rows.
CREATE OR REPLACE FUNCTION reading_blocks_refresh(p_lab uuid[], p_chamber uuid[], p_block timestamptz[]) RETURNS void
LANGUAGE plpgsql AS $$
DECLARE
  c uuid;
BEGIN
  -- Sorted, so two statements touching the same chambers cannot wait on each other in a circle.
  FOR c IN SELECT DISTINCT x FROM unnest(p_chamber) AS x ORDER BY 1 LOOP
    PERFORM pg_advisory_xact_lock(728190, hashtext(c::text));
  END LOOP;
  DELETE FROM reading_blocks b
  USING unnest(p_lab, p_chamber, p_block) AS k(lab_id, chamber_id, block_start)
  WHERE b.lab_id = k.lab_id AND b.chamber_id = k.chamber_id AND b.block_start = k.block_start;
  INSERT INTO reading_blocks (lab_id, chamber_id, block_start, instrument, n, first_at, last_at, last_rh_percent,
                              min_rh_percent, min_at, min_temp_c, min_dew_point_c,
                              max_rh_percent, max_at, max_temp_c, max_dew_point_c, span_ms, span_rh_ms)
  SELECT x.lab_id, x.chamber_id, x.block_start, x.instrument, count(*)::int, min(x.taken_at), max(x.taken_at),
         (array_agg(x.rh_percent ORDER BY x.taken_at DESC))[1],
         min(x.rh_percent),
         (array_agg(x.taken_at ORDER BY x.rh_percent, x.taken_at))[1],
         (array_agg(x.temp_c ORDER BY x.rh_percent, x.taken_at))[1],
         (array_agg(x.dew_point_c ORDER BY x.rh_percent, x.taken_at))[1],
         max(x.rh_percent),
         (array_agg(x.taken_at ORDER BY x.rh_percent DESC, x.taken_at))[1],
         (array_agg(x.temp_c ORDER BY x.rh_percent DESC, x.taken_at))[1],
         (array_agg(x.dew_point_c ORDER BY x.rh_percent DESC, x.taken_at))[1],
         coalesce(sum(x.span_ms), 0),
         coalesce(sum(x.span_ms * x.rh_percent), 0)
  FROM (
    SELECT k.lab_id, k.chamber_id, k.block_start, r.instrument, r.taken_at, r.rh_percent, r.temp_c, r.dew_point_c,
           (extract(epoch FROM lead(r.taken_at) OVER w - r.taken_at) * 1000)::float8 AS span_ms
    FROM (SELECT DISTINCT * FROM unnest(p_lab, p_chamber, p_block) AS u(lab_id, chamber_id, block_start)) AS k
    -- OFFSET 0 keeps the lateral subquery from being flattened into a hash join over the whole
    -- chamber: each hour must be an index range scan.
    CROSS JOIN LATERAL (
      SELECT rr.instrument, rr.taken_at, rr.rh_percent, rr.temp_c, rr.dew_point_c FROM readings rr
      WHERE rr.lab_id = k.lab_id AND rr.chamber_id = k.chamber_id
        AND rr.taken_at >= k.block_start AND rr.taken_at < k.block_start + interval '1 hour'
      OFFSET 0
    ) AS r
    WINDOW w AS (PARTITION BY k.lab_id, k.chamber_id, k.block_start ORDER BY r.taken_at, r.instrument COLLATE "C")
  ) AS x
  GROUP BY x.lab_id, x.chamber_id, x.block_start, x.instrument;
END $$;
--> statement-breakpoint
CREATE OR REPLACE FUNCTION reading_blocks_after_insert() RETURNS trigger
LANGUAGE plpgsql AS $$
DECLARE
  l uuid[]; c uuid[]; b timestamptz[];
BEGIN
  SELECT array_agg(k.lab_id), array_agg(k.chamber_id), array_agg(k.block_start) INTO l, c, b
  FROM (SELECT DISTINCT lab_id, chamber_id, date_bin('1 hour', taken_at, timestamptz '1970-01-01 00:00:00+00') AS block_start FROM new_rows) AS k;
  IF c IS NOT NULL THEN PERFORM reading_blocks_refresh(l, c, b); END IF;
  RETURN NULL;
END $$;
--> statement-breakpoint
CREATE OR REPLACE FUNCTION reading_blocks_after_delete() RETURNS trigger
LANGUAGE plpgsql AS $$
DECLARE
  l uuid[]; c uuid[]; b timestamptz[];
BEGIN
  SELECT array_agg(k.lab_id), array_agg(k.chamber_id), array_agg(k.block_start) INTO l, c, b
  FROM (SELECT DISTINCT lab_id, chamber_id, date_bin('1 hour', taken_at, timestamptz '1970-01-01 00:00:00+00') AS block_start FROM old_rows) AS k;
  IF c IS NOT NULL THEN PERFORM reading_blocks_refresh(l, c, b); END IF;
  RETURN NULL;
END $$;
--> statement-breakpoint
CREATE OR REPLACE FUNCTION reading_blocks_after_update() RETURNS trigger
LANGUAGE plpgsql AS $$
DECLARE
  l uuid[]; c uuid[]; b timestamptz[];
BEGIN
  SELECT array_agg(k.lab_id), array_agg(k.chamber_id), array_agg(k.block_start) INTO l, c, b
  FROM (SELECT lab_id, chamber_id, date_bin('1 hour', taken_at, timestamptz '1970-01-01 00:00:00+00') AS block_start FROM old_rows
        UNION
        SELECT lab_id, chamber_id, date_bin('1 hour', taken_at, timestamptz '1970-01-01 00:00:00+00') FROM new_rows) AS k;
  IF c IS NOT NULL THEN PERFORM reading_blocks_refresh(l, c, b); END IF;
  RETURN NULL;
END $$;
--> statement-breakpoint
CREATE OR REPLACE FUNCTION reading_blocks_after_truncate() RETURNS trigger
LANGUAGE plpgsql AS $$
BEGIN
  DELETE FROM reading_blocks;
  RETURN NULL;
END $$;
--> statement-breakpoint
CREATE TRIGGER reading_blocks_insert AFTER INSERT ON readings REFERENCING NEW TABLE AS new_rows FOR EACH STATEMENT EXECUTE FUNCTION reading_blocks_after_insert();
--> statement-breakpoint
CREATE TRIGGER reading_blocks_delete AFTER DELETE ON readings REFERENCING OLD TABLE AS old_rows FOR EACH STATEMENT EXECUTE FUNCTION reading_blocks_after_delete();
--> statement-breakpoint
CREATE TRIGGER reading_blocks_update AFTER UPDATE ON readings REFERENCING OLD TABLE AS old_rows NEW TABLE AS new_rows FOR EACH STATEMENT EXECUTE FUNCTION reading_blocks_after_update();
--> statement-breakpoint
CREATE TRIGGER reading_blocks_truncate AFTER TRUNCATE ON readings FOR EACH STATEMENT EXECUTE FUNCTION reading_blocks_after_truncate();
--> statement-breakpoint
-- Summaries of the readings already stored.
SELECT reading_blocks_refresh(array_agg(k.lab_id), array_agg(k.chamber_id), array_agg(k.block_start))
FROM (SELECT DISTINCT lab_id, chamber_id, date_bin('1 hour', taken_at, timestamptz '1970-01-01 00:00:00+00') AS block_start FROM readings) AS k
HAVING count(*) > 0;
