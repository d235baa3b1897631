import "server-only";
// The colour card's grey patch on a photo: saved with a score (same transaction, audited) and read
// back for the score page, falling back to the position on the specimen's previous photo.
import { and, desc, eq, lt, ne } from "drizzle-orm";
import { AppError } from "@/lib/auth/errors";
import type { PatchRect } from "@/lib/scoring/colour-normalise";
import type { ColourPatchInput } from "@/lib/validation/scores";
import { recordAudit } from "../audit";
import { db, type Tx } from "../client";
import { photoColourPatches, photos } from "../schema";

type PhotoRow = typeof photos.$inferSelect;

/** Where the page's patch comes from: this photo, or the specimen's previous photo (position only). */
export type PatchOnPage = PatchRect & { patchLightness: number; from: "this-photo" | "previous-photo" };

// Half a pixel of slack: a rectangle dragged to the image's edge may round just past it.
const EDGE_SLACK_PX = 0.5;

/** Replace the grey patch of a photo; refuses a rectangle that leaves the photo (field error). */
export async function saveColourPatch(tx: Tx, actor: { labId: string; userId: string }, trialId: string, photo: PhotoRow, patch: ColourPatchInput) {
  if (photo.width && photo.height) {
    const outside = patch.x < -EDGE_SLACK_PX || patch.y < -EDGE_SLACK_PX
      || patch.x + patch.width > photo.width + EDGE_SLACK_PX || patch.y + patch.height > photo.height + EDGE_SLACK_PX;
    if (outside) {
      const msg = `The grey patch reaches outside the photo (${photo.width} × ${photo.height} px); mark it on the colour card within the frame.`;
      throw new AppError("invalid", msg, { colourPatch: [msg] });
    }
  }
  const where = and(eq(photoColourPatches.labId, actor.labId), eq(photoColourPatches.photoId, photo.id));
  const [before] = await tx.select().from(photoColourPatches).where(where);
  const values = {
    x: patch.x, y: patch.y, width: patch.width, height: patch.height, patchLightness: patch.patchLightness,
    meanLinear: patch.meanLinear, clippedFraction: patch.clippedFraction, pixels: patch.pixels, markedBy: actor.userId, updatedAt: new Date(),
  };
  const [after] = before
    ? await tx.update(photoColourPatches).set(values).where(eq(photoColourPatches.id, before.id)).returning()
    : await tx.insert(photoColourPatches).values({ ...values, labId: actor.labId, photoId: photo.id }).returning();
  await recordAudit(tx, {
    labId: actor.labId, userId: actor.userId, entity: "colour-patch", entityId: photo.id, trialId, action: before ? "update" : "create",
    summary: `Grey patch on a photo ${before ? "moved" : "marked"}: ${Math.round(patch.width)} × ${Math.round(patch.height)} px, L* ${patch.patchLightness}`,
    before: before ?? null, after,
  });
  return after;
}

/**
 * The grey patch of a photo; with `previous`, else the one on the latest earlier photo of the same
 * specimen (position only); null when none. Blind scoring passes previous: false, since a patch
 * carried over would tie a photo to the specimen's earlier photos.
 */
export async function colourPatchForPage({ labId, photoId, previous }: { labId: string; photoId: string; previous: boolean }): Promise<PatchOnPage | null> {
  const pick = { x: photoColourPatches.x, y: photoColourPatches.y, width: photoColourPatches.width, height: photoColourPatches.height, patchLightness: photoColourPatches.patchLightness };
  const [own] = await db.select(pick).from(photoColourPatches)
    .where(and(eq(photoColourPatches.labId, labId), eq(photoColourPatches.photoId, photoId)));
  if (own) return { ...own, from: "this-photo" };
  if (!previous) return null;
  const [photo] = await db.select({ specimenId: photos.specimenId, createdAt: photos.createdAt }).from(photos).where(and(eq(photos.labId, labId), eq(photos.id, photoId)));
  if (!photo) return null;
  const [earlier] = await db.select(pick).from(photoColourPatches)
    .innerJoin(photos, eq(photos.id, photoColourPatches.photoId))
    .where(and(eq(photoColourPatches.labId, labId), eq(photos.labId, labId), eq(photos.specimenId, photo.specimenId),
      ne(photos.id, photoId), lt(photos.createdAt, photo.createdAt)))
    .orderBy(desc(photos.createdAt))
    .limit(1);
  return earlier ? { ...earlier, from: "previous-photo" } : null;
}
