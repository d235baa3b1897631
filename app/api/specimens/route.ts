// GET /api/specimens — one page of the lab's specimens (?q&materialClass&sort&dir&page&pageSize).
// POST /api/specimens — add a specimen (JSON body as the form; label unique per lab).
import { NextResponse } from "next/server";
import { createSpecimen, listSpecimens } from "@/db/queries/specimens";
import { labRoute, readJson } from "@/lib/auth/route";
import { specimenListSchema, specimenSchema } from "@/lib/validation/specimens";

export const GET = labRoute("lab.read", async (ctx, req) => {
  const params = specimenListSchema.parse(Object.fromEntries(new URL(req.url).searchParams));
  const { rows, total, page, pageSize } = await listSpecimens({ labId: ctx.labId, ...params });
  return NextResponse.json({ items: rows, page, pageSize, total });
});

export const POST = labRoute("specimens.write", async (ctx, req) => {
  const input = await readJson(req, specimenSchema);
  const row = await createSpecimen({ actor: ctx, input });
  return NextResponse.json(row, { status: 201 });
});
