import "server-only";
import type pg from "pg";
import { getPool } from "../client";
import { HOUR_MS, type BlockRow, type Row } from "@/lib/climate/readings-reduce";

// The chamber chart's reads, on one connection in one read-only snapshot so the hourly summaries
// and the readings fetched to complete them describe the same data even while a logger posts.

export type Snapshot = { client: pg.PoolClient };

export async function withSnapshot<T>(fn: (s: Snapshot) => Promise<T>): Promise<T> {
  const client = await getPool().connect();
  try {
    await client.query("begin isolation level repeatable read read only");
    // These queries take milliseconds, but the row estimates of the per-hour range scans are
    // large enough to trigger JIT compilation, which alone cost ~80 ms per query.
    await client.query("set local jit = off");
    const out = await fn({ client });
    await client.query("commit");
    return out;
  } catch (err) {
    await client.query("rollback").catch(() => undefined);
    throw err;
  } finally {
    client.release();
  }
}

const iso = (ms: number | null, open: "-infinity" | "infinity") => (ms == null ? open : new Date(ms).toISOString());

/** A time range of readings: from inclusive, to inclusive or not (null = open). */
export type RowRange = { fromMs: number | null; toMs: number | null; toInclusive: boolean };

/**
 * Readings of a chamber in the given ranges (disjoint, in time order), ordered by time then
 * instrument. Each range is one index range scan on (lab_id, chamber_id, taken_at).
 */
export async function loadRows({ client }: Snapshot, { labId, chamberId, ranges }: { labId: string; chamberId: string; ranges: readonly RowRange[] }): Promise<Row[]> {
  if (ranges.length === 0) return [];
  const res = await client.query<[number, number, number | null, number | null, string]>({
    // The lateral subquery with OFFSET 0 stays a per-range index scan instead of being flattened
    // into one join over the whole chamber. Times go out as float8 epoch ms (date_part is far
    // cheaper than the numeric extract); a Date keeps whole milliseconds of them.
    text: `select r.t, r.rh_percent, r.temp_c, r.dew_point_c, r.instrument
           from unnest($3::timestamptz[], $4::timestamptz[], $5::boolean[]) with ordinality as k(lo, hi, incl, ord)
           cross join lateral (
             select date_part('epoch', date_trunc('milliseconds', taken_at)) * 1000 as t, taken_at, rh_percent, temp_c, dew_point_c, instrument
             from readings
             where lab_id = $1 and chamber_id = $2 and taken_at >= k.lo and taken_at <= k.hi and (k.incl or taken_at < k.hi)
             offset 0
           ) r
           order by k.ord, r.taken_at, r.instrument collate "C"`,
    values: [labId, chamberId, ranges.map((r) => iso(r.fromMs, "-infinity")), ranges.map((r) => iso(r.toMs, "infinity")), ranges.map((r) => r.toInclusive)],
    rowMode: "array",
  });
  return res.rows.map((r) => {
    const rh = Number(r[1]);
    return { takenAt: new Date(Math.round(r[0])), rhPercent: rh, rhRaw: rh, tempC: r[2], dewLogged: r[3], instrument: r[4] };
  });
}

/** Block starts from fromMs to toMs, both inclusive (null = open). */
export type BlockRange = { fromMs: number | null; toMs: number | null };

/**
 * Block summaries (reading_blocks) of one width for the given ranges of block starts (disjoint,
 * in time order), ordered by block; one primary-key range scan per range.
 */
export async function loadBlocks({ client }: Snapshot, { labId, chamberId, widthMs, ranges }: { labId: string; chamberId: string; widthMs: number; ranges: readonly BlockRange[] }): Promise<BlockRow[]> {
  if (ranges.length === 0) return [];
  const res = await client.query<[number, string, number, number, number, number, number, number, number | null, number | null, number, number, number | null, number | null, number, number, number]>({
    // Times as float8 epoch ms (date_part is far cheaper than the numeric extract); rounding
    // after date_trunc gives the whole milliseconds a Date would hold. The order of instruments
    // within a block does not matter to the reduction.
    text: `select date_part('epoch', b.block_start) * 1000, b.instrument, b.n,
                  date_part('epoch', date_trunc('milliseconds', b.first_at)) * 1000, date_part('epoch', date_trunc('milliseconds', b.last_at)) * 1000, b.last_rh_percent,
                  b.min_rh_percent, date_part('epoch', date_trunc('milliseconds', b.min_at)) * 1000, b.min_temp_c, b.min_dew_point_c,
                  b.max_rh_percent, date_part('epoch', date_trunc('milliseconds', b.max_at)) * 1000, b.max_temp_c, b.max_dew_point_c,
                  b.span_ms, b.span_rh_ms, b.max_span_ms
           from unnest($4::timestamptz[], $5::timestamptz[]) with ordinality as k(lo, hi, ord)
           cross join lateral (
             select * from reading_blocks
             where lab_id = $1 and chamber_id = $2 and width_hours = $3 and block_start >= k.lo and block_start <= k.hi
             offset 0
           ) b
           order by k.ord, b.block_start`,
    values: [labId, chamberId, widthMs / HOUR_MS, ranges.map((r) => iso(r.fromMs, "-infinity")), ranges.map((r) => iso(r.toMs, "infinity"))],
    rowMode: "array",
  });
  const ms = Math.round;
  return res.rows.map((r) => ({
    blockStartMs: ms(r[0]), widthMs, instrument: r[1], n: r[2], firstMs: ms(r[3]), lastMs: ms(r[4]), lastRh: r[5],
    minRh: r[6], minMs: ms(r[7]), minTempC: r[8], minDewC: r[9], maxRh: r[10], maxMs: ms(r[11]), maxTempC: r[12], maxDewC: r[13],
    spanMs: r[14], spanRhMs: r[15], maxSpanMs: r[16],
  }));
}

/**
 * Applied hygrometer checks of the instruments that logged in this chamber (an offset belongs to
 * the instrument, lab-wide), newest first like listHygrometerChecks.
 */
export async function loadAppliedChecks({ client }: Snapshot, { labId, chamberId }: { labId: string; chamberId: string }) {
  const res = await client.query<{
    id: string; instrument: string; offsetRhPercent: number; checkedAt: Date; saltId: string; applied: boolean; readingRhPercent: number; referenceRhPercent: number; slope: number | null;
  }>({
    text: `select h.id, h.instrument, h.offset_rh_percent as "offsetRhPercent", h.checked_at as "checkedAt", h.salt_id as "saltId", h.applied,
                  h.reading_rh_percent as "readingRhPercent", h.reference_rh_percent as "referenceRhPercent", h.slope
           from hygrometer_checks h
           where h.lab_id = $1 and h.applied
             and exists (select 1 from reading_blocks rb where rb.lab_id = $1 and rb.chamber_id = $2 and rb.width_hours = 6 and rb.instrument = h.instrument)
           order by h.checked_at desc`,
    values: [labId, chamberId],
  });
  return res.rows;
}

/** A chamber and a time span, both ends inclusive. */
export type ChamberSpan = { chamberId: string; fromMs: number; toMs: number };

/**
 * Readings of several chambers, each over its span, with only what exposure needs, ordered by time
 * then instrument like loadRows: one query, one index range scan per chamber, read once for every
 * placement of the chamber (sliced by time in memory; stored times are whole milliseconds, as Dates
 * write them). One array per span, in the order given.
 */
export async function loadExposureRows({ client }: Snapshot, { labId, spans }: { labId: string; spans: readonly ChamberSpan[] }) {
  const out = spans.map(() => [] as { takenAt: Date; rhRaw: number; tempC: number | null; instrument: string }[]);
  if (spans.length === 0) return out;
  const res = await client.query<[string, number, number, number | null, string]>({
    text: `select k.ord, r.t, r.rh_percent, r.temp_c, r.instrument
           from unnest($2::uuid[], $3::timestamptz[], $4::timestamptz[]) with ordinality as k(chamber, lo, hi, ord)
           cross join lateral (
             select date_part('epoch', date_trunc('milliseconds', taken_at)) * 1000 as t, taken_at, rh_percent, temp_c, instrument
             from readings
             where lab_id = $1 and chamber_id = k.chamber and taken_at >= k.lo and taken_at <= k.hi
             offset 0
           ) r
           order by k.ord, r.taken_at, r.instrument collate "C"`,
    values: spanValues(labId, spans),
    rowMode: "array",
  });
  for (const r of res.rows) out[Number(r[0]) - 1].push({ takenAt: new Date(Math.round(r[1])), rhRaw: Number(r[2]), tempC: r[3], instrument: r[4] });
  return out;
}

/** What the gap limit needs of a block summary (lib/climate/readings-reduce gapLimitMinutes). */
export type BlockSpanRow = Pick<BlockRow, "blockStartMs" | "instrument" | "n" | "firstMs" | "lastMs">;

/**
 * Block summaries of one width for several chambers, each for block starts within its span (both
 * inclusive), with only their counts and first and last times; ordered by block. One array per span.
 */
export async function loadBlockSpans({ client }: Snapshot, { labId, widthMs, spans }: { labId: string; widthMs: number; spans: readonly ChamberSpan[] }) {
  const out = spans.map(() => [] as BlockSpanRow[]);
  if (spans.length === 0) return out;
  const res = await client.query<[string, number, string, number, number, number]>({
    text: `select k.ord, date_part('epoch', b.block_start) * 1000, b.instrument, b.n,
                  date_part('epoch', date_trunc('milliseconds', b.first_at)) * 1000, date_part('epoch', date_trunc('milliseconds', b.last_at)) * 1000
           from unnest($2::uuid[], $3::timestamptz[], $4::timestamptz[]) with ordinality as k(chamber, lo, hi, ord)
           cross join lateral (
             select block_start, instrument, n, first_at, last_at from reading_blocks
             where lab_id = $1 and chamber_id = k.chamber and width_hours = $5 and block_start >= k.lo and block_start <= k.hi
             offset 0
           ) b
           order by k.ord, b.block_start`,
    values: [...spanValues(labId, spans), widthMs / HOUR_MS],
    rowMode: "array",
  });
  const ms = Math.round;
  for (const r of res.rows) out[Number(r[0]) - 1].push({ blockStartMs: ms(r[1]), instrument: r[2], n: r[3], firstMs: ms(r[4]), lastMs: ms(r[5]) });
  return out;
}

function spanValues(labId: string, spans: readonly ChamberSpan[]) {
  const at = (ms: number) => new Date(ms).toISOString();
  return [labId, spans.map((s) => s.chamberId), spans.map((s) => at(s.fromMs)), spans.map((s) => at(s.toMs))];
}
