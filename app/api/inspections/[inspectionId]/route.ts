// GET /api/inspections/[inspectionId] — one inspection and the specimens in the trial at that time.
// PATCH /api/inspections/[inspectionId] — {action:"done", doneAt?, notes?} (inspections.record) or
// {action:"reschedule", plannedAt, reason} (inspections.reschedule: lead/researcher; checked in the query).
import { NextResponse } from "next/server";
import { z } from "zod";
import { listSpecimensAt, recordInspection, requireInspection, rescheduleInspection } from "@/db/queries/inspections";
import { getTrialAccess } from "@/db/queries/trial-access";
import { labRoute, readJson } from "@/lib/auth/route";
import { hideArms } from "@/lib/trials/access";
import { recordInspectionSchema, rescheduleSchema } from "@/lib/validation/trials";

type P = { inspectionId: string };

export const GET = labRoute<P>("lab.read", async (ctx, _req, { inspectionId }) => {
  const insp = await requireInspection({ labId: ctx.labId, inspectionId });
  const [specimens, { access }] = await Promise.all([
    listSpecimensAt({ labId: ctx.labId, trialId: insp.trialId, at: insp.doneAt ?? insp.plannedAt }),
    getTrialAccess({ labId: ctx.labId, trialId: insp.trialId, userId: ctx.userId }),
  ]);
  return NextResponse.json({ ...insp, specimens: hideArms(specimens, access.blind) });
});

const patch = z.discriminatedUnion("action", [
  recordInspectionSchema.extend({ action: z.literal("done") }),
  rescheduleSchema.extend({ action: z.literal("reschedule") }),
], "Say what to do: action \"done\" or \"reschedule\".");

export const PATCH = labRoute<P>("inspections.record", async (ctx, req, { inspectionId }) => {
  const d = await readJson(req, z.preprocess((v) => ({ ...(v as object), inspectionId }), patch));
  const row = d.action === "done"
    ? await recordInspection({ actor: ctx, inspectionId, doneAt: d.doneAt, notes: d.notes })
    : await rescheduleInspection({ actor: ctx, inspectionId, plannedAt: d.plannedAt, reason: d.reason });
  return NextResponse.json(row);
});
