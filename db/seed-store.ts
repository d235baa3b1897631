// The demo's store (experiments/demo-store.ts): locations in the chamber tree, objects with their
// stays and six-hourly logger readings for the locations that have one.
import { demoLocations, demoObjects, demoStoreRh } from "@/experiments/demo-store";
import { eq } from "drizzle-orm";
import { recordAudit } from "./audit";
import type { Tx } from "./client";
import * as s from "./schema";

const DAY = 86_400_000;
const HOUR = 3_600_000;

export async function seedStore(tx: Tx, { labId, users, now }: { labId: string; users: Record<string, string>; now: Date }) {
  const ids: Record<string, string> = {};
  for (const l of demoLocations) {
    const [row] = await tx.insert(s.chambers).values({
      labId, name: l.name, kind: l.kind, locationKind: l.locationKind, parentId: l.parent ? ids[l.parent] : null, keeperId: l.keeper ? users[l.keeper] : null,
      saltId: l.saltId ?? null, desiccantKind: l.desiccantKind ?? null, desiccantMassG: l.desiccantMassG ?? null, nominalTempC: 16,
      setpointRhPercent: l.setpointRhPercent, toleranceRhPercent: l.toleranceRhPercent, createdBy: users.researcher,
    }).returning();
    ids[l.key] = row.id;
  }
  const start = new Date(Math.floor((now.getTime() - 90 * DAY) / HOUR) * HOUR);
  for (const l of demoLocations) {
    if (!l.climate) continue;
    const rows: (typeof s.readings.$inferInsert)[] = [];
    for (let h = 0; h <= 90 * 24; h += 6) rows.push({ labId, chamberId: ids[l.key], takenAt: new Date(start.getTime() + h * HOUR), rhPercent: demoStoreRh(l.climate, h), tempC: 16, source: "csv", instrument: `store-logger-${l.key}` });
    await tx.insert(s.readings).values(rows);
  }
  for (const o of demoObjects) {
    const [sp] = await tx.insert(s.specimens).values({
      labId, label: o.label, materialClass: "archaeological-iron", findName: o.findName, accessionNumber: o.accessionNumber, chlorideState: o.chlorideState,
      treatmentsApplied: o.treatmentsApplied, storageNotes: o.storageNotes, massG: o.massG, createdBy: users.researcher,
    }).returning();
    const at = (daysAgo: number) => new Date(Math.floor((now.getTime() - daysAgo * DAY) / HOUR) * HOUR);
    const stays = await tx.insert(s.objectLocations).values(o.stays.map((st, i) => ({
      labId, specimenId: sp.id, locationId: ids[st.at], fromAt: at(st.daysAgo), toAt: o.stays[i + 1] ? at(o.stays[i + 1].daysAgo) : null, reason: i === 0 ? "Store survey" : "Rehoused", createdBy: users.technician,
    }))).returning();
    for (const st of stays) await recordAudit(tx, { labId, userId: users.technician, entity: "object-location", entityId: st.id, action: "create", summary: `${o.label} placed (demo store)`, after: st });
  }
  // The store's keeper takes collection alerts as a daily digest (the demo's case and box run out of rule often).
  await tx.update(s.users).set({ collectionDigest: true }).where(eq(s.users.id, users.technician));
  // An entered storage rule for the store's archaeological iron (invented demo decision), so locations are judged.
  const [rule] = await tx.insert(s.storageRules).values({
    labId, materialClass: "archaeological-iron", treatmentName: "Any treatment", version: 1, thresholdRhPercent: 18, origin: "entered",
    source: "Tarrow conservation committee, store policy note 3", sourceDate: new Date(now.getTime() - 200 * DAY).toISOString().slice(0, 10),
    method: "Entered by hand from the source named.", statement: "Keep archaeological iron, any treatment, below 18 %RH (Tarrow conservation committee, store policy note 3).",
    note: "Demo rule.", acceptedBy: users.lead, acceptedAt: new Date(now.getTime() - 150 * DAY),
  }).returning();
  await recordAudit(tx, { labId, userId: users.lead, entity: "storage_rule", entityId: rule.id, action: "create", summary: "Storage rule entered: Archaeological iron, Any treatment below 18 %RH (version 1, demo)", after: rule });
  return ids;
}
