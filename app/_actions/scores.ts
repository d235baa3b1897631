"use server";
import { saveConsensusScore, saveScore } from "@/db/queries/scores";
import { labAction, revalidate } from "@/lib/auth/action";
import { formatAstm, formatIso, type AstmDistributionLetter, type IsoRustDegree } from "@/lib/scoring/grades";
import { consensusScoreSchema, saveScoreSchema } from "@/lib/validation/scores";

function describe(s: { areaPercent: number; astmGrade: number | null; astmLetter: string | null; isoDegree: number | null; spotCount: number }) {
  const astm = s.astmGrade == null ? "—" : s.astmLetter ? formatAstm(s.astmGrade, s.astmLetter as AstmDistributionLetter) : String(s.astmGrade);
  const iso = s.isoDegree == null ? "—" : formatIso(s.isoDegree as IsoRustDegree);
  return `${s.areaPercent} % rusted, ${s.spotCount} spot${s.spotCount === 1 ? "" : "s"}, ASTM D610 ${astm}, ISO 4628-3 ${iso}`;
}

// One action for the open score page and the blind queue: the server works out which it is from
// the caller's assignment, and the message names no specimen.
export const saveScoreAction = labAction("scores.write", saveScoreSchema, async (ctx, data) => {
  const { score, inspection, specimenId } = await saveScore({ labId: ctx.labId, userId: ctx.userId }, data);
  revalidate(`/trials/${data.trialId}/inspections/${inspection.id}/score/${specimenId}`);
  revalidate(`/trials/${data.trialId}/inspections/${inspection.id}/score`);
  revalidate(`/trials/${data.trialId}/scoring`);
  if (data.photoId) revalidate(`/trials/${data.trialId}/scoring/${data.photoId}`);
  return { message: `Score saved: ${describe(score)}.` };
});

export const saveConsensusAction = labAction("scores.consensus", consensusScoreSchema, async (ctx, data) => {
  const { score } = await saveConsensusScore({ labId: ctx.labId, userId: ctx.userId }, data);
  revalidate(`/trials/${data.trialId}/inspections/${data.inspectionId}/score/${data.specimenId}`);
  return { message: `Consensus score saved as the score of record: ${describe(score)}.` };
});
