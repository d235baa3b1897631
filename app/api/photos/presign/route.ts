// POST /api/photos/presign — approve one upload: a PUT URL (5 minutes) bound to a fresh lab-scoped
// key, the content type, the exact length and the SHA-256 the browser computed (so storage takes
// only those bytes), plus a signed receipt for finalize. Writes nothing.
import { NextResponse } from "next/server";
import { presignPhotoUpload } from "@/db/queries/photo-uploads";
import { labRoute, readJson } from "@/lib/auth/route";
import { presignRequestSchema } from "@/lib/photos/schemas";

export const POST = labRoute("photos.upload", async (ctx, req) => {
  const input = await readJson(req, presignRequestSchema);
  const result = await presignPhotoUpload({ caller: ctx, input });
  return NextResponse.json(result, { headers: { "Cache-Control": "no-store" } });
});
