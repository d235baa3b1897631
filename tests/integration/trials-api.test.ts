// The JSON API over HTTP against the running app (APP_URL), signed in as the demo researcher:
// specimens and treatments, a trial from design to start, the inspection list and marking one done.
import crypto from "node:crypto";
import { eq } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeDb, db } from "@/db/client";
import * as s from "@/db/schema";
import { demoLab } from "@/experiments/demo-lab";
import { signedInClient, type Client } from "../support/http";

let researcher: Client;
let technician: Client;
let observer: Client;
let chamberIds: string[];
const tag = crypto.randomBytes(3).toString("hex").toUpperCase();
const json = (body: unknown, method = "POST") => ({ method, headers: { "content-type": "application/json" }, body: JSON.stringify(body) });

beforeAll(async () => {
  researcher = await signedInClient("researcher@tarrow.example", "rustline-demo-1");
  technician = await signedInClient("technician@tarrow.example", "rustline-demo-1");
  observer = await signedInClient("observer@tarrow.example", "rustline-demo-1");
  const [lab] = await db.select().from(s.labs).where(eq(s.labs.name, demoLab.name));
  chamberIds = (await db.select().from(s.chambers).where(eq(s.chambers.labId, lab.id))).slice(0, 2).map((c) => c.id);
}, 60_000);
afterAll(() => closeDb());

describe("JSON API", () => {
  it("specimens: create, validation errors by field, pagination, patch, 404 for unknown ids", async () => {
    const bad = await researcher.fetch("/api/specimens", json({ label: "", materialClass: "moon rock", massG: -1 }));
    expect(bad.status).toBe(422);
    const badBody = await bad.json();
    expect(Object.keys(badBody.error.fields).sort()).toEqual(["label", "massG", "materialClass"]);
    const ids: string[] = [];
    for (const i of [1, 2, 3]) {
      const r = await researcher.fetch("/api/specimens", json({ label: `API-${tag}-${i}`, materialClass: "steel-coupon", massG: 5 + i }));
      expect(r.status).toBe(201);
      ids.push((await r.json()).id);
    }
    expect((await researcher.fetch("/api/specimens", json({ label: `api-${tag}-1`, materialClass: "other" }))).status).toBe(409);
    const page = await (await observer.fetch(`/api/specimens?q=API-${tag}&sort=massG&dir=desc&pageSize=2&page=1`)).json();
    expect(page).toMatchObject({ total: 3, page: 1, pageSize: 2 });
    expect(page.items.map((x: { label: string }) => x.label)).toEqual([`API-${tag}-3`, `API-${tag}-2`]);
    const patched = await researcher.fetch(`/api/specimens/${ids[0]}`, json({ massG: null, contaminationNotes: "soil salts" }, "PATCH"));
    expect(await patched.json()).toMatchObject({ massG: null, contaminationNotes: "soil salts", label: `API-${tag}-1` });
    expect((await technician.fetch(`/api/specimens/${ids[0]}`, json({ face: "x" }, "PATCH"))).status).toBe(403);
    expect((await observer.fetch(`/api/specimens/${crypto.randomUUID()}`)).status).toBe(404);
    expect((await observer.fetch("/api/specimens/not-a-uuid")).status).toBe(404);
    const csv = await (await observer.fetch(`/api/specimens/export?q=API-${tag}`)).text();
    expect(csv.split("\r\n")[0]).toBe("label,material_class,find_name,face,description,surface_prep,mass_g,history,parent_piece,slice,provenance,contamination_notes,accession_number,treatments_applied,chloride_state,storage_notes,location");
    expect(csv).toContain(`API-${tag}-2,steel-coupon`);
  });

  it("a trial from design to start, then its open inspections and marking one done", async () => {
    const treatments: string[] = [];
    for (const name of [`Bare ${tag}`, `Wax ${tag}`]) {
      const r = await researcher.fetch("/api/treatments", json({ name, kind: name.startsWith("Bare") ? "control" : "coating" }));
      expect(r.status).toBe(201);
      treatments.push((await r.json()).id);
    }
    const specimens: string[] = [];
    for (const i of [1, 2, 3, 4, 5]) {
      const r = await researcher.fetch("/api/specimens", json({ label: `APIT-${tag}-${i}`, materialClass: i % 2 ? "iron-meteorite" : "stony-iron" }));
      specimens.push((await r.json()).id);
    }
    const design = { title: `API trial ${tag}`, question: "Does wax delay first rust at two humidities?", chamberIds, treatmentIds: treatments, replicatesPerArm: 1, plan: { kind: "custom", days: [0, 3, 10] } };
    expect((await technician.fetch("/api/trials", json(design))).status).toBe(403);
    const withScorers = await researcher.fetch("/api/trials", json({ ...design, scorers: [] }));
    expect(withScorers.status).toBe(403); // scorer assignment is the lead's
    const created = await researcher.fetch("/api/trials", json(design));
    expect(created.status).toBe(201);
    const trial = await created.json();

    const alloc = await researcher.fetch(`/api/trials/${trial.id}/allocation`, json({ specimenIds: specimens, seed: `api-${tag}` }));
    const allocBody = await alloc.json();
    expect(allocBody).toMatchObject({ seed: `api-${tag}`, assigned: 4, unallocated: 1 });
    const patch = await researcher.fetch(`/api/trials/${trial.id}`, json({ hypothesis: "Wax delays it." }, "PATCH"));
    expect(await patch.json()).toMatchObject({ hypothesis: "Wax delays it.", allocationCleared: false });

    const started = await researcher.fetch(`/api/trials/${trial.id}/start`, json({}));
    expect(await started.json()).toMatchObject({ status: "running", placements: 4, inspections: 3 });
    expect((await researcher.fetch(`/api/trials/${trial.id}`, json({ hypothesis: "changed" }, "PATCH"))).status).toBe(409);

    const open = await (await observer.fetch(`/api/inspections?trialId=${trial.id}&status=open`)).json();
    expect(open.items.map((i: { dayNumber: number }) => i.dayNumber)).toEqual([0, 3, 10]);
    expect(open.items[0].status).toBe("due");
    const day0 = open.items[0].id;
    const detail = await (await observer.fetch(`/api/inspections/${day0}`)).json();
    expect(detail.specimens).toHaveLength(4);
    expect((await technician.fetch(`/api/inspections/${day0}`, json({ action: "reschedule", plannedAt: new Date().toISOString(), reason: "not mine to move" }, "PATCH"))).status).toBe(403);
    const done = await technician.fetch(`/api/inspections/${day0}`, json({ action: "done", notes: "baseline photos taken" }, "PATCH"));
    expect(done.status).toBe(200);
    const after = await (await observer.fetch(`/api/inspections?trialId=${trial.id}&status=done`)).json();
    expect(after.items.map((i: { id: string; notes: string }) => [i.id, i.notes])).toEqual([[day0, "baseline photos taken"]]);

    const placements = await (await observer.fetch(`/api/trials/${trial.id}/placements`)).json();
    expect(placements.items).toHaveLength(4);
    const note = await technician.fetch(`/api/trials/${trial.id}/notes`, json({ body: "Jar B lid re-greased." }));
    expect(note.status).toBe(201);
    expect((await researcher.fetch(`/api/trials/${trial.id}/conclude`, json({}))).status).toBe(403);
  }, 60_000);

  it("a blind scorer gets the demo trial's placements and allocation without chambers or treatments", async () => {
    const blindScorer = await signedInClient("scorer@tarrow.example", "rustline-demo-1"); // blind scorer in the demo seed
    const [demo] = await db.select().from(s.trials).where(eq(s.trials.title, "Storage humidity × surface treatment, 2026 slices"));
    const seen = await (await technician.fetch(`/api/trials/${demo.id}/placements`)).json();
    expect(seen.items.length).toBeGreaterThan(0);
    expect(seen.items.every((p: { chamberName: string | null; treatmentName: string | null }) => p.chamberName && p.treatmentName)).toBe(true);
    const hidden = await (await blindScorer.fetch(`/api/trials/${demo.id}/placements`)).json();
    expect(hidden.items).toHaveLength(seen.items.length);
    expect(hidden.items.every((p: { chamberName: string | null; treatmentName: string | null; armId: string | null; blinded: boolean }) => !p.chamberName && !p.treatmentName && !p.armId && p.blinded)).toBe(true);
    const detail = await (await blindScorer.fetch(`/api/trials/${demo.id}`)).json();
    expect(detail.viewerBlind).toBe(true);
    expect(JSON.stringify(detail.allocation)).not.toMatch(/Uncoated control|Microcrystalline wax|Acrylic lacquer/);
  });
});
