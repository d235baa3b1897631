// Server-rendered sections of the chamber page: desiccant upkeep, hygrometer checks, recent
// readings and imports. Forms inside are client components; permissions decide whether they show.
import type { Chamber, DesiccantEvent, HygrometerCheck } from "@/db/queries/chambers";
import type { DesiccantStatus } from "@/lib/humidity/desiccant-status";
import { formatDate, formatDateTime, formatNumber } from "@/lib/format";
import { REMIND_DAYS_BEFORE } from "@/lib/validation/chambers";
import { EmptyState } from "@/components/ui/empty-state";
import { DesiccantBudgetView } from "./desiccant-budget-view";
import { ApplyOffsetToggle, DesiccantEventForm, HygrometerCheckForm, ReadingForm } from "./record-forms";

const dateOrDash = (d: Date | null) => (d ? (d.getTime() - Date.now() > 3650 * 86_400_000 ? "over 10 years away" : formatDate(d)) : "—");

export function DesiccantSection({ chamber, status, events, canWrite }: { chamber: Chamber; status: DesiccantStatus<DesiccantEvent>; events: DesiccantEvent[]; canWrite: boolean }) {
  return (
    <section className="panel p-4 space-y-4" aria-labelledby="desiccant-h">
      <h2 id="desiccant-h" className="font-semibold">Desiccant upkeep</h2>
      <div className="grid gap-4 md:grid-cols-2">
        <div>
          <h3 className="text-sm font-semibold mb-1">Water budget</h3>
          <DesiccantBudgetView budget={status.budget} missing={status.missing} />
        </div>
        <div>
          <h3 className="text-sm font-semibold mb-1">Projected exhaustion</h3>
          <dl className="grid grid-cols-[auto_1fr] gap-x-4 gap-y-1 text-sm">
            <dt className="muted">Last charge / regeneration</dt><dd>{status.lastCharge ? formatDateTime(status.lastCharge.at) : "none logged — log the charge to get a date"}</dd>
            <dt className="muted">From the water budget</dt><dd>{dateOrDash(status.budgetExhaustionAt)}</dd>
            <dt className="muted">From weighing</dt>
            <dd>{status.measured ? <>+{status.measured.gainG.toFixed(1)} g in {status.measured.days.toFixed(0)} days ({(status.measured.gPerDay * 1000).toFixed(0)} mg/day) → {dateOrDash(status.measured.exhaustionAt)}</> : "weigh the charge when charging and again later to get one"}</dd>
            <dt className="muted">Reminder goes by</dt>
            <dd data-testid="exhaustion-date" className={status.exhaustionAt && status.exhaustionAt.getTime() < Date.now() ? "text-rust-600 font-medium" : "font-medium"}>
              {status.exhaustionAt ? `${formatDate(status.exhaustionAt)}${status.exhaustionAt.getTime() < Date.now() ? " — passed: regenerate or check the jar" : ""}` : "—"}
            </dd>
          </dl>
          <p className="text-xs muted mt-2">The earlier projection counts. Technicians and leads get an e-mail {REMIND_DAYS_BEFORE} days before it.</p>
        </div>
      </div>
      <div className="grid gap-4 md:grid-cols-2">
        <div>
          <h3 className="text-sm font-semibold mb-2">Charge and regeneration log</h3>
          {events.length === 0 ? (
            <EmptyState text="Nothing logged yet. Log the charge now: the exhaustion date is counted from it." />
          ) : (
            <table className="data">
              <thead><tr><th>When</th><th>What</th><th>Mass (g)</th><th>Notes</th></tr></thead>
              <tbody>
                {events.map((e) => (
                  <tr key={e.id}><td className="whitespace-nowrap">{formatDateTime(e.at)}</td><td>{e.kind}</td><td>{formatNumber(e.massG, 1)}</td><td>{e.notes}</td></tr>
                ))}
              </tbody>
            </table>
          )}
        </div>
        {canWrite && (
          <div>
            <h3 className="text-sm font-semibold mb-2">Log upkeep</h3>
            <DesiccantEventForm chamberId={chamber.id} />
          </div>
        )}
      </div>
    </section>
  );
}

export function HygrometerSection({ chamber, checks, instruments, canWrite }: { chamber: Chamber; checks: HygrometerCheck[]; instruments: string[]; canWrite: boolean }) {
  return (
    <section className="panel p-4 space-y-4" aria-labelledby="hyg-h">
      <h2 id="hyg-h" className="font-semibold">Hygrometer checks</h2>
      <p className="text-sm muted">Put the instrument in a jar over a saturated salt, let it settle, and record what it reads. The offset (reading − salt&apos;s fixed point) can correct that instrument&apos;s readings; two salts bracketing the band give the slope as well. The chart, its band statistics and a trial&apos;s exposure figures apply the applied checks (offset, and slope when there are two salts) alike: between two checks the correction drifts linearly from one to the other, and the nearest check is held before the first and after the last.</p>
      {checks.length === 0 ? (
        <EmptyState text="No checks recorded for the instruments in this chamber." />
      ) : (
        <table className="data">
          <thead><tr><th>Checked</th><th>Instrument</th><th>Salt, °C</th><th>Read / reference</th><th>Offset</th><th>Slope</th><th>Applied</th></tr></thead>
          <tbody>
            {checks.map((c) => (
              <tr key={c.id}>
                <td className="whitespace-nowrap">{formatDateTime(c.checkedAt)}</td>
                <td>{c.instrument}</td>
                <td>{c.saltId}{c.salt2Id ? ` + ${c.salt2Id}` : ""}, {c.tempC}</td>
                <td>
                  {c.readingRhPercent.toFixed(1)} / {c.referenceRhPercent.toFixed(2)} %RH
                  {c.reading2RhPercent != null && c.reference2RhPercent != null ? <>; {c.reading2RhPercent.toFixed(1)} / {c.reference2RhPercent.toFixed(2)} %RH</> : null}
                </td>
                <td>{c.offsetRhPercent >= 0 ? "+" : "−"}{Math.abs(c.offsetRhPercent).toFixed(2)} %RH</td>
                <td>{c.slope != null ? c.slope.toFixed(3) : "—"}</td>
                <td>{canWrite ? <ApplyOffsetToggle chamberId={chamber.id} checkId={c.id} applied={c.applied} /> : c.applied ? "yes" : "no"}</td>
              </tr>
            ))}
          </tbody>
        </table>
      )}
      {canWrite && (
        <details>
          <summary className="cursor-pointer text-sm font-medium">Record a check</summary>
          <div className="mt-3 max-w-xl">
            <HygrometerCheckForm chamberId={chamber.id} instruments={instruments} defaultSalt={chamber.saltId ?? "NaCl"} defaultTempC={chamber.nominalTempC} />
          </div>
        </details>
      )}
    </section>
  );
}

type RecentReading = { id: number; takenAt: Date; rhPercent: number; tempC: number | null; instrument: string; source: string };
type ImportRow = { id: string; filename: string; rowsImported: number; duplicatesSkipped: number; instrument: string; createdAt: Date };

export function ReadingsSection({ chamber, recent, imports, instruments, canWrite }: { chamber: Chamber; recent: RecentReading[]; imports: ImportRow[]; instruments: string[]; canWrite: boolean }) {
  return (
    <section className="panel p-4 space-y-4" aria-labelledby="readings-h">
      <h2 id="readings-h" className="font-semibold">Readings</h2>
      <div className="grid gap-6 md:grid-cols-2">
        <div className="space-y-2">
          <h3 className="text-sm font-semibold">Latest</h3>
          {recent.length === 0 ? (
            <EmptyState text={canWrite ? "No readings yet. Type one in, import a logger file, or give a logger a token to post readings." : "No readings yet."} />
          ) : (
            <table className="data">
              <thead><tr><th>Time</th><th>RH (%RH)</th><th>T (°C)</th><th>Instrument</th><th>Source</th></tr></thead>
              <tbody>
                {recent.map((r) => (
                  <tr key={r.id}><td className="whitespace-nowrap">{formatDateTime(r.takenAt)}</td><td>{r.rhPercent.toFixed(1)}</td><td>{formatNumber(r.tempC, 1)}</td><td>{r.instrument}</td><td>{r.source}</td></tr>
                ))}
              </tbody>
            </table>
          )}
          {imports.length > 0 && (
            <>
              <h3 className="text-sm font-semibold pt-2">Logger file imports</h3>
              <ul className="text-sm space-y-1">
                {imports.map((i) => <li key={i.id}>{formatDateTime(i.createdAt)} · {i.filename} ({i.instrument}): {i.rowsImported.toLocaleString("en")} stored, {i.duplicatesSkipped.toLocaleString("en")} duplicates skipped</li>)}
              </ul>
            </>
          )}
        </div>
        {canWrite && !chamber.archivedAt && (
          <div className="space-y-2">
            <h3 className="text-sm font-semibold">Type in a reading</h3>
            <ReadingForm chamberId={chamber.id} instruments={instruments} />
          </div>
        )}
      </div>
    </section>
  );
}
