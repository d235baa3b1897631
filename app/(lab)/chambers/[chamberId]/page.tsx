import Link from "next/link";
import { isStorageKind, LOCATION_KIND_LABELS } from "@/lib/collection/locations";
import { desiccantStatus } from "@/lib/humidity/desiccant-status";
import { getChamber, lastInspectionOpening, listChamberInstruments, listDesiccantEvents, listHygrometerChecks } from "@/db/queries/chambers";
import { listReadingImports, listRecentReadings } from "@/db/queries/readings";
import { getChamberSeriesReused } from "@/db/queries/readings-series";
import { getLocationRuleStatus } from "@/db/queries/location-status";
import { listMembers } from "@/db/queries/memberships";
import { RuleStatusSection } from "@/components/collection/rule-status-section";
import { LocationSettingsForm } from "@/components/collection/collection-forms";
import { labPage } from "@/lib/auth/page";
import { can } from "@/lib/auth/permissions";
import { formatDateTime } from "@/lib/format";
import { DESICCANTS, type DesiccantKind, INDICATOR_LABELS, isIndicatorKind } from "@/lib/humidity/desiccant";
import { WATER_CHAMBER_NOTE } from "@/lib/humidity/hazards";
import { isSaltId, SALTS } from "@/lib/humidity/salts";
import { CHAMBER_KIND_LABELS, parsePeriod, PERIODS, saltAt } from "@/lib/validation/chambers";
import { ClimateChartLoader } from "@/components/chambers/chart-loaders";
import { packChart } from "@/lib/climate/chart-pack";
import { ClimateSummary } from "@/components/chambers/climate-summary";
import { DesiccantSection, HygrometerSection, ReadingsSection } from "@/components/chambers/chamber-sections";
import { HazardPanel } from "@/components/chambers/hazard-panel";
import { EmptyState } from "@/components/ui/empty-state";
import { NavSection } from "@/components/shell/nav-section";
import { orNotFound } from "@/lib/auth/not-found";

export const metadata = { title: "Chamber" };

const PERIOD_LABELS = { "7d": "7 days", "30d": "30 days", all: "All" } as const;

export default async function ChamberPage({ params, searchParams }: { params: Promise<{ chamberId: string }>; searchParams: Promise<Record<string, string | undefined>> }) {
  const ctx = await labPage("/chambers/[chamberId]");
  const [{ chamberId }, sp] = await Promise.all([params, searchParams]);
  const chamber = await getChamber({ labId: ctx.labId, chamberId }).catch(orNotFound);
  const period = parsePeriod(sp.period);
  const isDesiccant = chamber.kind === "desiccant";
  const [events, opening, instruments, recent, imports] = await Promise.all([
    isDesiccant ? listDesiccantEvents({ labId: ctx.labId, chamberId }) : Promise.resolve([]),
    lastInspectionOpening({ labId: ctx.labId, chamberId }),
    listChamberInstruments({ labId: ctx.labId, chamberId }),
    listRecentReadings({ labId: ctx.labId, chamberId, limit: 8 }),
    listReadingImports({ labId: ctx.labId, chamberId, limit: 5 }),
  ]);
  const status = isDesiccant ? desiccantStatus(chamber, events) : null;
  const storage = isStorageKind(chamber.locationKind);
  const [ruleStatus, members] = storage
    ? await Promise.all([getLocationRuleStatus({ labId: ctx.labId, userId: ctx.userId, locationId: chamber.id }), listMembers({ labId: ctx.labId })])
    : [null, []];
  const settleFrom = [
    ...(status?.lastCharge ? [{ label: `the last desiccant ${status.lastCharge.kind === "charged" ? "charge" : status.lastCharge.kind === "regenerated" ? "regeneration" : "replacement"}`, at: status.lastCharge.at }] : []),
    ...(opening ? [{ label: "the last inspection opening", at: opening }] : []),
  ];
  const series = await getChamberSeriesReused({ labId: ctx.labId, chamber, period, settleFrom });
  const checks = await listHygrometerChecks({ labId: ctx.labId, instruments: [...new Set([...instruments, ...series.instruments])] });
  const salt = chamber.saltId && isSaltId(chamber.saltId) ? chamber.saltId : null;
  const eq = salt ? saltAt(salt, chamber.nominalTempC) : null;
  const desiccantKind = chamber.desiccantKind && chamber.desiccantKind in DESICCANTS ? (chamber.desiccantKind as DesiccantKind) : null;
  return (
    <div className="space-y-6">
      {isStorageKind(chamber.locationKind) ? (
        <p className="text-sm"><NavSection href="/collection" /><Link className="link" href="/collection">Collection</Link> / {LOCATION_KIND_LABELS[chamber.locationKind]} {chamber.name}</p>
      ) : (
        <p className="text-sm"><Link className="link" href="/chambers">Chambers</Link> / {chamber.name}</p>
      )}
      {sp.saved && <p role="status" className="text-sm rounded-md px-3 py-2 bg-verdigris-50 text-verdigris-800">Chamber {sp.saved === "created" ? "saved" : "updated"}.</p>}
      <div className="flex flex-wrap items-center gap-3">
        <h1 className="text-2xl font-semibold">{chamber.name}</h1>
        {chamber.archivedAt && <span className="text-xs rounded-full border border-[var(--line)] px-2 py-0.5">archived</span>}
        <div className="ml-auto flex flex-wrap gap-2">
          {can(ctx.role, "readings.write") && !chamber.archivedAt && <Link className="btn-quiet" href={`/chambers/${chamber.id}/import`}>Import logger CSV</Link>}
          {can(ctx.role, "chambers.tokens") && <Link className="btn-quiet" href={`/chambers/${chamber.id}/tokens`}>Logger tokens</Link>}
          {can(ctx.role, "chambers.write") && <Link className="btn" href={`/chambers/${chamber.id}/edit`}>Edit</Link>}
        </div>
      </div>
      <div className="grid gap-6 lg:grid-cols-3 items-start">
        <section className="panel p-4 space-y-2 lg:col-span-2" aria-labelledby="target-h">
          <h2 id="target-h" className="font-semibold">Target</h2>
          <p className="text-lg" data-testid="chamber-target"><strong>{chamber.setpointRhPercent} ± {chamber.toleranceRhPercent} %RH</strong> at {chamber.nominalTempC} °C</p>
          <p className="text-sm">
            {CHAMBER_KIND_LABELS[chamber.kind]}
            {salt ? ` · ${SALTS[salt].displayName}` : ""}
            {desiccantKind ? ` · ${DESICCANTS[desiccantKind].displayName}${chamber.desiccantMassG != null ? `, ${chamber.desiccantMassG} g` : ""}${chamber.desiccantIndicator && isIndicatorKind(chamber.desiccantIndicator) && chamber.desiccantIndicator !== "none" ? `, ${INDICATOR_LABELS[chamber.desiccantIndicator]}` : ""}` : ""}
            {chamber.volumeL != null ? ` · ${chamber.volumeL} L` : ""}
          </p>
          {salt && eq && (eq.ok ? (
            <p className="text-sm">Equilibrium at {chamber.nominalTempC} °C: {eq.rhPercent.toFixed(1)} ± {eq.uncertaintyPercent} %RH ({SALTS[salt].source}; valid {SALTS[salt].rangeC[0]}–{SALTS[salt].rangeC[1]} °C).</p>
          ) : <p className="text-sm text-rust-600">{eq.message}</p>)}
          {chamber.kind === "water" && <p className="text-sm">About 100 %RH. {WATER_CHAMBER_NOTE}</p>}
          {chamber.notes && <p className="text-sm muted whitespace-pre-wrap">{chamber.notes}</p>}
        </section>
        <HazardPanel kind={chamber.kind} salt={salt} desiccant={desiccantKind} indicator={chamber.desiccantIndicator && isIndicatorKind(chamber.desiccantIndicator) ? chamber.desiccantIndicator : null} />
      </div>

      <section className="panel p-4 space-y-3" aria-labelledby="climate-h">
        <div className="flex flex-wrap items-center gap-3">
          <h2 id="climate-h" className="font-semibold">Climate record</h2>
          <nav aria-label="Period" className="ml-auto flex gap-1">
            {PERIODS.map((p) => (
              <Link key={p} href={`/chambers/${chamber.id}?period=${p}`} aria-current={p === period ? "page" : undefined}
                className={`rounded-md px-3 py-1 text-sm border border-[var(--line)] ${p === period ? "bg-verdigris-600 text-white" : ""}`}>{PERIOD_LABELS[p]}</Link>
            ))}
          </nav>
        </div>
        {series.count === 0 ? (
          <EmptyState text={`No readings in this period${series.from ? ` (since ${formatDateTime(series.from)})` : ""}. Type one in below, import a logger CSV, or let a logger post with a token.`} />
        ) : (
          <div className="grid gap-4 lg:grid-cols-[minmax(0,2fr)_minmax(0,1fr)]">
            <figure className="space-y-1" data-testid="climate-chart">
              <ClimateChartLoader packed={packChart(series.points)} band={series.band} corrected={series.offsets.length > 0} />
              <figcaption className="text-xs muted">
                RH (top) against the target band {series.band.minRh.toFixed(1)}–{series.band.maxRh.toFixed(1)} %RH (shaded), temperature and dew point (bottom),
                {series.firstAt && series.lastAt ? ` ${formatDateTime(series.firstAt)} to ${formatDateTime(series.lastAt)}.` : ""}
              </figcaption>
            </figure>
            <ClimateSummary series={series} />
          </div>
        )}
      </section>

      {ruleStatus && <RuleStatusSection status={ruleStatus} fullListsHref={sp.full === "1" ? null : `/chambers/${chamber.id}?period=${period}&full=1#rule-h`} />}
      {storage && (
        <section className="panel p-4 space-y-3" aria-labelledby="location-h">
          <h2 id="location-h" className="font-semibold">Location</h2>
          <p className="text-sm" data-testid="location-settings">
            {LOCATION_KIND_LABELS[chamber.locationKind]} · keeper {ruleStatus?.keeperName ?? "none (the keeper of the place it sits in gets the e-mail)"} · e-mail after {chamber.alertAfterHours} h out of rule
          </p>
          {can(ctx.role, "chambers.write") && (
            <LocationSettingsForm members={members.map((m) => ({ value: m.userId, label: m.name }))}
              location={{ id: chamber.id, name: chamber.name, locationKind: chamber.locationKind, keeperId: chamber.keeperId, alertAfterHours: chamber.alertAfterHours }} />
          )}
        </section>
      )}
      {isDesiccant && status && <DesiccantSection chamber={chamber} status={status} events={events} canWrite={can(ctx.role, "desiccant.write")} />}
      <ReadingsSection chamber={chamber} recent={recent} imports={imports} instruments={instruments} canWrite={can(ctx.role, "readings.write")} />
      <HygrometerSection chamber={chamber} checks={checks} instruments={instruments} canWrite={can(ctx.role, "readings.write")} />
    </div>
  );
}
