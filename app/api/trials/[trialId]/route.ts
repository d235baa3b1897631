// GET /api/trials/[trialId] — the trial with arms, team, allocation (blinded for blind scorers) and notes.
// PATCH /api/trials/[trialId] — change the design (draft only). A body with only team fields
// (lib/trials/team: who may change each, who may be named) also works while running.
import { NextResponse } from "next/server";
import { getTrialAccess } from "@/db/queries/trial-access";
import { listAllocation, listArms, listTrialMembers, listTrialNotes, updateTrialDesign, updateTrialTeam } from "@/db/queries/trials";
import { labRoute, readJson } from "@/lib/auth/route";
import { hideArms } from "@/lib/trials/access";
import { isTeamField } from "@/lib/trials/team";
import { trialPatchSchema } from "@/lib/validation/trials";

type P = { trialId: string };

export const GET = labRoute<P>("lab.read", async (ctx, _req, { trialId }) => {
  const { trial, access } = await getTrialAccess({ labId: ctx.labId, trialId, userId: ctx.userId });
  const [arms, members, allocation, notes] = await Promise.all([
    listArms({ labId: ctx.labId, trialId }), listTrialMembers({ labId: ctx.labId, trialId }), listAllocation({ labId: ctx.labId, trialId }),
    listTrialNotes({ labId: ctx.labId, trialId }),
  ]);
  const seen = access.blind ? { ...trial, allocationSeed: null } : trial;
  return NextResponse.json({ ...seen, arms, members, allocation: hideArms(allocation, access.blind), notes, viewerBlind: access.blind, access });
});

export const PATCH = labRoute<P>("trials.write", async (ctx, req, { trialId }) => {
  const input = await readJson(req, trialPatchSchema);
  const keys = Object.keys(input).filter((k) => input[k as keyof typeof input] !== undefined);
  if (keys.length > 0 && keys.every(isTeamField)) {
    return NextResponse.json(await updateTrialTeam({ actor: ctx, trialId, ...input }));
  }
  const r = await updateTrialDesign({ actor: ctx, trialId, input });
  return NextResponse.json({ ...r.trial, allocationCleared: r.allocationCleared });
});
