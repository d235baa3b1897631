// POST /api/trials/[trialId]/conclude — running → concluded (lead only): {note?}. Locks the record.
import { NextResponse } from "next/server";
import { z } from "zod";
import { concludeTrial } from "@/db/queries/trials-lifecycle";
import { labRoute, readJson } from "@/lib/auth/route";
import { concludeSchema } from "@/lib/validation/trials";

export const POST = labRoute<{ trialId: string }>("trials.conclude", async (ctx, req, { trialId }) => {
  const d = await readJson(req, z.preprocess((v) => ({ ...(v as object), trialId }), concludeSchema));
  return NextResponse.json(await concludeTrial({ actor: ctx, trialId, note: d.note }));
});
