// POST /api/trials/[trialId]/allocation/swap — exchange the arms of two specimens while draft:
// {specimenA, specimenB, reason} (reason required, audited).
import { NextResponse } from "next/server";
import { z } from "zod";
import { swapAllocation } from "@/db/queries/trials-allocation";
import { labRoute, readJson } from "@/lib/auth/route";
import { swapSchema } from "@/lib/validation/trials";

export const POST = labRoute<{ trialId: string }>("trials.write", async (ctx, req, { trialId }) => {
  const d = await readJson(req, z.preprocess((v) => ({ ...(v as object), trialId }), swapSchema));
  await swapAllocation({ actor: ctx, trialId, specimenA: d.specimenA, specimenB: d.specimenB, reason: d.reason });
  return NextResponse.json({ ok: true });
});
