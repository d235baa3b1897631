"use server";
// Placing control points on a photo so the specimen's timeline lines up with its first photo.
import { saveControlPoints } from "@/db/queries/photo-align";
import { labAction, revalidate } from "@/lib/auth/action";
import { controlPointsSchema } from "@/lib/photos/schemas";

export const saveControlPointsAction = labAction("photos.upload", controlPointsSchema, async (ctx, d) => {
  const r = await saveControlPoints({ actor: ctx, trialId: d.trialId, photoId: d.photoId, points: d.points });
  revalidate(`/specimens/${r.specimenId}/timeline`);
  revalidate(`/trials/${d.trialId}/align/${d.photoId}`);
  return {
    ok: true,
    message: r.isReference
      ? `${d.points.length} control points saved on the first photo. Place the same points, in the same order, on the later photos.`
      : `${d.points.length} control points saved; the photo now lines up with the first one on the timeline.`,
  };
});
