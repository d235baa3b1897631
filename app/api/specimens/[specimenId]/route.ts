// GET /api/specimens/[specimenId] — one specimen with its placement history.
// PATCH /api/specimens/[specimenId] — change some fields (audited).
import { NextResponse } from "next/server";
import { listSpecimenPlacements, requireSpecimen, updateSpecimen } from "@/db/queries/specimens";
import { labRoute, readJson } from "@/lib/auth/route";
import { specimenUpdateSchema } from "@/lib/validation/specimens";

type P = { specimenId: string };

export const GET = labRoute<P>("lab.read", async (ctx, _req, { specimenId }) => {
  const specimen = await requireSpecimen({ labId: ctx.labId, specimenId });
  const placements = await listSpecimenPlacements({ labId: ctx.labId, specimenId });
  return NextResponse.json({ ...specimen, placements });
});

export const PATCH = labRoute<P>("specimens.write", async (ctx, req, { specimenId }) => {
  const input = await readJson(req, specimenUpdateSchema);
  const row = await updateSpecimen({ actor: ctx, specimenId, input });
  return NextResponse.json(row);
});
