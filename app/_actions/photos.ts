"use server";
// Looking after recorded photos from the inspection's photo page. Messages name the photo's
// specimen only to people who already see it in that list.
import { acknowledgeCaptureCheck, deletePhoto, movePhoto } from "@/db/queries/photo-edits";
import { labAction, revalidate } from "@/lib/auth/action";
import { acknowledgeCheckSchema, deletePhotoSchema, movePhotoSchema } from "@/lib/photos/schemas";

function revalidatePhotos(trialId: string, inspectionId: string | null) {
  if (inspectionId) revalidate(`/trials/${trialId}/inspections/${inspectionId}/photos`);
  revalidate(`/trials/${trialId}/grid`);
  revalidate(`/trials/${trialId}/scoring`);
}

export const acknowledgeCheckAction = labAction("photos.upload", acknowledgeCheckSchema, async (ctx, d) => {
  const r = await acknowledgeCaptureCheck({ actor: ctx, photoId: d.photoId, note: d.note });
  revalidatePhotos(r.trialId, r.inspectionId);
  return { ok: true, message: "Warning acknowledged; your note is kept with the photo and in the audit trail." };
});

export const movePhotoAction = labAction("photos.upload", movePhotoSchema, async (ctx, d) => {
  const r = await movePhoto({ actor: ctx, photoId: d.photoId, inspectionId: d.inspectionId, specimenId: d.specimenId });
  revalidatePhotos(r.trialId, r.fromInspectionId);
  revalidatePhotos(r.trialId, r.inspectionId);
  return { ok: true, message: `Photo moved to ${r.specimenLabel} at day ${r.dayNumber}.` };
});

export const deletePhotoAction = labAction("photos.upload", deletePhotoSchema, async (ctx, d) => {
  const r = await deletePhoto({ actor: ctx, photoId: d.photoId, confirmScores: d.confirmScores });
  revalidatePhotos(r.trialId, r.inspectionId);
  const kept = r.scoresKept ? ` ${r.scoresKept === 1 ? "The score made on it stays" : `The ${r.scoresKept} scores made on it stay`} recorded without the photo.` : "";
  const files = r.filesRemoved ? "" : " Storage could not be reached; the files will be removed by the hourly sweep.";
  return { ok: true, message: `Photo deleted.${kept}${files}` };
});
