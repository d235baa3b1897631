// The score-of-record rule: which of several scores of one specimen at one inspection the analysis uses.

export type RecordCandidate = { id: string; scorerId: string | null; blind: boolean };

/**
 * The score of record for one specimen × inspection. Consensus rule: the consensus score once it
 * exists. Otherwise (and under the primary-scorer rule) the primary scorer's score; until that exists,
 * the first non-blind score, then the first score at all, so analysis always has one value to use.
 */
export function pickRecord(rows: readonly RecordCandidate[], trial: { scoreRule: "primary-scorer" | "consensus"; primaryScorerId: string | null }): RecordCandidate | null {
  const consensus = rows.find((r) => r.scorerId === null) ?? null;
  if (trial.scoreRule === "consensus" && consensus) return consensus;
  const scored = rows.filter((r) => r.scorerId !== null);
  return scored.find((r) => r.scorerId === trial.primaryScorerId) ?? scored.find((r) => !r.blind) ?? scored[0] ?? consensus;
}

