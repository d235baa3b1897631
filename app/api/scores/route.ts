// POST /api/scores — save the caller's rust score (and marks on the photo) for one specimen at one
// inspection. Same schema and transaction as the score form. A blind scorer's answer carries no ids.
import { NextResponse } from "next/server";
import { saveScore } from "@/db/queries/scores";
import { labRoute, readJson } from "@/lib/auth/route";
import { saveScoreSchema } from "@/lib/validation/scores";

export const POST = labRoute("scores.write", async (ctx, req) => {
  const input = await readJson(req, saveScoreSchema);
  const { score, blind } = await saveScore({ labId: ctx.labId, userId: ctx.userId }, input);
  const own = {
    id: score.id, spotCount: score.spotCount, areaPercent: score.areaPercent, astmGrade: score.astmGrade, astmLetter: score.astmLetter,
    isoDegree: score.isoDegree, weeping: score.weeping, silicateChange: score.silicateChange, autoEstimatePercent: score.autoEstimatePercent,
    autoEstimateColour: score.autoEstimateColour,
    areaSource: score.areaSource, noChange: score.noChange, notes: score.notes, blind: score.blind, updatedAt: score.updatedAt,
  };
  const body = blind ? own : { ...own, trialId: score.trialId, inspectionId: score.inspectionId, specimenId: score.specimenId, photoId: score.photoId, isRecord: score.isRecord };
  return NextResponse.json({ score: body }, { status: 200 });
});
