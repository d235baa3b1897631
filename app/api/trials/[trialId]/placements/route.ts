// GET /api/trials/[trialId]/placements — every placement (specimen in chamber under treatment, from–to).
// POST /api/trials/[trialId]/placements — move a running trial's specimen: {specimenId, armId ("" = take
// out), at?, reason}; closes the open placement and opens the new one.
import { NextResponse } from "next/server";
import { z } from "zod";
import { moveSpecimen } from "@/db/queries/trials-lifecycle";
import { getTrialAccess } from "@/db/queries/trial-access";
import { listTrialPlacements } from "@/db/queries/trials";
import { labRoute, readJson } from "@/lib/auth/route";
import { hideArms } from "@/lib/trials/access";
import { moveSchema } from "@/lib/validation/trials";

type P = { trialId: string };

export const GET = labRoute<P>("lab.read", async (ctx, _req, { trialId }) => {
  const { access } = await getTrialAccess({ labId: ctx.labId, trialId, userId: ctx.userId });
  return NextResponse.json({ items: hideArms(await listTrialPlacements({ labId: ctx.labId, trialId }), access.blind) });
});

export const POST = labRoute<P>("trials.write", async (ctx, req, { trialId }) => {
  const d = await readJson(req, z.preprocess((v) => ({ ...(v as object), trialId }), moveSchema));
  const r = await moveSpecimen({ actor: ctx, trialId, specimenId: d.specimenId, armId: d.armId, at: d.at, reason: d.reason });
  return NextResponse.json(r, { status: 201 });
});
