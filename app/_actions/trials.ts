"use server";
// Trial design, allocation and lifecycle actions. Each is a thin wrapper: the permission here and
// the same check plus the draft/running/concluded rules in db/queries, so the API behaves the same.
import { allocateTrial, swapAllocation } from "@/db/queries/trials-allocation";
import { addTrialNote, concludeTrial, moveSpecimen, startTrial } from "@/db/queries/trials-lifecycle";
import { createTrial, updateTrialDesign, updateTrialTeam } from "@/db/queries/trials";
import { labAction, revalidate } from "@/lib/auth/action";
import { TEAM_FIELDS } from "@/lib/trials/team";
import {
  allocationSchema, concludeSchema, moveSchema, noteSchema, protocolSchema, scorersSchema, startSchema, swapSchema, techniciansSchema,
  trialEditFormSchema, trialFormSchema,
} from "@/lib/validation/trials";

const refresh = (trialId: string) => {
  revalidate("/trials");
  revalidate(`/trials/${trialId}`);
};

export const createTrialAction = labAction("trials.write", trialFormSchema, async (ctx, data) => {
  const t = await createTrial({ actor: ctx, input: data });
  revalidate("/trials");
  return { message: `Trial "${t.title}" drafted. Next: allocate specimens.`, data: { id: t.id } };
});

export const updateTrialAction = labAction("trials.write", trialEditFormSchema, async (ctx, { trialId, ...input }) => {
  const r = await updateTrialDesign({ actor: ctx, trialId, input });
  refresh(trialId);
  return { message: r.allocationCleared ? "Design saved. The arms or replicates changed, so the allocation was discarded; allocate again." : "Design saved.", data: { id: trialId } };
});

export const allocateAction = labAction("trials.write", allocationSchema, async (ctx, d) => {
  const r = await allocateTrial({ actor: ctx, trialId: d.trialId, specimenIds: d.specimenIds, seed: d.seed, blockByMaterial: d.blockByMaterial, blockFactors: d.blockFactors });
  refresh(d.trialId);
  return { message: `Allocated ${r.assigned} specimens with seed "${d.seed}"${r.unallocated ? `; ${r.unallocated} left over` : ""}.` };
});

export const swapAction = labAction("trials.write", swapSchema, async (ctx, d) => {
  await swapAllocation({ actor: ctx, ...d });
  refresh(d.trialId);
  return { message: "Swapped; the reason is in the audit trail." };
});

export const startTrialAction = labAction("trials.write", startSchema, async (ctx, d) => {
  const r = await startTrial({ actor: ctx, trialId: d.trialId, startAt: d.startAt });
  refresh(d.trialId);
  revalidate("/due");
  return { message: `Trial started: ${r.placements} specimens placed, ${r.inspections} inspections planned.` };
});

export const concludeTrialAction = labAction("trials.conclude", concludeSchema, async (ctx, d) => {
  await concludeTrial({ actor: ctx, trialId: d.trialId, note: d.note });
  refresh(d.trialId);
  return { message: "Trial concluded. Its record is locked; notes can still be added." };
});

export const addNoteAction = labAction("trials.notes", noteSchema, async (ctx, d) => {
  await addTrialNote({ actor: ctx, trialId: d.trialId, body: d.body });
  refresh(d.trialId);
  return { message: "Note added." };
});

export const moveSpecimenAction = labAction("trials.write", moveSchema, async (ctx, d) => {
  const r = await moveSpecimen({ actor: ctx, trialId: d.trialId, specimenId: d.specimenId, armId: d.armId, at: d.at, reason: d.reason });
  refresh(d.trialId);
  return { message: r.opened ? "Specimen moved; the old placement is closed." : "Specimen taken out of the trial." };
});

export const updateScorersAction = labAction(TEAM_FIELDS.scorers.change, scorersSchema, async (ctx, d) => {
  await updateTrialTeam({ actor: ctx, trialId: d.trialId, scorers: d.scorers, scoreRule: d.scoreRule, primaryScorerId: d.primaryScorerId });
  refresh(d.trialId);
  return { message: "Scorers saved." };
});

export const updateTechniciansAction = labAction(TEAM_FIELDS.technicianIds.change, techniciansSchema, async (ctx, d) => {
  await updateTrialTeam({ actor: ctx, trialId: d.trialId, technicianIds: d.technicianIds });
  refresh(d.trialId);
  return { message: "Technicians saved. They get the inspection reminders." };
});

export const updateProtocolAction = labAction(TEAM_FIELDS.photoProtocol.change, protocolSchema, async (ctx, d) => {
  await updateTrialTeam({ actor: ctx, trialId: d.trialId, photoProtocol: d.photoProtocol });
  refresh(d.trialId);
  return { message: "Photo protocol saved." };
});
