// A specimen's history on its page: summary, weighings with mass change, tests, checks, treatments.
import type { loadSpecimenHistory } from "@/db/queries/specimen-history";
import { CHLORIDE_STATE_LABELS, type MassStep } from "@/lib/specimens/history";
import { AKAGANEITE_METHOD_LABELS, CHLORIDE_METHOD_LABELS } from "@/lib/validation/specimen-history";
import { BLIND_HIDDEN } from "@/lib/trials/access";

type History = Awaited<ReturnType<typeof loadSpecimenHistory>>;

const signed = (x: number, digits: number) => `${x > 0 ? "+" : x < 0 ? "−" : "±"}${Math.abs(x).toFixed(digits)}`;

/** wrap: may break across lines (the summary above the tables); table cells keep one line. */
function Change({ s, wrap = false }: { s: MassStep | null; wrap?: boolean }) {
  if (!s) return <span className="muted">first weighing</span>;
  return (
    <span className={wrap ? undefined : "whitespace-nowrap"}>
      {signed(s.changeG, 4)}&#8239;g ({signed(s.changePercent, 3)}&#8239;%) over {s.days} d
      {s.gPerDay !== null && <span className="muted"> · {signed(s.gPerDay * 1000, 3)}&#8239;mg/d, {signed(s.percentPerDay!, 4)}&#8239;%/d</span>}
    </span>
  );
}

function Table({ caption, head, children }: { caption: string; head: string[]; children: React.ReactNode }) {
  return (
    <div className="panel overflow-x-auto">
      <table className="data">
        <caption className="text-left font-medium p-2">{caption}</caption>
        <thead><tr>{head.map((h) => <th key={h} scope="col">{h}</th>)}</tr></thead>
        <tbody>{children}</tbody>
      </table>
    </div>
  );
}

type Kind = "mass" | "chloride" | "akaganeite" | "treatment";

/** `correctHref` (for those who may write) adds a link on each row to correct or delete it; undefined for a kind the viewer may not change. */
export function SpecimenHistory({ history, correctHref }: { history: History; correctHref?: (kind: Kind, id: string) => string | undefined }) {
  const fix = (kind: Kind, id: string) => {
    if (!correctHref) return null;
    const href = correctHref(kind, id);
    return <td className="no-print">{href ? <a className="link text-sm" href={href}>Correct or delete</a> : null}</td>;
  };
  const head = (cols: string[]) => (correctHref ? [...cols, "Fix"] : cols);
  const { weighings, chlorideTests, akaganeiteChecks, priorTreatments } = history;
  const last = weighings.at(-1);
  return (
    <div className="space-y-4">
      <dl className="grid gap-4 md:grid-cols-3 panel p-4">
        <div><dt className="text-xs muted">Chloride (latest test)</dt><dd>{CHLORIDE_STATE_LABELS[history.chlorideState]}</dd></div>
        <div><dt className="text-xs muted">Akaganeite</dt><dd>{history.akaganeiteSeen === null ? "not checked" : history.akaganeiteSeen ? "seen" : "not seen"}</dd></div>
        <div><dt className="text-xs muted">Mass change since first weighing</dt><dd>{last?.sinceFirst ? <Change s={last.sinceFirst} wrap /> : weighings.length ? "one weighing so far" : "not weighed"}</dd></div>
      </dl>
      {history.hidden > 0 && <p className="text-sm muted">{history.hidden} later entr{history.hidden === 1 ? "y is" : "ies are"} {BLIND_HIDDEN}.</p>}
      {weighings.length > 0 && (
        <Table caption="Weighings" head={head(["Weighed on", "Mass (g)", "Since previous", "Since first", "Notes"])}>
          {weighings.map((w) => (
            <tr key={w.id}><td>{w.measuredOn}</td><td className="font-mono">{w.massG}</td><td><Change s={w.sincePrevious} /></td><td>{w.sinceFirst ? <Change s={w.sinceFirst} /> : "—"}</td><td>{w.notes}</td>{fix("mass", w.id)}</tr>
          ))}
        </Table>
      )}
      {chlorideTests.length > 0 && (
        <Table caption="Chloride tests" head={head(["Tested on", "Method", "Result", "Notes"])}>
          {chlorideTests.map((c) => <tr key={c.id}><td>{c.testedOn}</td><td>{CHLORIDE_METHOD_LABELS[c.method as keyof typeof CHLORIDE_METHOD_LABELS] ?? c.method}</td><td>{c.result}</td><td>{c.notes}</td>{fix("chloride", c.id)}</tr>)}
        </Table>
      )}
      {akaganeiteChecks.length > 0 && (
        <Table caption="Akaganeite checks" head={head(["Checked on", "Method", "Seen", "Notes"])}>
          {akaganeiteChecks.map((a) => <tr key={a.id}><td>{a.checkedOn}</td><td>{AKAGANEITE_METHOD_LABELS[a.method as keyof typeof AKAGANEITE_METHOD_LABELS] ?? a.method}</td><td>{a.seen ? "yes" : "no"}</td><td>{a.notes}</td>{fix("akaganeite", a.id)}</tr>)}
        </Table>
      )}
      {priorTreatments.length > 0 && (
        <Table caption="Earlier treatments" head={head(["Treated on", "Treatment", "Notes"])}>
          {priorTreatments.map((t) => <tr key={t.id}><td>{t.treatedOn}</td><td>{t.treatment}</td><td>{t.notes}</td>{fix("treatment", t.id)}</tr>)}
        </Table>
      )}
    </div>
  );
}
