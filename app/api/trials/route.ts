// GET /api/trials — the lab's trials (?status&q&page&pageSize).
// POST /api/trials — draft a trial (design JSON: arms = chamberIds × treatmentIds; scorers need a lead).
import { NextResponse } from "next/server";
import { createTrial, listTrials } from "@/db/queries/trials";
import { labRoute, readJson } from "@/lib/auth/route";
import { trialDesignSchema, trialListSchema } from "@/lib/validation/trials";

export const GET = labRoute("lab.read", async (ctx, req) => {
  const params = trialListSchema.parse(Object.fromEntries(new URL(req.url).searchParams));
  const { rows, total, page, pageSize } = await listTrials({ labId: ctx.labId, ...params });
  return NextResponse.json({ items: rows, page, pageSize, total });
});

export const POST = labRoute("trials.write", async (ctx, req) => {
  const input = await readJson(req, trialDesignSchema);
  return NextResponse.json(await createTrial({ actor: ctx, input }), { status: 201 });
});
