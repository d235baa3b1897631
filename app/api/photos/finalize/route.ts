// POST /api/photos/finalize — record an upload once storage holds it: length and magic bytes
// checked, SHA-256 and EXIF read, row + audit event created, previews queued. Repeating is harmless.
import { NextResponse } from "next/server";
import { finalizePhotoUpload } from "@/db/queries/photo-uploads";
import { labRoute, readJson } from "@/lib/auth/route";
import { finalizeRequestSchema } from "@/lib/photos/schemas";

export const POST = labRoute("photos.upload", async (ctx, req) => {
  const { token, protocol } = await readJson(req, finalizeRequestSchema);
  const result = await finalizePhotoUpload({ caller: ctx, token, protocol });
  return NextResponse.json(result, { status: result.alreadyFinalized ? 200 : 201, headers: { "Cache-Control": "no-store" } });
});
