"use server";
import { recordInspection, rescheduleInspection } from "@/db/queries/inspections";
import { labAction, revalidate } from "@/lib/auth/action";
import { recordInspectionSchema, rescheduleSchema } from "@/lib/validation/trials";

export const recordInspectionAction = labAction("inspections.record", recordInspectionSchema, async (ctx, d) => {
  const row = await recordInspection({ actor: ctx, inspectionId: d.inspectionId, doneAt: d.doneAt, notes: d.notes });
  revalidate(`/trials/${row.trialId}`);
  revalidate("/due");
  return { message: "Marked done." };
});

export const rescheduleInspectionAction = labAction("inspections.reschedule", rescheduleSchema, async (ctx, d) => {
  const row = await rescheduleInspection({ actor: ctx, inspectionId: d.inspectionId, plannedAt: d.plannedAt, reason: d.reason });
  revalidate(`/trials/${row.trialId}`);
  revalidate("/due");
  return { message: "Rescheduled; the reason is in the audit trail." };
});
