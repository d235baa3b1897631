import Link from "next/link";
import { listSpecimenChoices } from "@/db/queries/specimens";
import { newSeed } from "@/db/queries/trials-allocation";
import { listAllocation, listArms, listTrialPlacements } from "@/db/queries/trials";
import { trialPage } from "@/lib/auth/page";
import { blockText } from "@/lib/allocation/allocate";
import { hideArms } from "@/lib/trials/access";
import { can } from "@/lib/auth/permissions";
import { formatDateTime } from "@/lib/format";
import { MATERIAL_CLASS_LABELS, type MaterialClass } from "@/lib/validation/specimens";
import { AllocationForm } from "@/components/trials/allocation-form";
import { MoveForm } from "@/components/trials/move-form";
import { PrintButton } from "@/components/trials/print-button";
import { SwapForm } from "@/components/trials/swap-form";
import { EmptyState } from "@/components/ui/empty-state";

export const metadata = { title: "Allocation" };

// Print: only the table and its caption (seed, blocking, date), on white, arms kept together.
const PRINT_CSS = `@media print { body > div > header, .no-print { display: none !important; } main { padding: 0 !important; max-width: none !important; }
  table.data { font-size: 9pt; } table.data tr { break-inside: avoid; } #allocation-print { border: none; } }`;

export default async function AllocationPage({ params }: { params: Promise<{ trialId: string }> }) {
  const { trialId } = await params;
  const { ctx, trial, access } = await trialPage("/trials/[trialId]/allocation", trialId);
  const blind = access.blind;
  const draft = trial.status === "draft";
  const design = can(ctx.role, "trials.write");
  const [rawRows, arms, placements, choices] = await Promise.all([
    listAllocation({ labId: ctx.labId, trialId }), listArms({ labId: ctx.labId, trialId }),
    trial.status === "draft" ? Promise.resolve([]) : listTrialPlacements({ labId: ctx.labId, trialId }),
    draft && design ? listSpecimenChoices({ labId: ctx.labId }) : Promise.resolve([]),
  ]);
  // Blind viewers get the rows without arms, in label order (the arm order alone would reveal the groups).
  const rows = hideArms(rawRows, blind);
  const assignedIds = new Set(rawRows.filter((r) => r.armId).map((r) => r.specimenId));
  const assigned = rows.filter((r) => assignedIds.has(r.specimenId));
  const leftOver = rawRows.filter((r) => !r.armId);
  const placed = hideArms(placements, blind);
  const openPlacements = placements.filter((p) => !p.toAt);
  const needed = arms.length * trial.replicatesPerArm;

  return (
    <div className="space-y-6">
      <style>{PRINT_CSS}</style>
      <div className="flex flex-wrap items-center gap-3">
        <h1 className="text-2xl font-semibold mr-auto">Allocation</h1>
        {rows.length > 0 && <PrintButton />}
      </div>
      {blind && <p className="text-sm rounded-md px-3 py-2 bg-iron-100 text-iron-800">You score this trial blind, so the arms of the specimens, the seed and who swapped what are hidden here until the trial is concluded.</p>}

      {draft && design && (
        <section className="panel p-4 space-y-3 no-print" aria-labelledby="alloc-form-h">
          <h2 id="alloc-form-h" className="font-semibold">{rows.length ? "Re-roll while the trial is a draft" : "Allocate at random"}</h2>
          {arms.length === 0 ? <EmptyState text="The trial has no arms yet. Pick chambers and treatments in the design." action={{ href: `/trials/${trial.id}/edit`, label: "Edit the design" }} /> : (
            <AllocationForm trialId={trial.id} specimens={choices} initialSelected={rawRows.map((r) => r.specimenId)} seed={trial.allocationSeed ?? newSeed()}
              blockByMaterial={trial.blockByMaterial} blockFactors={trial.blockFactors} needed={needed} allocated={rows.length > 0} />
          )}
        </section>
      )}

      <section id="allocation-print" className="panel p-4 space-y-2" aria-labelledby="table-h">
        <h2 id="table-h" className="font-semibold">{trial.title}: allocation table</h2>
        {rows.length === 0 ? (
          <EmptyState text={draft ? "Not allocated yet." : "This trial has no allocation record."} />
        ) : (
          <>
            <p className="text-sm">
              {blind ? "Seed hidden while you score blind" : <>Seed <span className="font-mono">{trial.allocationSeed}</span></>} · {blockText(trial)} · {arms.length} arms × {trial.replicatesPerArm} replicates · printed {formatDateTime(new Date())}
            </p>
            <p className="text-xs muted">Reproducible: the allocation depends only on the seed, the specimen labels and the arm labels below (lib/allocation, specimens and arms sorted by label before any random draw).</p>
            <table className="data">
              <caption className="sr-only">Specimen to arm</caption>
              <thead><tr><th scope="col">Arm (chamber / treatment)</th><th scope="col">Specimen</th><th scope="col">{trial.blockFactors.length ? "Block" : "Material class (block)"}</th><th scope="col">Note</th></tr></thead>
              <tbody>
                {assigned.map((r) => (
                  <tr key={r.specimenId}>
                    <td>{r.armLabel ?? <span className="muted">hidden</span>}</td>
                    <td className="font-medium">{r.label}</td>
                    <td>{trial.blockFactors.length ? r.blockKey : MATERIAL_CLASS_LABELS[r.materialClass as MaterialClass]}</td>
                    <td className="text-xs">{r.swapReason ? `swapped: ${r.swapReason}` : ""}</td>
                  </tr>
                ))}
              </tbody>
            </table>
            {leftOver.length > 0 && <p className="text-sm">Left over (chosen, not placed): {leftOver.map((r) => r.label).join(", ")}</p>}
          </>
        )}
      </section>

      {draft && design && rows.length > 1 && !blind && (
        <section className="panel p-4 space-y-3 no-print" aria-labelledby="swap-h">
          <h2 id="swap-h" className="font-semibold">Swap two specimens</h2>
          <p className="text-sm muted">For a practical reason only (a cracked slice, a missing label). The reason goes into the audit trail and the table above; a swap across material classes weakens the blocking.</p>
          <SwapForm trialId={trial.id} rows={rawRows.map((r) => ({ specimenId: r.specimenId, label: r.label, armLabel: r.armLabel }))} />
        </section>
      )}

      {!draft && (
        <section className="panel p-4 space-y-3" aria-labelledby="placements-h">
          <h2 id="placements-h" className="font-semibold">Placements</h2>
          <p className="text-sm muted">Where each specimen was, from when to when. A move closes one placement and opens another.</p>
          <table className="data">
            <caption className="sr-only">Placement history</caption>
            <thead><tr><th scope="col">Specimen</th><th scope="col">Chamber</th><th scope="col">Treatment</th><th scope="col">From</th><th scope="col">To</th><th scope="col">Reason</th></tr></thead>
            <tbody>
              {placed.map((p) => (
                <tr key={p.id}>
                  <td><Link className="link" href={`/specimens/${p.specimenId}`}>{p.label}</Link></td>
                  <td>{p.chamberName ?? <span className="muted">hidden</span>}</td><td>{p.treatmentName ?? <span className="muted">hidden</span>}</td>
                  <td className="whitespace-nowrap">{p.fromAt ? formatDateTime(p.fromAt) : "—"}</td>
                  <td className="whitespace-nowrap">{p.toAt ? formatDateTime(p.toAt) : <span className="font-medium">current</span>}</td>
                  <td>{p.reason}</td>
                </tr>
              ))}
            </tbody>
          </table>
          {trial.status === "running" && design && !blind && openPlacements.length > 0 && (
            <details className="no-print"><summary className="cursor-pointer text-sm underline underline-offset-2 text-[var(--accent)]">Move a specimen</summary><div className="pt-3">
              <MoveForm trialId={trial.id} specimens={openPlacements.map((p) => ({ id: p.specimenId, label: p.label, where: `${p.chamberName} / ${p.treatmentName}` }))} arms={arms.map((a) => ({ id: a.id, label: a.label }))} />
            </div></details>
          )}
        </section>
      )}
    </div>
  );
}
