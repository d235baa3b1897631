// GET /api/treatments — the lab's treatments (?q&kind&page&pageSize).
// POST /api/treatments — add a treatment (name unique per lab).
import { NextResponse } from "next/server";
import { createTreatment, listTreatments } from "@/db/queries/treatments";
import { labRoute, readJson } from "@/lib/auth/route";
import { treatmentListSchema, treatmentSchema } from "@/lib/validation/treatments";

export const GET = labRoute("lab.read", async (ctx, req) => {
  const params = treatmentListSchema.parse(Object.fromEntries(new URL(req.url).searchParams));
  const { rows, total, page, pageSize } = await listTreatments({ labId: ctx.labId, ...params });
  return NextResponse.json({ items: rows, page, pageSize, total });
});

export const POST = labRoute("treatments.write", async (ctx, req) => {
  const input = await readJson(req, treatmentSchema);
  return NextResponse.json(await createTreatment({ actor: ctx, input }), { status: 201 });
});
