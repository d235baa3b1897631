import Link from "next/link";
import { listStorageRules } from "@/db/queries/storage-rules";
import { listTreatments } from "@/db/queries/treatments";
import { can } from "@/lib/auth/permissions";
import { MATERIAL_CLASSES } from "@/lib/validation/specimens";
import { EnterRuleForm } from "@/components/storage-rules/enter-rule-form";
import { labPage } from "@/lib/auth/page";
import { formatHorizon } from "@/lib/analysis/humidity-sentences";
import { MATERIAL_LABELS } from "@/lib/analysis/groups";
import { formatDateTime } from "@/lib/format";
import { EmptyState } from "@/components/ui/empty-state";

export const metadata = { title: "Storage rules" };

const rh = (v: number | null) => (v === null ? "…" : v.toFixed(0));

export default async function StorageRulesPage() {
  const ctx = await labPage("/storage-rules");
  const mayEnter = can(ctx.role, "storageRules.accept");
  const [rules, treatments] = await Promise.all([
    listStorageRules({ labId: ctx.labId, userId: ctx.userId }),
    mayEnter ? listTreatments({ labId: ctx.labId }) : null,
  ]);
  const current = rules.filter((r) => r.current);
  const history = rules.filter((r) => !r.current);
  return (
    <div className="space-y-5">
      <div className="space-y-1">
        <h1 className="text-2xl font-semibold">Storage rules</h1>
        <p className="text-sm muted max-w-3xl">
          The humidity each material class should be kept below, as the lab accepted it from its trials or entered it from a
          named source. A new rule for the same material and treatment becomes a new version; earlier versions stay listed below.
        </p>
      </div>
      {current.length === 0 ? (
        <EmptyState
          text="No storage rule yet. A rule comes from a trial's humidity response (open a trial with specimens at three or more humidity levels, choose the share rusted and the horizon, and the lead accepts the threshold), or the lead enters one below with its source."
          action={{ href: "/trials", label: "Open the trials" }}
        />
      ) : (
        <section className="panel p-4 overflow-x-auto" aria-labelledby="current-h">
          <h2 id="current-h" className="font-semibold mb-2">In force</h2>
          <table className="data">
            <thead>
              <tr>
                <th scope="col">Material class</th><th scope="col">Treatment</th><th scope="col" className="text-right!">keep below</th>
                <th scope="col">95 % CI</th><th scope="col">criterion</th><th scope="col">source</th><th scope="col">accepted</th>
              </tr>
            </thead>
            <tbody>
              {current.map((r) => (
                <tr key={r.id}>
                  <th scope="row" className="font-medium! text-left text-(color:--ink)!">{MATERIAL_LABELS[r.materialClass] ?? r.materialClass}</th>
                  <td>{r.treatmentName}</td>
                  <td className="text-right tabular-nums font-medium">{r.thresholdRhPercent.toFixed(0)} %RH</td>
                  <td className="tabular-nums">{r.origin === "trial" ? <>{rh(r.lower95RhPercent)}–{rh(r.upper95RhPercent)} %RH</> : "—"}</td>
                  <td>{r.shareRusted !== null && r.horizonDays !== null ? <>fewer than {+(r.shareRusted * 100).toFixed(1)} % rusted in {formatHorizon(r.horizonDays)}</> : "as the source states"}</td>
                  <td>
                    {r.origin === "entered"
                      ? <>{r.source} <span className="muted">({r.sourceDate})</span></>
                      : r.sourceTrialIds.map((id, i) => <Link key={id} className="link" href={`/trials/${id}/humidity`}>{i === 0 ? "trial" : `, trial ${i + 1}`}</Link>)}
                  </td>
                  <td>v{r.version}, {formatDateTime(r.acceptedAt)}, {r.acceptedByName ?? "a former member"}{r.note && <p className="text-xs muted">{r.note}</p>}</td>
                </tr>
              ))}
            </tbody>
          </table>
          {current.some((r) => r.origin === "trial") && <p className="text-xs muted mt-2 max-w-3xl">Trial rules: {current.find((r) => r.origin === "trial")!.method}</p>}
        </section>
      )}
      {mayEnter && treatments && (
        <section className="panel p-4 space-y-2" aria-labelledby="enter-h">
          <h2 id="enter-h" className="font-semibold">Enter a rule from a source</h2>
          <p className="text-sm muted max-w-3xl">
            For a material the lab has not tested, or a limit it adopts from a publication, a standard or its own decision. Name the
            source and its date; the rule then applies to storage locations like an accepted one.
          </p>
          <EnterRuleForm
            materials={MATERIAL_CLASSES.map((m) => ({ value: m, label: MATERIAL_LABELS[m] ?? m }))}
            treatments={treatments.rows.map((t) => ({ value: t.id, label: t.name }))}
          />
        </section>
      )}
      {history.length > 0 && (
        <details className="panel p-4">
          <summary className="font-semibold cursor-pointer">Earlier versions ({history.length})</summary>
          <ul className="mt-2 text-sm space-y-1">
            {history.map((r) => (
              <li key={r.id}>v{r.version}: {r.statement} <span className="muted">Accepted {formatDateTime(r.acceptedAt)}, superseded {r.supersededAt ? formatDateTime(r.supersededAt) : ""}.</span></li>
            ))}
          </ul>
        </details>
      )}
    </div>
  );
}
