import { describe, expect, it } from "vitest";
import { importCsv } from "@/lib/climate/csv-import";
import { previewCsv } from "@/lib/climate/csv-preview";
import { parseLoggerNumber } from "@/lib/climate/csv-rows";

const iso = (d: Date) => d.toISOString();

describe("importCsv", () => {
  it("reads a plain comma file with offsets in the timestamps", () => {
    const text = "time,rh,temp\n2025-03-01T10:00:00Z,45.2,21.5\n2025-03-01T10:10:00+01:00,46,21.4\n";
    const result = importCsv(text, { mapping: { time: "time", rhPercent: "rh", tempC: "temp" } });
    expect(result.errors).toEqual([]);
    expect(result.rows.map((r) => iso(r.takenAt))).toEqual(["2025-03-01T09:10:00.000Z", "2025-03-01T10:00:00.000Z"]);
    expect(result.rows[1]).toMatchObject({ rhPercent: 45.2, tempC: 21.5 });
  });

  it("reports malformed rows with their physical line numbers", () => {
    const text = [
      "Logger: demo unit", // 1 (skipped metadata)
      "Serial: 0001", // 2 (skipped metadata)
      "Time,RH (%),Temp (°C)", // 3 header
      "2025-03-01 10:00,45.0,21.0", // 4 ok
      ",,", // 5 empty cells only, ignored
      "2025-03-01 10:10,abc,21.0", // 6 RH not a number
      "2025-03-01 10:20,120,21.0", // 7 RH out of range
      "yesterday,45,21", // 8 bad time
      "2025-03-01 10:30,45", // 9 temp empty column missing
      "2025-03-01 10:40,45,95", // 10 temp out of range
      '"2025-03-01 10:50",45,"21', // 11 unclosed quote swallows the rest
    ].join("\r\n");
    const result = importCsv(text, { skipLines: 2, mapping: { time: "time", rhPercent: "RH (%)", tempC: "Temp (°C)" } });
    expect(result.rows).toHaveLength(1);
    expect(result.errors.map((e) => e.line)).toEqual([6, 7, 8, 9, 10, 11]);
    expect(result.errors[0].message).toMatch(/RH "abc" is not a number/);
    expect(result.errors[1].message).toMatch(/outside 0–100/);
    expect(result.errors[2].message).toMatch(/not a recognised date/);
    expect(result.errors[3].message).toMatch(/at least 3 columns/);
    expect(result.errors[4].message).toMatch(/outside −60…90 °C/);
  });

  it("keeps line numbers right after a quoted field that spans lines", () => {
    const text = 'time,rh,note\n2025-03-01 10:00,40,"two\nlines"\n\n2025-03-01 10:10,x,ok\n,,\n2025-03-01 10:20,y, \n';
    const result = importCsv(text, { mapping: { time: 0, rhPercent: 1 } });
    expect(result.rows).toHaveLength(1);
    expect(result.errors).toEqual([
      { line: 5, message: 'RH "x" is not a number' },
      { line: 7, message: 'RH "y" is not a number' },
    ]);
  });

  it("converts °F to °C", () => {
    const text = "time,rh,temp,dew\n2025-03-01 10:00,50,68,50\n2025-03-01 10:10,50,32,14\n";
    const result = importCsv(text, { temperatureUnit: "F", mapping: { time: "time", rhPercent: "rh", tempC: "temp", dewPointC: "dew" } });
    // (68 − 32) × 5/9 = 20 °C; (50 − 32) × 5/9 = 10 °C; 32 °F = 0 °C; 14 °F = −10 °C
    expect(result.rows[0].tempC).toBeCloseTo(20, 12);
    expect(result.rows[0].dewPointC).toBeCloseTo(10, 12);
    expect(result.rows[1].tempC).toBeCloseTo(0, 12);
    expect(result.rows[1].dewPointC).toBeCloseTo(-10, 12);
  });

  it("reads semicolon files with decimal commas, detecting the delimiter", () => {
    const text = "Zeit;Feuchte;Temp\n2025-03-01 10:00;45,5;21,5\n2025-03-01 10:10;46;-1,25\n";
    const result = importCsv(text, { mapping: { time: 0, rhPercent: 1, tempC: 2 } });
    expect(result.errors).toEqual([]);
    expect(result.rows.map((r) => [r.rhPercent, r.tempC])).toEqual([
      [45.5, 21.5],
      [46, -1.25],
    ]);
    expect(parseLoggerNumber("21,5 °C")).toBe(21.5);
    expect(parseLoggerNumber("45 %")).toBe(45);
    expect(parseLoggerNumber("")).toBeNull();
    expect(parseLoggerNumber("1,2,3")).toBeNaN();
  });

  it("reads tab-separated files without a header by column index", () => {
    const text = "2025-03-01 10:00\t45\t20\n2025-03-01 10:05\t46\t\n";
    const result = importCsv(text, { hasHeader: false, delimiter: "\t", mapping: { time: 0, rhPercent: 1, tempC: 2 } });
    expect(result.rows.map((r) => r.tempC)).toEqual([20, null]);
  });

  it("applies the time zone to timestamps without an offset", () => {
    const text = "time,rh\n2025-07-01 12:00,40\n2025-01-15 12:00,41\n";
    const berlin = importCsv(text, { timeZone: "Europe/Berlin", mapping: { time: "time", rhPercent: "rh" } });
    // Berlin is UTC+2 in summer (CEST) and UTC+1 in winter (CET)
    expect(berlin.rows.map((r) => iso(r.takenAt))).toEqual(["2025-01-15T11:00:00.000Z", "2025-07-01T10:00:00.000Z"]);

    const fixed = importCsv(text, { timeZone: "-05:30", mapping: { time: "time", rhPercent: "rh" } });
    expect(iso(fixed.rows[1].takenAt)).toBe("2025-07-01T17:30:00.000Z");

    const utc = importCsv(text, { mapping: { time: "time", rhPercent: "rh" } });
    expect(iso(utc.rows[1].takenAt)).toBe("2025-07-01T12:00:00.000Z");

    // 02:30 on 30 March 2025 does not exist in Berlin (clocks jump 02:00 → 03:00): moved forward
    const gap = importCsv("time,rh\n2025-03-30 02:30,40\n", { timeZone: "Europe/Berlin", mapping: { time: "time", rhPercent: "rh" } });
    expect(iso(gap.rows[0].takenAt)).toBe("2025-03-30T01:30:00.000Z");

    // A southern-hemisphere zone: Sydney is UTC+11 in January (AEDT)
    const sydney = importCsv("time,rh\n2025-01-15 12:00,40\n", { timeZone: "Australia/Sydney", mapping: { time: "time", rhPercent: "rh" } });
    expect(iso(sydney.rows[0].takenAt)).toBe("2025-01-15T01:00:00.000Z");

    expect(() => importCsv(text, { timeZone: "Mars/Olympus", mapping: { time: "time", rhPercent: "rh" } })).toThrow(RangeError);
  });

  it("reads day-first dates and split date/time columns", () => {
    const dmy = importCsv("date,rh\n01/07/2025 12:00:30,40\n31/12/2025 23:59,41\n", { dateFormat: "dmy", mapping: { time: "date", rhPercent: "rh" } });
    expect(dmy.rows.map((r) => iso(r.takenAt))).toEqual(["2025-07-01T12:00:30.000Z", "2025-12-31T23:59:00.000Z"]);

    const mdyRejected = importCsv("date,rh\n31/12/2025 23:59,41\n", { dateFormat: "mdy", mapping: { time: "date", rhPercent: "rh" } });
    expect(mdyRejected.errors).toHaveLength(1);

    const split = importCsv("Date,Time,RH\n2025-07-01,12:00,40\n", { mapping: { time: ["Date", "Time"], rhPercent: "RH" } });
    expect(iso(split.rows[0].takenAt)).toBe("2025-07-01T12:00:00.000Z");
  });

  it("skips and counts duplicate timestamps, and sorts the rows", () => {
    const text = "time,rh\n2025-03-01 10:10,41\n2025-03-01 10:00,40\n2025-03-01 10:10,42\n2025-03-01T10:00:00Z,43\n";
    const result = importCsv(text, { mapping: { time: "time", rhPercent: "rh" } });
    expect(result.duplicatesSkipped).toBe(2);
    expect(result.rows.map((r) => r.rhPercent)).toEqual([40, 41]);
  });

  it("reports a missing header column at the header line", () => {
    const result = importCsv("x\n\ntime,humidity\n2025-03-01 10:00,40\n", { skipLines: 2, mapping: { time: "time", rhPercent: "rh" } });
    expect(result.rows).toEqual([]);
    expect(result.errors).toEqual([{ line: 3, message: 'RH: column "rh" is not in the header' }]);
  });

  // How long this takes is measured by bench/climate-parse-bench.ts (npm run bench -- climate), not here.
  it("imports 100,000 rows with decimal commas and a zone, every one of them", () => {
    const lines = ["Date Time;RH %;Temp °C"];
    const start = Date.UTC(2025, 0, 1);
    for (let i = 0; i < 100_000; i++) {
      const d = new Date(start + i * 60_000).toISOString().slice(0, 16).replace("T", " ");
      lines.push(`${d};${(40 + (i % 100) / 10).toFixed(1).replace(".", ",")};21,5`);
    }
    const result = importCsv(lines.join("\n"), { timeZone: "Europe/London", mapping: { time: 0, rhPercent: 1, tempC: 2 } });
    expect(result.rows).toHaveLength(100_000);
    expect(result.errors).toEqual([]);
    // 2025-01-01 00:00 London (GMT) is 00:00Z; the last row, 99,999 minutes later, is in GMT too.
    expect(result.rows[0]).toMatchObject({ rhPercent: 40, tempC: 21.5 });
    expect(result.rows[0].takenAt.toISOString()).toBe("2025-01-01T00:00:00.000Z");
    expect(result.rows[99_999].takenAt.toISOString()).toBe(new Date(start + 99_999 * 60_000).toISOString());
    expect(result.rows[99_999].rhPercent).toBe(49.9);
  });
});

describe("previewCsv", () => {
  it("guesses the delimiter, header line, mapping, unit and date format", () => {
    const text = [
      "Logger export",
      "Device;Demo logger 7",
      "Date Time;Humidity (%rh);Temperature (°F);Dew Point (°F)",
      "01/03/2025 10:00;45,0;70,1;48,0",
      "01/03/2025 10:10;45,5;70,0;48,2",
    ].join("\n");
    const preview = previewCsv(text, 5);
    expect(preview.delimiter).toBe(";");
    expect(preview.guessedSkipLines).toBe(2);
    expect(preview.header).toEqual(["Date Time", "Humidity (%rh)", "Temperature (°F)", "Dew Point (°F)"]);
    expect(preview.guessedMapping).toEqual({ time: "Date Time", rhPercent: "Humidity (%rh)", tempC: "Temperature (°F)", dewPointC: "Dew Point (°F)" });
    expect(preview.guessedTemperatureUnit).toBe("F");
    expect(preview.guessedDateFormat).toBe("dmy");
    expect(preview.rows).toHaveLength(3);
    expect(preview.lines).toEqual([3, 4, 5]);

    const imported = importCsv(text, {
      skipLines: preview.guessedSkipLines,
      delimiter: preview.delimiter,
      mapping: preview.guessedMapping as { time: string; rhPercent: string },
      temperatureUnit: preview.guessedTemperatureUnit,
      dateFormat: preview.guessedDateFormat ?? "auto",
    });
    expect(imported.errors).toEqual([]);
    expect(imported.rows[0].tempC).toBeCloseTo(((70.1 - 32) * 5) / 9, 9);
  });

  it("guesses split date and time columns and comma files", () => {
    const preview = previewCsv("date,time,rh,temperature\n2025-03-01,10:00,40,20\n", 2);
    expect(preview.delimiter).toBe(",");
    expect(preview.guessedMapping.time).toEqual(["date", "time"]);
    expect(preview.guessedTemperatureUnit).toBe("C");
    expect(preview.guessedDateFormat).toBe("ymd");
  });
});
