import { ASTM_CATEGORIES, scorerAgreement, type PairAgreement } from "@/db/queries/scores-agreement";
import { loadGradePairs } from "@/db/queries/analysis";
import { scorerAgreement as recordAgreement } from "@/lib/analysis/compare";
import { agreementSentences } from "@/lib/analysis/sentences";
import { trialPage } from "@/lib/auth/page";
import { describeKappa } from "@/lib/stats/summary";
import { BlandAltmanLazy } from "@/components/scoring/bland-altman-lazy";
import { EmptyState } from "@/components/ui/empty-state";

export const metadata = { title: "Agreement between scorers" };

const k = (x: number | undefined) => (x == null ? "—" : Number.isNaN(x) ? "undefined" : x.toFixed(2));
const pp = (x: number) => `${x >= 0 ? "+" : "−"}${Math.abs(x).toFixed(3)}`;

function interpretation(p: PairAgreement): string[] {
  const out: string[] = [];
  out.push(p.rustCall.kappa === null
    ? `Rust / no-rust call: both made the same single call on all ${p.rustCall.n} items, so kappa is undefined.`
    : `Rust / no-rust call: κ = ${p.rustCall.kappa.toFixed(2)}, ${describeKappa(p.rustCall.kappa)} (${p.rustCall.agreed} of ${p.rustCall.n} calls agree).`);
  if (!p.kappa) out.push("No item was graded by both, so grade agreement cannot be measured yet.");
  else if (Number.isNaN(p.kappa.quadratic)) out.push(`Both gave every one of the ${p.n} items the same single grade, so kappa on ASTM D610 grades is undefined: agreement beyond chance cannot be told apart from chance.`);
  else {
    out.push(`Kappa on ASTM D610 grades: quadratic-weighted κ = ${p.kappa.quadratic.toFixed(2)}, ${describeKappa(p.kappa.quadratic)}; unweighted κ = ${k(p.kappa.none)} counts only exact matches (${p.exactMatches} of ${p.n}).`);
    if (p.kappa.quadratic <= 0.6) out.push("Disagreement at this level can blur real differences between treatments; discuss the photos where they differ and consider a consensus score.");
  }
  const ba = p.blandAltman;
  if (ba) {
    out.push(`Area: on average ${p.a.name} scores ${pp(ba.bias)} percentage points relative to ${p.b.name}; 95 % of differences are expected between ${pp(ba.lower)} and ${pp(ba.upper)} points (n = ${ba.n}).`);
  } else out.push("Fewer than two items scored by both: no limits of agreement for area yet.");
  return out;
}

export default async function AgreementPage({ params }: { params: Promise<{ trialId: string }> }) {
  const { trialId } = await params;
  // A results page: a blind scorer gets the 403 page until the trial is concluded.
  const { ctx } = await trialPage("/trials/[trialId]/agreement", trialId);
  const [data, recordPairs] = await Promise.all([scorerAgreement({ labId: ctx.labId, trialId }), loadGradePairs({ labId: ctx.labId, trialId })]);
  // The same headline as the comparison and the report: the score of record against the blind second score.
  const headline = agreementSentences(recordAgreement(recordPairs));

  return (
    <div className="space-y-6">
      <h1 className="text-2xl font-semibold">Agreement between scorers</h1>
      <section className="panel p-4 space-y-2" aria-labelledby="headline-h" data-testid="agreement-headline">
        <h2 id="headline-h" className="font-semibold">Score of record against the blind second score</h2>
        {headline.map((t) => <p key={t} className="text-sm">{t}</p>)}
      </section>
      <p className="text-sm muted max-w-3xl">
        For each pair of scorers, on the specimen × inspection items both scored: Cohen&apos;s kappa on the rust / no-rust call
        (any spot, any rusted area or weeping: the call that defines first rust), Cohen&apos;s kappa on ASTM D610 grades
        (grades 0–10 as {ASTM_CATEGORIES} ordered categories; linear and quadratic weights credit near misses) and Bland–Altman
        limits of agreement on rusted area %. The kappa wording follows the bands of Landis &amp; Koch (1977).
      </p>
      {!data || data.scorers.length < 2 ? (
        <EmptyState text={`Agreement needs scores from at least two scorers on the same photos; ${data?.scorers.length ? `only ${data.scorers[0].name} has scored so far` : "nobody has scored yet"}. Assign a second (blind) scorer on the scoring page.`}
          action={{ href: `/trials/${trialId}/scoring`, label: "Go to the scoring page" }} />
      ) : data.pairs.length === 0 ? (
        <EmptyState text="The scorers have not scored any of the same photos yet." action={{ href: `/trials/${trialId}/scoring`, label: "Go to the scoring queue" }} />
      ) : (
        <>
          <section aria-labelledby="table-h" className="space-y-2">
            <h2 id="table-h" className="font-semibold">Agreement table</h2>
            <div className="overflow-x-auto">
              <table className="data" data-testid="agreement-table">
                <thead>
                  <tr>
                    <th scope="col">Scorer A</th><th scope="col">Scorer B</th><th scope="col">n (graded)</th><th scope="col">Exact grade matches</th>
                    <th scope="col">κ rust call</th>
                    <th scope="col">κ grades, unweighted</th><th scope="col">κ grades, linear</th><th scope="col">κ grades, quadratic</th>
                    <th scope="col">Area bias A−B (points)</th><th scope="col">95 % limits (points)</th><th scope="col">n (area)</th>
                  </tr>
                </thead>
                <tbody>
                  {data.pairs.map((p) => (
                    <tr key={`${p.a.id}-${p.b.id}`}>
                      <td>{p.a.name}</td><td>{p.b.name}</td><td className="tabular-nums">{p.n}</td>
                      <td className="tabular-nums">{p.n ? `${p.exactMatches} (${Math.round((100 * p.exactMatches) / p.n)} %)` : "—"}</td>
                      <td className="tabular-nums">{p.rustCall.kappa === null ? "undefined" : p.rustCall.kappa.toFixed(2)}</td>
                      <td className="tabular-nums">{k(p.kappa?.none)}</td><td className="tabular-nums">{k(p.kappa?.linear)}</td><td className="tabular-nums">{k(p.kappa?.quadratic)}</td>
                      <td className="tabular-nums">{p.blandAltman ? pp(p.blandAltman.bias) : "—"}</td>
                      <td className="tabular-nums">{p.blandAltman ? `${pp(p.blandAltman.lower)} to ${pp(p.blandAltman.upper)}` : "—"}</td>
                      <td className="tabular-nums">{p.blandAltman?.n ?? p.points.length}</td>
                    </tr>
                  ))}
                </tbody>
              </table>
            </div>
          </section>
          {data.pairs.map((p) => (
            <section key={`${p.a.id}-${p.b.id}-detail`} className="panel p-4 space-y-3" aria-label={`${p.a.name} and ${p.b.name}`}>
              <h2 className="font-semibold">{p.a.name} and {p.b.name}</h2>
              <ul className="list-disc pl-5 text-sm space-y-1">{interpretation(p).map((t) => <li key={t}>{t}</li>)}</ul>
              {p.blandAltman && (
                <BlandAltmanLazy title={`${p.a.name} − ${p.b.name}: rusted area`} points={p.points}
                  bias={p.blandAltman.bias} lower={p.blandAltman.lower} upper={p.blandAltman.upper} />
              )}
            </section>
          ))}
        </>
      )}
    </div>
  );
}
