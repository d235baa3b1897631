// Hazard notes for what the chamber uses: GHS statements, practice cautions and the SDS deferral.
// No hooks, so the chamber form (live) and the chamber page (server) both render it.
import { hazardNotes, type ChamberKind } from "@/lib/humidity/hazards";
import type { DesiccantKind, IndicatorKind } from "@/lib/humidity/desiccant";
import type { SaltId } from "@/lib/humidity/salts";

export function HazardPanel({ kind, salt, desiccant, indicator }: { kind: ChamberKind; salt?: SaltId | null; desiccant?: DesiccantKind | null; indicator?: IndicatorKind | null }) {
  const notes = hazardNotes({ kind, salt: salt ?? undefined, desiccant: desiccant ?? undefined, indicator: indicator ?? undefined });
  return (
    <section className="panel p-4 space-y-2 border-l-4 !border-l-rust-400" aria-labelledby="hazard-h">
      <h2 id="hazard-h" className="font-semibold">Hazards and cautions</h2>
      {notes.ghs.length > 0 ? (
        <ul className="text-sm space-y-1" aria-label="GHS hazard statements">
          {notes.ghs.map((g) => (
            <li key={g.code}><span className="font-mono font-medium">{g.code}</span> {g.text}</li>
          ))}
        </ul>
      ) : kind === "saturated-salt" && salt ? (
        <p className="text-sm">No GHS hazard statements on record for this salt (from memory; check the SDS).</p>
      ) : null}
      {notes.cautions.length > 0 && (
        <ul className="text-sm list-disc pl-5 space-y-1" aria-label="Cautions" data-testid="hazard-cautions">
          {notes.cautions.map((c) => <li key={c}>{c}</li>)}
        </ul>
      )}
      <p className="text-sm font-medium">{notes.deferral}</p>
    </section>
  );
}
