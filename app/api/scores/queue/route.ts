// GET /api/scores/queue?trialId=…&page=…&show=todo|all — the caller's scoring queue for a trial.
// For a blind scorer each item is only { photoId, position, thumbUrl, scored }.
import { NextResponse } from "next/server";
import { z } from "zod";
import { listScoringQueue } from "@/db/queries/scores-queue";
import { AppError } from "@/lib/auth/errors";
import { labRoute } from "@/lib/auth/route";
import { queueQuerySchema } from "@/lib/validation/scores";

export const GET = labRoute("scores.write", async (ctx, req) => {
  const params = Object.fromEntries(new URL(req.url).searchParams);
  const parsed = queueQuerySchema.safeParse(params);
  if (!parsed.success) throw new AppError("invalid", "The query has invalid fields.", z.flattenError(parsed.error).fieldErrors as Record<string, string[]>);
  const queue = await listScoringQueue({ labId: ctx.labId, userId: ctx.userId, ...parsed.data });
  return NextResponse.json(queue, { headers: { "Cache-Control": "private, no-store" } });
});
