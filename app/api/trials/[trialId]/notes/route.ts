// GET /api/trials/[trialId]/notes — the trial's appended notes, oldest first.
// POST /api/trials/[trialId]/notes — append a note {body}; allowed in every status, also once concluded.
import { NextResponse } from "next/server";
import { z } from "zod";
import { addTrialNote } from "@/db/queries/trials-lifecycle";
import { getTrial } from "@/db/queries/trial-access";
import { listTrialNotes } from "@/db/queries/trials";
import { labRoute, readJson } from "@/lib/auth/route";
import { noteSchema } from "@/lib/validation/trials";

type P = { trialId: string };

export const GET = labRoute<P>("lab.read", async (ctx, _req, { trialId }) => {
  await getTrial({ labId: ctx.labId, trialId });
  return NextResponse.json({ items: await listTrialNotes({ labId: ctx.labId, trialId }) });
});

export const POST = labRoute<P>("trials.notes", async (ctx, req, { trialId }) => {
  const d = await readJson(req, z.preprocess((v) => ({ ...(v as object), trialId }), noteSchema));
  return NextResponse.json(await addTrialNote({ actor: ctx, trialId, body: d.body }), { status: 201 });
});
