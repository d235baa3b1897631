// A storage location against the lab's storage rules: the rule it takes (the strictest of its objects'),
// time in rule over 7, 30 and 365 days, each exceedance and the objects at risk. Plain terms only.
import Link from "next/link";
import type { LocationRuleStatus } from "@/db/queries/location-status";
import { NEED_LABELS } from "@/lib/collection/rule-status";
import { formatDate, formatDateTime } from "@/lib/format";

const pct = (f: number | null) => (f === null ? "no readings" : `${(f * 100).toFixed(1)} %`);
const hours = (minutes: number) => (minutes >= 2880 ? `${(minutes / 1440).toFixed(1)} d` : `${(minutes / 60).toFixed(1)} h`);

/** Exceedances and objects at risk listed unless the page asks for every one (a link on the page does). */
export const RULE_LIST_SHOWN = 20;

/**
 * fullListsHref: where the page lists every exceedance and object at risk; null when it already does.
 */
export function RuleStatusSection({ status, fullListsHref }: { status: LocationRuleStatus; fullListsHref: string | null }) {
  const { rule, windows, exceedances, atRisk, needs } = status;
  const limit = fullListsHref === null ? Infinity : RULE_LIST_SHOWN;
  const more = (total: number, says: string) =>
    total > limit && fullListsHref !== null ? (
      <p className="text-xs mt-1">{says} <Link className="link" href={fullListsHref}>Show all</Link></p>
    ) : null;
  return (
    <section className="panel p-4 space-y-3" aria-labelledby="rule-h" data-testid="location-rule">
      <h2 id="rule-h" className="font-semibold">Storage rule</h2>
      {status.objectCount === 0 ? (
        <p className="text-sm muted">No objects are kept here, so no storage rule applies. Move objects here on the <Link className="link" href="/collection">Collection</Link> page.</p>
      ) : !rule ? (
        <p className="text-sm">
          None of the {status.objectCount} object(s) here has a storage rule for its material and treatments. Accept one from a trial or
          enter one with its source on <Link className="link" href="/storage-rules">Storage rules</Link>.
        </p>
      ) : (
        <>
          <p className="text-sm">
            <strong>Keep below {rule.thresholdRhPercent.toFixed(1)} %RH</strong>: the strictest rule of the objects kept here. {rule.statement}{" "}
            <span className="muted">
              Source: {rule.origin === "entered" ? `${rule.source} (${rule.sourceDate})` : `accepted from ${rule.sourceTrialIds.length} trial(s)`}, version {rule.version}.
            </span>
          </p>
          {needs.length > 0 && (
            <ul className="flex flex-wrap gap-2 text-sm" aria-label="Needs attention">
              {needs.map((n) => <li key={n} className="rounded-full border border-[var(--line)] px-2 py-0.5">{NEED_LABELS[n]}</li>)}
            </ul>
          )}
          <table className="data" aria-label="Time in rule">
            <thead><tr><th scope="col">last</th><th scope="col" className="text-right!">time in rule</th><th scope="col" className="text-right!">out of rule</th><th scope="col" className="text-right!">logged time</th><th scope="col" className="text-right!">exceedances</th></tr></thead>
            <tbody>
              {windows.map((w) => (
                <tr key={w.days}>
                  <th scope="row">{w.days} days</th>
                  <td className="text-right tabular-nums">{pct(w.fractionInRule)}</td>
                  <td className="text-right tabular-nums">{hours(w.outOfRuleMinutes)}</td>
                  <td className="text-right tabular-nums">{hours(w.countedMinutes)}</td>
                  <td className="text-right tabular-nums">{w.exceedanceCount}</td>
                </tr>
              ))}
            </tbody>
          </table>
          <p className="text-xs muted">
            Each reading holds until the next; gaps longer than the logger&apos;s usual interval allows are not counted, as on a chamber&apos;s
            climate record, with the same hygrometer corrections (drift between checks, the nearest check held before the first and after the last).
            Counted at {formatDateTime(status.computedAt)}: again every 10 minutes, and at once when a reading above the rule arrives or past
            readings, checks, upkeep, objects or rules change.
          </p>
          {exceedances.length > 0 ? (
            <details>
              <summary className="cursor-pointer text-sm font-medium">Exceedances, last 365 days ({exceedances.length})</summary>
              <table className="data mt-2" aria-label="Exceedances">
                <thead><tr><th scope="col">start</th><th scope="col" className="text-right!">duration</th><th scope="col" className="text-right!">peak</th><th scope="col">ended</th></tr></thead>
                <tbody>
                  {exceedances.slice(0, limit).map((e) => (
                    <tr key={e.start.toISOString()}>
                      <td>{formatDateTime(e.start)}</td>
                      <td className="text-right tabular-nums">{hours(e.durationMinutes)}</td>
                      <td className="text-right tabular-nums">{e.worstRhPercent.toFixed(1)} %RH</td>
                      <td>{e.openEnded ? "not yet (or the record stops)" : formatDateTime(e.end)}</td>
                    </tr>
                  ))}
                </tbody>
              </table>
              {more(exceedances.length, `The latest ${RULE_LIST_SHOWN} of ${exceedances.length} exceedances shown.`)}
            </details>
          ) : <p className="text-sm">No exceedance in the last 365 days of readings.</p>}
        </>
      )}
      {atRisk.length > 0 && (
        <div className="space-y-1">
          <h3 className="text-sm font-semibold">Objects at risk</h3>
          <p className="text-xs muted">Their own rule was exceeded in the last 30 days (highest {status.max30dRhPercent?.toFixed(1)} %RH).</p>
          <ul className="text-sm list-disc pl-5" aria-label="Objects at risk">
            {atRisk.slice(0, limit).map((o) => <li key={o.id}><Link className="link" href={`/specimens/${o.id}`}>{o.label}</Link>{o.accessionNumber ? ` (${o.accessionNumber})` : ""}: keep below {o.thresholdRhPercent.toFixed(1)} %RH</li>)}
          </ul>
          {more(atRisk.length, `${RULE_LIST_SHOWN} of ${atRisk.length} objects at risk shown.`)}
        </div>
      )}
      {status.desiccantDueAt && (
        <p className="text-sm">
          Desiccant projected to be spent {status.desiccantDueAt.getTime() < Date.now() ? "since" : "by"} {formatDate(status.desiccantDueAt)}, counting its capacity at
          {rule ? ` the rule's ${rule.thresholdRhPercent.toFixed(1)} %RH` : " the target RH"} (see Desiccant below).
        </p>
      )}
    </section>
  );
}
