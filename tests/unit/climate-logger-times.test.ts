// Logger files with 12-hour times and a zone stated in the header: what is read, what is refused
// and what the messages say.
import { describe, expect, it } from "vitest";
import { importCsv } from "@/lib/climate/csv-import";
import { previewCsv } from "@/lib/climate/csv-preview";
import { formatOffsetMinutes, zoneDisagreement, zoneDisagreementMessage, zoneFromHeader, zoneFromHeaderCell } from "@/lib/climate/header-zone";
import { guessDateFormat, readLocalTime } from "@/lib/climate/time-parse";

const iso = (d: Date) => d.toISOString();
const wall = (text: string) => {
  const r = readLocalTime(text, "auto");
  if (!r.ok) throw new Error(r.problem);
  return r.value.wallMs;
};

describe("12-hour times", () => {
  it("reads AM/PM with 12 AM as midnight and 12 PM as noon", () => {
    const read = (text: string) => {
      const r = readLocalTime(text, "mdy");
      return r.ok ? new Date(r.value.wallMs).toISOString() : r.problem;
    };
    // 12 AM = 00:00 and 12 PM = 12:00: the en-US 12-hour convention (Unicode CLDR "h" pattern, 1–12), from memory;
    // the round trip below checks it against the runtime's own CLDR data.
    expect(read("11/18/2026 12:00:00 AM")).toBe("2026-11-18T00:00:00.000Z");
    expect(read("11/18/2026 12:30 AM")).toBe("2026-11-18T00:30:00.000Z");
    expect(read("11/18/2026 12:00:00 PM")).toBe("2026-11-18T12:00:00.000Z");
    expect(read("11/18/2026 1:05 PM")).toBe("2026-11-18T13:05:00.000Z");
    expect(read("11/18/2026 11:59:59 pm")).toBe("2026-11-18T23:59:59.000Z");
    expect(read("11/18/2026 9:15 a.m.")).toBe("2026-11-18T09:15:00.000Z");
  });

  it("reads back every minute of a day as written by Intl's en-US 12-hour format", () => {
    // Intl.DateTimeFormat("en-US", { hour12: true }) writes "11/18/2026, 1:05:00 PM" (ICU/CLDR data in Node).
    const fmt = new Intl.DateTimeFormat("en-US", { timeZone: "UTC", hour12: true, year: "numeric", month: "2-digit", day: "2-digit", hour: "numeric", minute: "2-digit", second: "2-digit" });
    const start = Date.UTC(2026, 10, 18);
    const misread: string[] = [];
    for (let minute = 0; minute < 24 * 60; minute++) {
      const ms = start + minute * 60_000;
      const text = fmt.format(new Date(ms)).replace(",", "").replace(/\u202f/g, " ");
      const r = readLocalTime(text, "mdy");
      if (!r.ok || r.value.wallMs !== ms) misread.push(text);
    }
    expect(misread).toEqual([]);
  });

  it("says which part of a time failed and what was expected", () => {
    const problem = (text: string, format: Parameters<typeof readLocalTime>[1] = "auto") => {
      const r = readLocalTime(text, format);
      return r.ok ? "read" : r.problem;
    };
    expect(problem("11/18/2026 13:00:00 PM", "mdy")).toBe('"13:00:00 PM" — hour 13 with PM; expected 1–12 before AM/PM');
    expect(problem("11/18/2026 0:30 AM", "mdy")).toBe('"0:30 AM" — hour 0 with AM; expected 1–12 before AM/PM');
    expect(problem("2026-11-18 24:00")).toBe('"24:00" — hour 24; expected 0–23 (or 1–12 followed by AM/PM)');
    expect(problem("2026-11-18 10:61")).toBe('"10:61" — minute 61; expected 00–59');
    expect(problem("11/18/2026 1:05 PM", "dmy")).toBe('"11/18/2026" — month 18 read as day/month/year; expected 1–12 (is the date order month/day/year?)');
    // 2026 is not a leap year (Gregorian rule: divisible by 4, not by 100 unless by 400)
    expect(problem("29/02/2026 10:00", "dmy")).toBe('"29/02/2026" — day 29 read as day/month/year; February 2026 has 28 days');
    expect(problem("2026-11-18 10:00", "mdy")).toBe('"2026-11-18" has the year first, but the date order is set to month/day/year');
    expect(problem("18/11/2026 10:00", "ymd")).toBe('"18/11/2026" has the year last, but the date order is set to year-month-day');
    expect(problem("2026-11-18 10:00 +15:00")).toBe('"+15:00" — offset out of range; expected −14:00 to +14:00');
    expect(problem("yesterday")).toMatch(/^"yesterday" is not a recognised date and time; expected e\.g\. /);
  });

  it("guesses month/day order when a later row has a day above 12", () => {
    expect(guessDateFormat(["11/05/2026 1:00 PM", "11/18/2026 1:00 PM"])).toBe("mdy");
    expect(guessDateFormat(["11/05/2026 13:00", "18/11/2026 13:00"])).toBe("dmy");
    expect(guessDateFormat(["11/05/2026 13:00"])).toBe("dmy");
    expect(guessDateFormat(["no date here"])).toBeNull();
  });
});

describe("zone stated in the header", () => {
  it("reads an offset or a zone name from the time column's header", () => {
    expect(zoneFromHeaderCell("Date Time, GMT+01:00")).toEqual({ zone: "+01:00", label: "GMT+01:00", header: "Date Time, GMT+01:00" });
    expect(zoneFromHeaderCell("Time (UTC-05:00)")).toMatchObject({ zone: "-05:00", label: "UTC-05:00" });
    expect(zoneFromHeaderCell("Timestamp (Europe/Berlin)")).toMatchObject({ zone: "Europe/Berlin" });
    expect(zoneFromHeaderCell("Zeit (UTC+5:30)")).toMatchObject({ zone: "+05:30" });
    expect(zoneFromHeaderCell("Time (UTC)")).toMatchObject({ zone: "UTC" });
    expect(zoneFromHeaderCell("Time (+02:00)")).toMatchObject({ zone: "+02:00" });
    // IANA "Etc/GMT+1" is one hour *behind* UTC (POSIX sign convention, tz database etcetera file)
    expect(zoneFromHeaderCell("Time (Etc/GMT+1)")).toMatchObject({ zone: "Etc/GMT+1" });
    expect(zoneFromHeaderCell("Date/Time")).toBeNull();
    expect(zoneFromHeaderCell("Time (UTC+15:00)")).toBeNull();
    expect(zoneFromHeader(["Date", "Time (UTC-05:00)"])).toMatchObject({ zone: "-05:00" });
  });

  it("tells when the chosen zone gives another offset at the file's times", () => {
    // Central European Time is UTC+1, summer time UTC+2 from the last Sunday of March to the last
    // Sunday of October (Directive 2000/84/EC, Art. 2–3).
    const january = wall("2026-01-15 12:00");
    const july = wall("2026-07-15 12:00");
    expect(zoneDisagreement("+01:00", "Europe/Berlin", [january])).toBeNull();
    expect(zoneDisagreement("+01:00", "Europe/Berlin", [january, july])).toEqual({ wallMs: july, statedMinutes: 60, chosenMinutes: 120 });
    expect(zoneDisagreement("Europe/Berlin", "Europe/Paris", [january, july])).toBeNull();
    expect(zoneDisagreement("+01:00", "Mars/Olympus", [january])).toBeNull(); // the import reports the unknown zone itself
    const d = zoneDisagreement("-05:00", "UTC", [january]);
    expect(d).toEqual({ wallMs: january, statedMinutes: -300, chosenMinutes: 0 });
    expect(zoneDisagreementMessage({ zone: "-05:00", label: "UTC-05:00", header: "Time (UTC-05:00)" }, "UTC", d!)).toBe(
      "The file's header states UTC-05:00 (UTC\u221205:00), but the zone chosen, UTC, is UTC±00:00 at 2026-01-15 12:00 on the file's clock: readings would be stored 5 h earlier than the header says. Choose the zone the logger was set to.",
    );
    expect(formatOffsetMinutes(330)).toBe("+05:30");
  });
});

describe("importing such files", () => {
  const file = [
    "Plot Title: jar 4", // 1
    '"#","Date Time, GMT+01:00","Temp, °C","RH, %"', // 2 header
    '1,"11/18/2026 12:00:00 AM",20.5,44.0', // 3
    '2,"11/18/2026 1:05 PM",20.7,45.5', // 4
    '3,"11/18/2026 12:00:00 PM",20.6,45.0', // 5
  ].join("\n");
  const mapping = { time: "Date Time, GMT+01:00", rhPercent: "RH, %", tempC: "Temp, °C" };

  it("previews the stated zone and month/day order, and imports in that zone by default", () => {
    const preview = previewCsv(file, 10);
    expect(preview.guessedSkipLines).toBe(1);
    expect(preview.guessedMapping).toEqual(mapping);
    expect(preview.guessedDateFormat).toBe("mdy");
    expect(preview.statedZone).toEqual({ zone: "+01:00", label: "GMT+01:00", header: "Date Time, GMT+01:00" });

    const result = importCsv(file, { skipLines: 1, dateFormat: "mdy", mapping });
    expect(result.errors).toEqual([]);
    expect(result.statedZone?.zone).toBe("+01:00");
    expect(result.zoneDisagreement).toBeNull();
    // 00:00, 12:00 and 13:05 at UTC+01:00 are 23:00 the day before, 11:00 and 12:05 UTC
    expect(result.rows.map((r) => iso(r.takenAt))).toEqual(["2026-11-17T23:00:00.000Z", "2026-11-18T11:00:00.000Z", "2026-11-18T12:05:00.000Z"]);
  });

  it("uses the zone the user chose and reports the first row where it disagrees with the header", () => {
    const result = importCsv(file, { skipLines: 1, dateFormat: "mdy", mapping, timeZone: "Europe/London" });
    // London is on GMT (UTC+0) in November (UK Summer Time Order 2002: summer time ends the last Sunday of October)
    expect(result.rows.map((r) => iso(r.takenAt))[0]).toBe("2026-11-18T00:00:00.000Z");
    expect(result.zoneDisagreement).toEqual({ line: 3, wallMs: wall("2026-11-18 00:00"), statedMinutes: 60, chosenMinutes: 0 });
    const agreeing = importCsv(file, { skipLines: 1, dateFormat: "mdy", mapping, timeZone: "Europe/Paris" });
    expect(agreeing.zoneDisagreement).toBeNull(); // Paris is UTC+1 in November too
  });

  it("names the line, the column and the failing token", () => {
    const bad = file.replace('"11/18/2026 1:05 PM"', '"11/18/2026 13:00:00 PM"');
    const result = importCsv(bad, { skipLines: 1, dateFormat: "mdy", mapping });
    expect(result.errors).toEqual([{ line: 4, message: 'Column "Date Time, GMT+01:00": "13:00:00 PM" — hour 13 with PM; expected 1–12 before AM/PM' }]);
    const noHeader = importCsv("11/18/2026 13:00 PM,40\n", { hasHeader: false, dateFormat: "mdy", mapping: { time: 0, rhPercent: 1 } });
    expect(noHeader.errors).toEqual([{ line: 1, message: 'Column 1: "13:00 PM" — hour 13 with PM; expected 1–12 before AM/PM' }]);
    const split = importCsv("Date,Time,RH\n2026-11-18,1:05 XM,40\n", { mapping: { time: ["Date", "Time"], rhPercent: "RH" } });
    expect(split.errors[0].message).toMatch(/^Columns "Date" and "Time": "2026-11-18 1:05 XM" is not a recognised date and time/);
  });
});
