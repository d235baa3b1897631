-- reading_blocks now holds 1-hour and 6-hour blocks (width_hours) and each block's longest span.
-- The refresh recomputes the given (chamber, width, block) keys from the readings of the block;
-- the statement triggers pass both widths for every touched reading. Writers of the same chamber
-- are serialised by a transaction advisory lock taken before the recompute; each statement of the
-- function then reads with a fresh snapshot (read committed), so the second writer's summary
-- includes the first writer's committed rows.
DROP FUNCTION IF EXISTS reading_blocks_refresh(uuid[], uuid[], timestamptz[]);
--> statement-breakpoint
CREATE OR REPLACE FUNCTION reading_blocks_refresh(p_lab uuid[], p_chamber uuid[], p_width smallint[], p_block timestamptz[]) RETURNS void
LANGUAGE plpgsql AS $$
DECLARE
  c uuid;
BEGIN
  -- Sorted, so two statements touching the same chambers cannot wait on each other in a circle.
  FOR c IN SELECT DISTINCT x FROM unnest(p_chamber) AS x ORDER BY 1 LOOP
    PERFORM pg_advisory_xact_lock(728190, hashtext(c::text));
  END LOOP;
  DELETE FROM reading_blocks b
  USING unnest(p_lab, p_chamber, p_width, p_block) AS k(lab_id, chamber_id, width_hours, block_start)
  WHERE b.lab_id = k.lab_id AND b.chamber_id = k.chamber_id AND b.width_hours = k.width_hours AND b.block_start = k.block_start;
  INSERT INTO reading_blocks (lab_id, chamber_id, width_hours, block_start, instrument, n, first_at, last_at, last_rh_percent,
                              min_rh_percent, min_at, min_temp_c, min_dew_point_c,
                              max_rh_percent, max_at, max_temp_c, max_dew_point_c, span_ms, span_rh_ms, max_span_ms)
  SELECT x.lab_id, x.chamber_id, x.width_hours, x.block_start, x.instrument, count(*)::int, min(x.taken_at), max(x.taken_at),
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
         coalesce(sum(x.span_ms * x.rh_percent), 0),
         -- In whole milliseconds, as a JavaScript Date holds the times the spans are compared in.
         coalesce(max(date_part('epoch', date_trunc('milliseconds', x.next_at)) * 1000 - date_part('epoch', date_trunc('milliseconds', x.taken_at)) * 1000), 0)
  FROM (
    SELECT k.lab_id, k.chamber_id, k.width_hours, k.block_start, r.instrument, r.taken_at, r.rh_percent, r.temp_c, r.dew_point_c,
           lead(r.taken_at) OVER w AS next_at,
           (extract(epoch FROM lead(r.taken_at) OVER w - r.taken_at) * 1000)::float8 AS span_ms
    FROM (SELECT DISTINCT * FROM unnest(p_lab, p_chamber, p_width, p_block) AS u(lab_id, chamber_id, width_hours, block_start)) AS k
    -- OFFSET 0 keeps the lateral subquery from being flattened into a hash join over the whole
    -- chamber: each block must be an index range scan.
    CROSS JOIN LATERAL (
      SELECT rr.instrument, rr.taken_at, rr.rh_percent, rr.temp_c, rr.dew_point_c FROM readings rr
      WHERE rr.lab_id = k.lab_id AND rr.chamber_id = k.chamber_id
        AND rr.taken_at >= k.block_start AND rr.taken_at < k.block_start + k.width_hours * interval '1 hour'
      OFFSET 0
    ) AS r
    WINDOW w AS (PARTITION BY k.lab_id, k.chamber_id, k.width_hours, k.block_start ORDER BY r.taken_at, r.instrument COLLATE "C")
  ) AS x
  GROUP BY x.lab_id, x.chamber_id, x.width_hours, x.block_start, x.instrument;
END $$;
--> statement-breakpoint
-- The keys (both widths) of a set of readings.
CREATE OR REPLACE FUNCTION reading_blocks_refresh_rows(p_lab uuid[], p_chamber uuid[], p_at timestamptz[]) RETURNS void
LANGUAGE plpgsql AS $$
DECLARE
  l uuid[]; c uuid[]; w smallint[]; b timestamptz[];
BEGIN
  SELECT array_agg(k.lab_id), array_agg(k.chamber_id), array_agg(k.width_hours), array_agg(k.block_start) INTO l, c, w, b
  FROM (SELECT DISTINCT r.lab_id, r.chamber_id, v.width_hours, date_bin(v.width_hours * interval '1 hour', r.at, timestamptz '1970-01-01 00:00:00+00') AS block_start
        FROM unnest(p_lab, p_chamber, p_at) AS r(lab_id, chamber_id, at) CROSS JOIN (VALUES (1::smallint), (6::smallint)) AS v(width_hours)) AS k;
  IF c IS NOT NULL THEN PERFORM reading_blocks_refresh(l, c, w, b); END IF;
END $$;
--> statement-breakpoint
CREATE OR REPLACE FUNCTION reading_blocks_after_insert() RETURNS trigger
LANGUAGE plpgsql AS $$
BEGIN
  PERFORM reading_blocks_refresh_rows(array_agg(k.lab_id), array_agg(k.chamber_id), array_agg(k.at))
  FROM (SELECT DISTINCT lab_id, chamber_id, date_bin('1 hour', taken_at, timestamptz '1970-01-01 00:00:00+00') AS at FROM new_rows) AS k;
  RETURN NULL;
END $$;
--> statement-breakpoint
CREATE OR REPLACE FUNCTION reading_blocks_after_delete() RETURNS trigger
LANGUAGE plpgsql AS $$
BEGIN
  PERFORM reading_blocks_refresh_rows(array_agg(k.lab_id), array_agg(k.chamber_id), array_agg(k.at))
  FROM (SELECT DISTINCT lab_id, chamber_id, date_bin('1 hour', taken_at, timestamptz '1970-01-01 00:00:00+00') AS at FROM old_rows) AS k;
  RETURN NULL;
END $$;
--> statement-breakpoint
CREATE OR REPLACE FUNCTION reading_blocks_after_update() RETURNS trigger
LANGUAGE plpgsql AS $$
BEGIN
  PERFORM reading_blocks_refresh_rows(array_agg(k.lab_id), array_agg(k.chamber_id), array_agg(k.at))
  FROM (SELECT lab_id, chamber_id, date_bin('1 hour', taken_at, timestamptz '1970-01-01 00:00:00+00') AS at FROM old_rows
        UNION
        SELECT lab_id, chamber_id, date_bin('1 hour', taken_at, timestamptz '1970-01-01 00:00:00+00') FROM new_rows) AS k;
  RETURN NULL;
END $$;
--> statement-breakpoint
-- Recompute every block, both widths, from the readings already stored.
DELETE FROM reading_blocks;
--> statement-breakpoint
SELECT reading_blocks_refresh_rows(array_agg(k.lab_id), array_agg(k.chamber_id), array_agg(k.at))
FROM (SELECT DISTINCT lab_id, chamber_id, date_bin('1 hour', taken_at, timestamptz '1970-01-01 00:00:00+00') AS at FROM readings) AS k
HAVING count(*) > 0;
