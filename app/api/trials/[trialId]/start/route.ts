// POST /api/trials/[trialId]/start — draft → running: {startAt?} (ISO; default now). Creates the
// placements from the allocation and the inspections from the plan.
import { NextResponse } from "next/server";
import { z } from "zod";
import { startTrial } from "@/db/queries/trials-lifecycle";
import { labRoute, readJson } from "@/lib/auth/route";
import { startSchema } from "@/lib/validation/trials";

export const POST = labRoute<{ trialId: string }>("trials.write", async (ctx, req, { trialId }) => {
  const d = await readJson(req, z.preprocess((v) => ({ ...(v as object), trialId }), startSchema));
  const r = await startTrial({ actor: ctx, trialId, startAt: d.startAt });
  return NextResponse.json({ ...r.trial, placements: r.placements, inspections: r.inspections });
});
