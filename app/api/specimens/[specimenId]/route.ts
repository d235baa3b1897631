// GET /api/specimens/[specimenId] — one specimen with its placement history (arms hidden in trials the caller scores blind).
// PATCH /api/specimens/[specimenId] — change some fields (audited).
import { NextResponse } from "next/server";
import { listSpecimenPlacements, requireSpecimen, updateSpecimen } from "@/db/queries/specimens";
import { blindTrialIds } from "@/db/queries/trial-access";
import { labRoute, readJson } from "@/lib/auth/route";
import { hideArmsOfTrials } from "@/lib/trials/access";
import { specimenUpdateSchema } from "@/lib/validation/specimens";

type P = { specimenId: string };

export const GET = labRoute<P>("lab.read", async (ctx, _req, { specimenId }) => {
  const specimen = await requireSpecimen({ labId: ctx.labId, specimenId });
  const [placements, blind] = await Promise.all([listSpecimenPlacements({ labId: ctx.labId, specimenId }), blindTrialIds({ labId: ctx.labId, userId: ctx.userId })]);
  return NextResponse.json({ ...specimen, placements: hideArmsOfTrials(placements, blind) });
});

export const PATCH = labRoute<P>("specimens.write", async (ctx, req, { specimenId }) => {
  const input = await readJson(req, specimenUpdateSchema);
  const row = await updateSpecimen({ actor: ctx, specimenId, input });
  return NextResponse.json(row);
});
