// Property-based fuzzing (fast-check) of the logger CSV importer. Files are built from mostly valid
// rows, then some rows are mutated (a cell replaced by hostile text, cells dropped or added, the
// whole line replaced, a row repeated), so the importer is exercised past its header and first
// checks. Properties: it never throws; it returns readings only inside the validated ranges; every
// row left valid comes back as exactly its reading; errors point only at mutated lines.
// Approach: "mutation-based fuzzing" (Zeller et al., The Fuzzing Book, chapter "Mutation-Based Fuzzing").
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { importCsv } from "@/lib/climate/csv-import";

const hostile = fc.oneof(
  fc.string({ maxLength: 40 }),
  fc.constantFrom("NaN", "Infinity", "-1e309", "1e309", "0x1F", "\u0000", "\u202e", "'; drop table readings; --", "<script>alert(1)</script>", "2026-02-30 12:00", "99,9,9", "", "101", "-0.1", "=1+1"),
  fc.double().map(String),
).map((text) => text.replace(/["\r\n]/g, "")); // quotes and line breaks would merge lines: see the last-line case

type Row = { minute: number; rhTenths: number; tempTenths: number | null; iso: boolean };
const START_MS = Date.UTC(2024, 0, 1);
const MINUTE = 60_000;

const validRow = fc.record({
  rhTenths: fc.integer({ min: 0, max: 1000 }),
  tempTenths: fc.option(fc.integer({ min: -600, max: 900 }), { freq: 8 }),
  iso: fc.boolean(),
});

type Mutation =
  | { kind: "cell"; column: number; text: string }
  | { kind: "drop"; keep: number }
  | { kind: "extra"; text: string }
  | { kind: "line"; text: string }
  | { kind: "repeat"; back: number };
const mutation: fc.Arbitrary<Mutation> = fc.oneof(
  fc.record({ kind: fc.constant("cell" as const), column: fc.integer({ min: 0, max: 2 }), text: hostile }),
  fc.record({ kind: fc.constant("drop" as const), keep: fc.integer({ min: 0, max: 1 }) }),
  fc.record({ kind: fc.constant("extra" as const), text: hostile }),
  fc.record({ kind: fc.constant("line" as const), text: hostile }),
  fc.record({ kind: fc.constant("repeat" as const), back: fc.integer({ min: 1, max: 5 }) }),
);
// Four rows in five stay as they were built.
const maybeMutated = fc.oneof({ weight: 4, arbitrary: fc.constant(null) }, { weight: 1, arbitrary: mutation });

const formatTime = (minute: number, iso: boolean) => {
  const t = new Date(START_MS + minute * MINUTE).toISOString();
  return iso ? `${t.slice(0, 19)}Z` : `${t.slice(0, 10)} ${t.slice(11, 19)}`;
};
const cellsOf = (r: Row) => [formatTime(r.minute, r.iso), (r.rhTenths / 10).toFixed(1), r.tempTenths === null ? "" : (r.tempTenths / 10).toFixed(1)];

const file = fc.record({
  delimiter: fc.constantFrom(",", ";", "\t"),
  newline: fc.constantFrom("\n", "\r\n"),
  rows: fc.array(fc.tuple(validRow, maybeMutated), { minLength: 1, maxLength: 40 }),
  gaps: fc.array(fc.integer({ min: 1, max: 90 }), { minLength: 40, maxLength: 40 }),
  unterminatedLastLine: fc.boolean(),
});

describe("logger CSV importer on mutated valid files", () => {
  it("never throws, keeps every valid row exactly, and reports problems only on mutated lines", () => {
    fc.assert(
      fc.property(file, ({ delimiter, newline, rows, gaps, unterminatedLastLine }) => {
        let minute = 0;
        const built: Row[] = rows.map(([r], i) => ({ ...r, minute: (minute += gaps[i]) }));
        const lines: string[] = ["time,rh,temp".replaceAll(",", delimiter)];
        const expected = new Map<number, { rh: number; temp: number | null; line: number }>();
        const mutatedLines = new Set<number>();
        let repeatsOfValid = 0;
        rows.forEach(([, m], i) => {
          const line = i + 2;
          const cells = cellsOf(built[i]);
          if (m === null) {
            expected.set(START_MS + built[i].minute * MINUTE, { rh: built[i].rhTenths / 10, temp: built[i].tempTenths === null ? null : built[i].tempTenths / 10, line });
            lines.push(cells.join(delimiter));
            return;
          }
          mutatedLines.add(line);
          if (m.kind === "cell") cells[m.column] = m.text;
          if (m.kind === "drop") cells.length = m.keep + 1;
          if (m.kind === "extra") cells.push(m.text);
          if (m.kind === "repeat" && i - m.back >= 0) {
            const source = i - m.back;
            if (rows[source][1] === null) repeatsOfValid++;
            lines.push(cellsOf(built[source]).join(delimiter));
            return;
          }
          lines.push(m.kind === "line" ? m.text : cells.join(delimiter));
        });
        if (unterminatedLastLine) {
          lines.push(`"${formatTime(minute + 1, true)}${delimiter}50.0`);
          mutatedLines.add(lines.length);
        }

        // The delimiter is given, as after the import preview: guessing it from a file whose rows are
        // mostly garbage is a different question (previewCsv's tests).
        const r = importCsv(lines.join(newline), { mapping: { time: 0, rhPercent: 1, tempC: 2 }, hasHeader: true, delimiter });

        for (const row of r.rows) {
          expect(Number.isFinite(row.takenAt.getTime())).toBe(true);
          expect(row.rhPercent).toBeGreaterThanOrEqual(0);
          expect(row.rhPercent).toBeLessThanOrEqual(100);
          if (row.tempC != null) expect(row.tempC).toBeGreaterThanOrEqual(-60);
          if (row.tempC != null) expect(row.tempC).toBeLessThanOrEqual(90);
        }
        const byTime = new Map(r.rows.map((row) => [row.takenAt.getTime(), row]));
        for (const [ms, want] of expected) {
          const got = byTime.get(ms);
          expect(got, `line ${want.line}`).toBeDefined();
          expect(got!.rhPercent).toBe(want.rh);
          expect(got!.tempC).toBe(want.temp);
        }
        for (const e of r.errors) {
          expect(mutatedLines.has(e.line), `error on line ${e.line}: ${e.message}`).toBe(true);
          expect(e.message.length).toBeGreaterThan(0);
        }
        expect(r.duplicatesSkipped).toBeGreaterThanOrEqual(repeatsOfValid);
        expect(r.rows.length).toBeLessThanOrEqual(lines.length - 1);
      }),
      { numRuns: 300 },
    );
  });

  it("never throws on arbitrary hostile lines under any header, unit or guessed delimiter", () => {
    const line = fc.tuple(fc.array(hostile, { maxLength: 6 }), fc.constantFrom(",", ";", "\t")).map(([cells, d]) => cells.join(d));
    const anyFile = fc.tuple(fc.constantFrom("time,rh,temp", "timestamp;humidity;temperature", ""), fc.array(line, { maxLength: 30 }), fc.constantFrom("\n", "\r\n"))
      .map(([h, rows, nl]) => [h, ...rows].join(nl));
    fc.assert(
      fc.property(anyFile, fc.constantFrom<"C" | "F">("C", "F"), (text, unit) => {
        const r = importCsv(text, { mapping: { time: 0, rhPercent: 1, tempC: 2 }, hasHeader: true, temperatureUnit: unit });
        for (const row of r.rows) {
          expect(row.rhPercent).toBeGreaterThanOrEqual(0);
          expect(row.rhPercent).toBeLessThanOrEqual(100);
          if (row.tempC != null) expect(Number.isFinite(row.tempC)).toBe(true);
        }
        for (const e of r.errors) expect(e.line).toBeGreaterThanOrEqual(1);
      }),
      { numRuns: 200 },
    );
  });
});
