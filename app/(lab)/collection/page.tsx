import Link from "next/link";
import { MoveObjectForm, NewLocationForm, ReparentLocationForm } from "@/components/collection/collection-forms";
import { EmptyState } from "@/components/ui/empty-state";
import { listLocationTree } from "@/db/queries/locations";
import { listMembers } from "@/db/queries/memberships";
import { currentPlaces } from "@/db/queries/object-locations";
import { listSpecimens } from "@/db/queries/specimens";
import { labPage } from "@/lib/auth/page";
import { can } from "@/lib/auth/permissions";
import { flattenTree, LOCATION_KIND_LABELS, MICROCLIMATE_LABELS, microclimateOf, type LocationKind } from "@/lib/collection/locations";
import type { ChamberKind } from "@/lib/humidity/hazards";
import { BLIND_HIDDEN } from "@/lib/trials/access";
import { CHLORIDE_STATE_LABELS, MATERIAL_CLASS_LABELS } from "@/lib/validation/specimens";

export const metadata = { title: "Collection" };
const PAGE_SIZE = 100;

export default async function CollectionPage({ searchParams }: { searchParams: Promise<Record<string, string | undefined>> }) {
  const ctx = await labPage("/collection");
  const sp = await searchParams;
  const q = (sp.q ?? "").trim().slice(0, 100) || undefined;
  const [register, { places, hidden, inTrial }, members] = await Promise.all([
    listSpecimens({ labId: ctx.labId, q, sort: "label", dir: "asc", page: 1, pageSize: PAGE_SIZE }),
    currentPlaces(ctx),
    listMembers({ labId: ctx.labId }),
  ]);
  const tree = await listLocationTree({ labId: ctx.labId, hidden });
  const flat = flattenTree(tree);
  const locationOptions = flat.map((n) => ({ value: n.id, label: n.path.join(" / ") }));
  return (
    <div className="space-y-6">
      <div className="flex flex-wrap items-center gap-3">
        <h1 className="text-2xl font-semibold">Collection</h1>
        <Link className="btn ml-auto" href="/collection/overview">Overview by need</Link>
        <a className="btn-quiet" href="/api/specimens/export">Export register (CSV)</a>
        {can(ctx.role, "specimens.write") && <Link className="btn-quiet" href="/specimens/import">Import register (CSV)</Link>}
      </div>
      <p className="text-sm muted max-w-3xl">
        Storage locations — rooms, cabinets, cases, drawers and sealed boxes — and the objects in them. Each location keeps its climate record on its
        chamber page: typed readings, logger files and posts, desiccant upkeep and hygrometer checks.
      </p>
      <section aria-labelledby="tree-h" className="space-y-2">
        <h2 id="tree-h" className="text-lg font-semibold">Locations</h2>
        {flat.length === 0 ? <EmptyState text="No storage locations yet." /> : (
          <ul className="text-sm space-y-1" data-testid="location-tree">
            {flat.map((n) => {
              const micro = microclimateOf(n.kind as ChamberKind);
              return (
                <li key={n.id} style={{ paddingLeft: `${n.depth * 1.5}rem` }}>
                  <Link className="link font-medium" href={`/chambers/${n.id}`}>{n.name}</Link>{" "}
                  <span className="muted">{LOCATION_KIND_LABELS[n.locationKind as LocationKind]}{micro ? ` · ${MICROCLIMATE_LABELS[micro]}` : ""} · {n.setpointRhPercent} ± {n.toleranceRhPercent} %RH
                    {n.keeperName ? ` · keeper ${n.keeperName}` : ""} · {n.objectCount} object{n.objectCount === 1 ? "" : "s"}</span>
                </li>
              );
            })}
          </ul>
        )}
      </section>
      {can(ctx.role, "collection.move") && locationOptions.length > 0 && (
        <section aria-labelledby="move-h" className="space-y-2">
          <h2 id="move-h" className="text-lg font-semibold">Record a move</h2>
          <MoveObjectForm objects={register.rows.filter((r) => !hidden.has(r.id) && !inTrial.has(r.id)).map((r) => ({ value: r.id, label: r.accessionNumber ? `${r.label} (${r.accessionNumber})` : r.label }))} locations={locationOptions} />
        </section>
      )}
      <section aria-labelledby="reg-h" className="space-y-2">
        <h2 id="reg-h" className="text-lg font-semibold">Object register</h2>
        <form method="get" role="search" aria-label="Search the register" className="flex items-end gap-3">
          <label className="text-sm">Label or find contains <input name="q" defaultValue={q ?? ""} className="field" /></label>
          <button className="btn-quiet">Search</button>
        </form>
        {register.total > PAGE_SIZE && <p className="text-sm muted">Showing the first {PAGE_SIZE} of {register.total}; search to narrow.</p>}
        <table className="text-sm w-full">
          <thead><tr className="text-left"><th>Label</th><th>Accession</th><th>Material</th><th>Chloride</th><th>Where now</th></tr></thead>
          <tbody>
            {register.rows.map((r) => {
              const place = places.get(r.id);
              return (
                <tr key={r.id}>
                  <td><Link className="link" href={`/specimens/${r.id}`}>{r.label}</Link></td>
                  <td>{r.accessionNumber ?? ""}</td>
                  <td>{MATERIAL_CLASS_LABELS[r.materialClass]}</td>
                  <td>{CHLORIDE_STATE_LABELS[r.chlorideState]}</td>
                  <td>{hidden.has(r.id) ? <span className="muted">{BLIND_HIDDEN}</span> : inTrial.has(r.id) ? `In the running trial “${inTrial.get(r.id)}”`
                    : place ? `${place.path} (since ${place.fromAt.toISOString().slice(0, 10)})` : <span className="muted">not recorded</span>}</td>
                </tr>
              );
            })}
          </tbody>
        </table>
      </section>
      {can(ctx.role, "chambers.write") && (
        <section aria-labelledby="new-h" className="space-y-2">
          <h2 id="new-h" className="text-lg font-semibold">New location</h2>
          <NewLocationForm parents={locationOptions} members={members.map((m) => ({ value: m.userId, label: m.name }))} />
          {locationOptions.length > 1 && (<>
            <h2 className="text-lg font-semibold pt-4">Move a location in the tree</h2>
            <ReparentLocationForm locations={locationOptions} />
          </>)}
        </section>
      )}
    </div>
  );
}
