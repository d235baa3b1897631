// GET /api/marks?photoId=… — the caller's own face outline and marks on a photo of their lab
// (original-image pixel coordinates, paint order). Another lab's photo answers 404.
import { NextResponse } from "next/server";
import { z } from "zod";
import { getLabPhoto, marksOnPhoto } from "@/db/queries/scores-read";
import { AppError } from "@/lib/auth/errors";
import { labRoute } from "@/lib/auth/route";

const query = z.object({ photoId: z.uuid("Not a valid photo id.") });

export const GET = labRoute("scores.write", async (ctx, req) => {
  const parsed = query.safeParse(Object.fromEntries(new URL(req.url).searchParams));
  if (!parsed.success) throw new AppError("invalid", "The query has invalid fields.", z.flattenError(parsed.error).fieldErrors as Record<string, string[]>);
  const photo = await getLabPhoto({ labId: ctx.labId, photoId: parsed.data.photoId });
  const own = await marksOnPhoto({ labId: ctx.labId, photoId: photo.id, scorerId: ctx.userId });
  return NextResponse.json({ photoId: photo.id, width: photo.width, height: photo.height, ...own }, { headers: { "Cache-Control": "private, no-store" } });
});
