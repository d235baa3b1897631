"use server";
// Recording a photo's protocol points and scale (and the series scale when framing is fixed), from
// the inspection's photo page. The same roles as uploading the photo.
import { savePhotoEvidence } from "@/db/queries/photo-evidence";
import { labAction, revalidate } from "@/lib/auth/action";
import { photoEvidenceSchema } from "@/lib/validation/photo-evidence";

export const savePhotoEvidenceAction = labAction("photos.upload", photoEvidenceSchema, async (ctx, d) => {
  const r = await savePhotoEvidence({ actor: ctx, input: d });
  if (r.inspectionId) revalidate(`/trials/${r.trialId}/inspections/${r.inspectionId}/photos`);
  revalidate(`/trials/${r.trialId}/grid`);
  revalidate(`/trials/${r.trialId}/report`);
  const missing = r.missing ? ` ${r.missing} protocol point${r.missing === 1 ? " is" : "s are"} marked as not followed; the photo is flagged in scoring, the grid and the report.` : " Every protocol point was followed.";
  const scale = d.forSeries ? " The scale now holds for every photo of this specimen in this trial that has no scale of its own." : "";
  return { ok: true, message: `Saved.${missing}${scale}` };
});
