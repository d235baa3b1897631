// GET /api/trials/[trialId]/allocation — the allocation table with seed (blinded for blind scorers).
// POST /api/trials/[trialId]/allocation — allocate or re-roll while draft: {specimenIds, seed?, blockByMaterial?}.
import { NextResponse } from "next/server";
import { z } from "zod";
import { allocateTrial, newSeed } from "@/db/queries/trials-allocation";
import { blindRows, listAllocation, requireTrial, viewerIsBlind } from "@/db/queries/trials";
import { labRoute, readJson } from "@/lib/auth/route";

type P = { trialId: string };
const body = z.object({
  specimenIds: z.array(z.uuid()).min(1).max(5000),
  seed: z.string().trim().min(1).max(100).optional(),
  blockByMaterial: z.boolean().default(true),
});

export const GET = labRoute<P>("lab.read", async (ctx, _req, { trialId }) => {
  const trial = await requireTrial({ labId: ctx.labId, trialId });
  const [rows, blind] = await Promise.all([listAllocation({ labId: ctx.labId, trialId }), viewerIsBlind({ labId: ctx.labId, trialId, userId: ctx.userId })]);
  return NextResponse.json({ seed: trial.allocationSeed, blockByMaterial: trial.blockByMaterial, replicatesPerArm: trial.replicatesPerArm, items: blindRows(rows, blind) });
});

export const POST = labRoute<P>("trials.write", async (ctx, req, { trialId }) => {
  const d = await readJson(req, body);
  const seed = d.seed ?? newSeed();
  const r = await allocateTrial({ actor: ctx, trialId, specimenIds: d.specimenIds, seed, blockByMaterial: d.blockByMaterial });
  return NextResponse.json({ seed, assigned: r.assigned, unallocated: r.unallocated, items: await listAllocation({ labId: ctx.labId, trialId }) });
});
