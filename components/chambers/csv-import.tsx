"use client";
// Logger CSV import: preview and column mapping in the browser, a dry run of the same parser for
// instant per-line errors, then one upload whose answer streams progress while the server parses
// again (the check that counts) and stores everything in one transaction — or nothing.
import Link from "next/link";
import { useEffect, useMemo, useState } from "react";
import { importCsv, type CsvImportError, type CsvImportResult } from "@/lib/climate/csv-import";
import { previewCsv } from "@/lib/climate/csv-preview";
import { zoneDisagreement, zoneDisagreementMessage, zoneFromHeader } from "@/lib/climate/header-zone";
import { readLocalTime } from "@/lib/climate/time-parse";
import { CsvMappingFields, type MappingState } from "./csv-mapping-fields";
import { useBrowserZone } from "./form-controls";

type Phase = { kind: "idle" } | { kind: "uploading"; pct: number } | { kind: "parsing" } | { kind: "storing"; done: number; total: number }
  | { kind: "done"; stored: number; dupFile: number; dupExisting: number } | { kind: "failed"; errors: CsvImportError[]; total: number };

const MAX_FILE_BYTES = 9.5 * 1024 * 1024; // as the import route

type Check = { rows: number; dup: number; errors: CsvImportError[]; total: number; first?: Date; last?: Date; zoneWarning?: string };

const idx = (header: string[] | null, ref: unknown): string => (typeof ref === "string" && header ? String(Math.max(-1, header.indexOf(ref))) : typeof ref === "number" ? String(ref) : "-1");

export function CsvImport({ chamberId, instruments }: { chamberId: string; instruments: string[] }) {
  const zone = useBrowserZone();
  const [file, setFile] = useState<File | null>(null);
  const [text, setText] = useState("");
  const [m, setM] = useState<MappingState | null>(null);
  const [check, setCheck] = useState<Check | null>(null);
  const [phase, setPhase] = useState<Phase>({ kind: "idle" });

  const [zoneFromFile, setZoneFromFile] = useState(false);
  useEffect(() => setM((cur) => (cur && cur.timeZone === "UTC" && !zoneFromFile ? { ...cur, timeZone: zone } : cur)), [zone, zoneFromFile]);

  const preview = useMemo(() => (text && m ? previewCsv(text, 12, { skipLines: m.skipLines, delimiter: m.delimiter }) : null), [text, m]);
  // The zone the header of the chosen time column(s) states, and whether the chosen zone agrees with it
  // at the times shown (the check repeats this over every row).
  const stated = useMemo(() => {
    if (!m || !preview || !m.hasHeader) return null;
    const header = preview.rows[0] ?? [];
    return zoneFromHeader([m.timeCol, m.timeCol2].filter((c) => c !== "-1").map((c) => header[Number(c)] ?? ""));
  }, [m, preview]);
  const previewZoneWarning = useMemo(() => {
    if (!m || !preview || !stated) return null;
    const chosen = m.timeZone.trim() || "UTC";
    const cols = [m.timeCol, m.timeCol2].filter((c) => c !== "-1").map(Number);
    const walls = preview.rows.slice(m.hasHeader ? 1 : 0).flatMap((r) => {
      const t = readLocalTime(cols.map((c) => (r[c] ?? "").trim()).join(" "), m.dateFormat);
      return t.ok && t.value.offsetMinutes === null ? [t.value.wallMs] : [];
    });
    const d = zoneDisagreement(stated.zone, chosen, walls.length > 0 ? walls : [Date.now()]);
    return d ? zoneDisagreementMessage(stated, chosen, d) : null;
  }, [m, preview, stated]);

  async function onFile(f: File | null) {
    setFile(f);
    setCheck(null);
    setPhase({ kind: "idle" });
    if (!f) return setText("");
    if (f.size > MAX_FILE_BYTES) {
      setText("");
      setM(null);
      setPhase({ kind: "failed", errors: [{ line: 0, message: `The file is ${(f.size / 1048576).toFixed(1)} MB; files up to 9.5 MB can be imported at once. Split it (keeping the header in each part) and import the parts.` }], total: 1 });
      return;
    }
    const t = await f.text();
    setText(t);
    const p = previewCsv(t, 12);
    const time = p.guessedMapping.time;
    setZoneFromFile(p.statedZone !== null);
    setM({
      delimiter: p.delimiter, skipLines: p.guessedSkipLines, hasHeader: p.header !== null,
      timeCol: Array.isArray(time) ? idx(p.header, time[0]) : idx(p.header, time), timeCol2: Array.isArray(time) ? idx(p.header, time[1]) : "-1",
      rhCol: idx(p.header, p.guessedMapping.rhPercent), tempCol: idx(p.header, p.guessedMapping.tempC), dewCol: idx(p.header, p.guessedMapping.dewPointC),
      temperatureUnit: p.guessedTemperatureUnit, dateFormat: p.guessedDateFormat ?? "auto", timeZone: p.statedZone?.zone ?? zone, instrument: instruments[0] ?? "logger",
    });
  }

  function options(s: MappingState) {
    const time = s.timeCol2 !== "-1" ? [Number(s.timeCol), Number(s.timeCol2)] : Number(s.timeCol);
    return {
      instrument: s.instrument.trim(), delimiter: s.delimiter, skipLines: s.skipLines, hasHeader: s.hasHeader, timeZone: s.timeZone.trim() || "UTC",
      temperatureUnit: s.temperatureUnit, dateFormat: s.dateFormat,
      mapping: { time, rhPercent: Number(s.rhCol), tempC: s.tempCol === "-1" ? null : Number(s.tempCol), dewPointC: s.dewCol === "-1" ? null : Number(s.dewCol) },
    };
  }

  const mappingProblem = !m ? null : m.timeCol === "-1" ? "Choose the time column." : m.rhCol === "-1" ? "Choose the RH column." : !m.instrument.trim() ? "Name the instrument." : null;

  function runCheck() {
    if (!m || mappingProblem) return;
    try {
      const opts = options(m);
      const r = importCsv(text, opts as Parameters<typeof importCsv>[1]);
      setCheck({ rows: r.rows.length, dup: r.duplicatesSkipped, errors: r.errors.slice(0, 200), total: r.errors.length, first: r.rows[0]?.takenAt, last: r.rows[r.rows.length - 1]?.takenAt, zoneWarning: fileZoneWarning(r, opts.timeZone) });
    } catch (err) {
      setCheck({ rows: 0, dup: 0, errors: [{ line: 0, message: (err as Error).message }], total: 1 });
    }
  }

  function upload() {
    if (!file || !m) return;
    const fd = new FormData();
    fd.set("file", file);
    fd.set("options", JSON.stringify(options(m)));
    const xhr = new XMLHttpRequest();
    let seen = 0;
    const handleLines = () => {
      const lines = xhr.responseText.slice(seen).split("\n");
      const complete = lines.slice(0, -1);
      seen += complete.reduce((n, l) => n + l.length + 1, 0);
      for (const line of complete) {
        if (!line.trim()) continue;
        const msg = JSON.parse(line);
        if (msg.type === "progress") setPhase(msg.phase === "parsing" ? { kind: "parsing" } : { kind: "storing", done: msg.done, total: msg.total });
        else if (msg.type === "result") {
          setPhase(msg.ok ? { kind: "done", stored: msg.stored, dupFile: msg.duplicatesInFile, dupExisting: msg.duplicatesExisting } : { kind: "failed", errors: msg.errors, total: msg.totalErrors });
        }
      }
    };
    xhr.upload.onprogress = (e) => e.lengthComputable && setPhase({ kind: "uploading", pct: Math.round((100 * e.loaded) / e.total) });
    xhr.onprogress = handleLines;
    xhr.onload = () => {
      if (xhr.status >= 400) {
        let message = `The server refused the import (HTTP ${xhr.status}).`;
        try {
          const body = JSON.parse(xhr.responseText);
          message = [body.error?.message, ...Object.values(body.error?.fields ?? {}).flat()].filter(Boolean).join(" ");
        } catch { /* keep the generic message */ }
        setPhase({ kind: "failed", errors: [{ line: 0, message }], total: 1 });
      } else handleLines();
    };
    xhr.onerror = () => setPhase({ kind: "failed", errors: [{ line: 0, message: "The upload was interrupted. Nothing was stored; try again." }], total: 1 });
    setPhase({ kind: "uploading", pct: 0 });
    xhr.open("POST", `/api/chambers/${chamberId}/imports`);
    xhr.send(fd);
  }

  const busy = phase.kind === "uploading" || phase.kind === "parsing" || phase.kind === "storing";
  const pct = phase.kind === "uploading" ? phase.pct * 0.3 : phase.kind === "parsing" ? 35 : phase.kind === "storing" ? 35 + (65 * phase.done) / phase.total : phase.kind === "done" ? 100 : 0;

  return (
    <div className="space-y-4">
      <div className="space-y-1">
        <label htmlFor="csv-file" className="block text-sm font-medium">Logger file (CSV or tab-separated text)</label>
        <input id="csv-file" type="file" accept=".csv,.txt,.tsv,text/csv,text/plain" className="field" onChange={(e) => onFile(e.target.files?.[0] ?? null)} disabled={busy} />
      </div>
      {m && preview && (
        <>
          <section className="panel p-3 overflow-x-auto" aria-labelledby="preview-h">
            <h2 id="preview-h" className="text-sm font-semibold mb-2">First lines as read</h2>
            <table className="data text-xs font-mono">
              <tbody>
                {preview.rows.map((cells, i) => (
                  <tr key={i} className={i === 0 && m.hasHeader ? "font-semibold" : ""}>
                    <th scope="row" className="muted">{preview.lines[i]}</th>
                    {cells.map((c, j) => <td key={j}>{c}</td>)}
                  </tr>
                ))}
              </tbody>
            </table>
            <p className="text-sm mt-2" data-testid="stated-zone">
              {stated ? <>The header states the times are in <strong>{stated.label}</strong> (“{stated.header}”); that zone is the default below.</>
                : "The header states no time zone: times without an offset are read in the zone chosen below."}
            </p>
          </section>
          <CsvMappingFields m={m} setM={(next) => { setM(next); setCheck(null); }} header={m.hasHeader ? preview.rows[0] ?? null : null} columnCount={Math.max(0, ...preview.rows.map((r) => r.length))} text={text} />
          {mappingProblem && <p className="text-sm text-rust-600" role="alert">{mappingProblem}</p>}
          {(check ? check.zoneWarning : previewZoneWarning) && <p className="text-sm text-rust-700 panel p-3" role="alert" data-testid="zone-warning">{check ? check.zoneWarning : previewZoneWarning}</p>}
          <div className="flex flex-wrap gap-3">
            <button type="button" className="btn-quiet" onClick={runCheck} disabled={busy || !!mappingProblem}>Check the file</button>
            <button type="button" className="btn" onClick={upload} disabled={busy || !!mappingProblem || !check || check.total > 0 || check.rows === 0}>
              {check && check.total === 0 && check.rows > 0 ? `Import ${check.rows.toLocaleString("en")} readings` : "Import"}
            </button>
          </div>
          {check && <CheckResult check={check} />}
        </>
      )}
      {phase.kind !== "idle" && (
        <section className="panel p-3 space-y-2" aria-live="polite">
          <progress className="w-full" max={100} value={pct} aria-label="Import progress" />
          <p className="text-sm" role={phase.kind === "failed" ? "alert" : "status"}>
            {phase.kind === "uploading" && `Uploading… ${phase.pct} %`}
            {phase.kind === "parsing" && "Checking every row on the server…"}
            {phase.kind === "storing" && `Storing… ${phase.done.toLocaleString("en")} of ${phase.total.toLocaleString("en")}`}
            {phase.kind === "done" && <>Imported {phase.stored.toLocaleString("en")} readings; skipped {phase.dupFile.toLocaleString("en")} duplicates within the file and {phase.dupExisting.toLocaleString("en")} already stored. <Link className="link" href={`/chambers/${chamberId}`}>Back to the chamber</Link></>}
            {phase.kind === "failed" && `Nothing was stored: ${phase.total.toLocaleString("en")} problem(s).`}
          </p>
          {phase.kind === "failed" && <ErrorList errors={phase.errors} total={phase.total} />}
        </section>
      )}
    </div>
  );
}

/** The header-versus-chosen zone warning over every row of the file, naming the first row affected. */
function fileZoneWarning(r: CsvImportResult, chosen: string): string | undefined {
  if (!r.statedZone || !r.zoneDisagreement) return undefined;
  return `Line ${r.zoneDisagreement.line}: ${zoneDisagreementMessage(r.statedZone, chosen, r.zoneDisagreement)}`;
}

function CheckResult({ check }: { check: Check }) {
  if (check.total > 0) {
    return (
      <section className="panel p-3 space-y-2" aria-labelledby="check-h">
        <h2 id="check-h" className="text-sm font-semibold text-rust-600">{check.total.toLocaleString("en")} row(s) need fixing; nothing will be imported until every row reads cleanly</h2>
        <ErrorList errors={check.errors} total={check.total} />
      </section>
    );
  }
  return (
    <p className="text-sm" role="status">
      {check.rows.toLocaleString("en")} readings{check.first && check.last ? ` from ${check.first.toISOString().slice(0, 16).replace("T", " ")} to ${check.last.toISOString().slice(0, 16).replace("T", " ")} UTC` : ""}; {check.dup.toLocaleString("en")} duplicate time(s) in the file will be skipped. Readings already stored for this instrument are skipped too.
    </p>
  );
}

function ErrorList({ errors, total }: { errors: CsvImportError[]; total: number }) {
  return (
    <>
      <ul className="text-sm font-mono max-h-64 overflow-auto space-y-0.5">
        {errors.map((e, i) => <li key={i}>{errorText(e)}</li>)}
      </ul>
      {total > errors.length && <p className="text-xs muted">…and {(total - errors.length).toLocaleString("en")} more.</p>}
    </>
  );
}

/** "Line 4, column "Date Time": …" when the message names a column, else "Line 4: …". */
function errorText(e: CsvImportError): string {
  if (e.line <= 0) return e.message;
  return /^Columns? /.test(e.message) ? `Line ${e.line}, c${e.message.slice(1)}` : `Line ${e.line}: ${e.message}`;
}
