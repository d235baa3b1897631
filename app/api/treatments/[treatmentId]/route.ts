// GET /api/treatments/[treatmentId] — one treatment and the trials that use it.
// PATCH /api/treatments/[treatmentId] — change some fields (audited).
import { NextResponse } from "next/server";
import { listTreatmentTrials, requireTreatment, updateTreatment } from "@/db/queries/treatments";
import { labRoute, readJson } from "@/lib/auth/route";
import { treatmentUpdateSchema } from "@/lib/validation/treatments";

type P = { treatmentId: string };

export const GET = labRoute<P>("lab.read", async (ctx, _req, { treatmentId }) => {
  const t = await requireTreatment({ labId: ctx.labId, treatmentId });
  return NextResponse.json({ ...t, trials: await listTreatmentTrials({ labId: ctx.labId, treatmentId }) });
});

export const PATCH = labRoute<P>("treatments.write", async (ctx, req, { treatmentId }) => {
  const input = await readJson(req, treatmentUpdateSchema);
  return NextResponse.json(await updateTreatment({ actor: ctx, treatmentId, input }));
});
