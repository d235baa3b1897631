// GET /api/photos/:photoId — a photo's record (EXIF, checksum, capture-time check); the location
// only for roles with photos.gps. Another lab's photo answers 404.
import { NextResponse } from "next/server";
import { photoDetails } from "@/db/queries/photos";
import { labRoute } from "@/lib/auth/route";

export const GET = labRoute<{ photoId: string }>("lab.read", async (ctx, _req, { photoId }) => {
  const photo = await photoDetails({ ctx, photoId });
  return NextResponse.json({ photo }, { headers: { "Cache-Control": "private, no-store" } });
});
