// GET /api/photos/:photoId/file?variant=thumb|display|original[&format=json] — a fresh signed URL
// (5 minutes) for the private bucket, issued after the lab and permission checks; answers with a
// redirect so <img> tags can point here and never hold an expired URL. Bytes never pass through here.
import { NextResponse } from "next/server";
import { photoFileTarget } from "@/db/queries/photos";
import { AppError } from "@/lib/auth/errors";
import { labRoute } from "@/lib/auth/route";
import { photoVariantSchema } from "@/lib/photos/schemas";
import { signPhotoFile } from "@/storage/photo-urls";

export const GET = labRoute<{ photoId: string }>("lab.read", async (ctx, req, { photoId }) => {
  const params = new URL(req.url).searchParams;
  const variant = photoVariantSchema.safeParse(params.get("variant") ?? "display");
  if (!variant.success) throw new AppError("invalid", "variant must be thumb, display or original.");
  const { url, expiresInS } = await signPhotoFile(await photoFileTarget({ ctx, photoId, variant: variant.data }));
  if (params.get("format") === "json") {
    return NextResponse.json({ url, expiresInS }, { headers: { "Cache-Control": "private, no-store" } });
  }
  // The browser may reuse the redirect while the signed URL behind it is still valid.
  return new NextResponse(null, {
    status: 302,
    headers: { Location: url, "Cache-Control": `private, max-age=${Math.max(0, expiresInS - 60)}` },
  });
});
