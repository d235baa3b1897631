// GET /api/trials/[trialId]/allocation — the allocation table with seed (label order, no arms or seed for blind scorers).
// POST /api/trials/[trialId]/allocation — allocate or re-roll while draft: {specimenIds, seed?, blockByMaterial?, blockFactors?}.
import { NextResponse } from "next/server";
import { z } from "zod";
import { allocateTrial, newSeed } from "@/db/queries/trials-allocation";
import { getTrialAccess } from "@/db/queries/trial-access";
import { listAllocation } from "@/db/queries/trials";
import { labRoute, readJson } from "@/lib/auth/route";
import { hideArms } from "@/lib/trials/access";
import { historyBlockFactors } from "@/lib/validation/trials";

type P = { trialId: string };
const body = z.object({
  specimenIds: z.array(z.uuid()).min(1).max(5000),
  seed: z.string().trim().min(1).max(100).optional(),
  blockByMaterial: z.boolean().default(true),
  blockFactors: historyBlockFactors,
});

export const GET = labRoute<P>("lab.read", async (ctx, _req, { trialId }) => {
  const { trial, access } = await getTrialAccess({ labId: ctx.labId, trialId, userId: ctx.userId });
  const items = hideArms(await listAllocation({ labId: ctx.labId, trialId }), access.blind);
  // A blind scorer gets label order and no seed: with the seed and the lists anyone can re-derive the arms.
  return NextResponse.json({ seed: access.blind ? null : trial.allocationSeed, blockByMaterial: trial.blockByMaterial, blockFactors: trial.blockFactors, replicatesPerArm: trial.replicatesPerArm, items });
});

export const POST = labRoute<P>("trials.write", async (ctx, req, { trialId }) => {
  const d = await readJson(req, body);
  const seed = d.seed ?? newSeed();
  const r = await allocateTrial({ actor: ctx, trialId, specimenIds: d.specimenIds, seed, blockByMaterial: d.blockByMaterial, blockFactors: d.blockFactors });
  return NextResponse.json({ seed, assigned: r.assigned, unallocated: r.unallocated, items: await listAllocation({ labId: ctx.labId, trialId }) });
});
