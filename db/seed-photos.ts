// Demo photos for the seeded trial: one synthetic photo per specimen per done inspection, whose rust
// spots grow with the seeded score of record (so a scorer's marks or the colour estimate land near
// the recorded area), with EXIF capture time at the inspection, uploaded to the S3 store with
// previews made inline so the demo is complete when the seed ends. Images and times are
// deterministic; object keys keep their random folder like any upload.
import { createHash } from "node:crypto";
import { and, asc, eq, isNotNull } from "drizzle-orm";
import sharp from "sharp";
import { renderSpecimenFace, specimenFaceOutline, type SpecimenKind } from "@/lib/demo-images/specimen-face";
import { createSpotPlanner, type SpotPlanner } from "@/lib/photos/demo-spots";
import { extractPhotoExif } from "@/lib/photos/exif";
import { photoKey } from "@/storage/keys";
import { putObject } from "@/storage/objects";
import { recordAudit } from "./audit";
import { db } from "./client";
import { makeDerivatives, storeDerivatives } from "./jobs/photos";
import * as s from "./schema";

const WIDTH = 1200;
const HEIGHT = 900;
// The copy stand's fixed framing: 12 px per mm at the specimen face (invented), with a 10 mm bar in frame.
const PX_PER_MM = 12;
const IN_FLIGHT = 4;
// The invented lab keeps its clocks at UTC+01:00; the camera records that offset.
const OFFSET = "+01:00";
const OFFSET_MS = 3_600_000;
// An invented spot at sea, so the demo shows what happens to a photo's location (hidden, stripped).
const GPS = { GPSLatitudeRef: "N", GPSLatitude: "54/1 0/1 0/1", GPSLongitudeRef: "W", GPSLongitude: "3/1 30/1 0/1" };

type SeedIds = { labId: string; trialId: string; technicianId: string; start: Date };

/** A stable id per (lab, specimen, inspection) so re-running the generator names the same photo. */
function stableUuid(text: string): string {
  const h = createHash("sha256").update(text).digest("hex");
  return `${h.slice(0, 8)}-${h.slice(8, 12)}-4${h.slice(13, 16)}-${((parseInt(h[16], 16) & 3) | 8).toString(16)}${h.slice(17, 20)}-${h.slice(20, 32)}`;
}

function exifLocal(at: Date): string {
  const local = new Date(at.getTime() + OFFSET_MS).toISOString();
  return `${local.slice(0, 10).replace(/-/g, ":")} ${local.slice(11, 19)}`;
}

export async function seedDemoPhotos(ids: SeedIds): Promise<number> {
  const t0 = Date.now();
  const existing = await db.select({ id: s.photos.id }).from(s.photos).where(eq(s.photos.trialId, ids.trialId)).limit(1);
  if (existing.length) {
    console.log("[seed] demo trial already has photos; leaving them");
    return 0;
  }
  const inspections = await db.select().from(s.inspections)
    .where(and(eq(s.inspections.trialId, ids.trialId), isNotNull(s.inspections.doneAt))).orderBy(asc(s.inspections.plannedAt));
  const placed = await db.selectDistinct({ id: s.specimens.id, label: s.specimens.label, materialClass: s.specimens.materialClass })
    .from(s.placements).innerJoin(s.specimens, eq(s.specimens.id, s.placements.specimenId))
    .where(eq(s.placements.trialId, ids.trialId));
  placed.sort((a, b) => a.label.localeCompare(b.label, undefined, { numeric: true }));
  const record = await db.select({ inspectionId: s.scores.inspectionId, specimenId: s.scores.specimenId, areaPercent: s.scores.areaPercent })
    .from(s.scores).where(and(eq(s.scores.trialId, ids.trialId), eq(s.scores.isRecord, true)));
  const areaBy = new Map(record.map((r) => [`${r.inspectionId}:${r.specimenId}`, r.areaPercent]));

  const total = placed.length * inspections.length;
  const rows: (typeof s.photos.$inferInsert)[] = [];
  const inFlight = new Set<Promise<void>>();
  const bars = new Map<string, { a: { x: number; y: number }; b: { x: number; y: number }; lengthMm: number }>();
  let wrongCardPhoto: string | null = null;
  let done = 0;
  let worstGap = 0;

  for (const [si, sp] of placed.entries()) {
    const kind: SpecimenKind = sp.materialClass === "stony-iron" ? "stony-iron" : "iron";
    const seed = `demo-photo:${sp.label}`;
    const planner: SpotPlanner = createSpotPlanner({ face: specimenFaceOutline(WIDTH, HEIGHT, seed), width: WIDTH, height: HEIGHT, seed });
    for (const [ii, insp] of inspections.entries()) {
      const area = areaBy.get(`${insp.id}:${sp.id}`) ?? 0;
      const spots = planner.spotsFor(area);
      // Rendering is synchronous; encoding and uploads of earlier photos run meanwhile.
      const img = renderSpecimenFace({ width: WIDTH, height: HEIGHT, seed, kind, rustSpots: spots, scaleBar: { pxPerMm: PX_PER_MM } });
      if (img.scaleBar && !bars.has(sp.id)) bars.set(sp.id, { a: img.scaleBar.a, b: img.scaleBar.b, lengthMm: img.scaleBar.lengthMm });
      worstGap = Math.max(worstGap, Math.abs(img.trueRustFraction * 100 - area));
      // Photographed a few minutes before the inspection was marked done; one photo of the set
      // carries the previous day's date, as if from the wrong memory card, to show the warning.
      const wrongCard = si === 4 && ii === Math.min(5, inspections.length - 1);
      const shotAt = new Date(insp.doneAt!.getTime() - (4 + ((si * 7 + ii * 3) % 11)) * 60_000 - (wrongCard ? 86_400_000 : 0));
      const photoId = stableUuid(`${ids.labId}:${sp.id}:${insp.id}`);
      const filename = `${sp.label}_day${String(insp.dayNumber).padStart(2, "0")}.jpg`;
      if (wrongCard) wrongCardPhoto = photoId;
      const task = (async () => {
        const jpeg = await sharp(Buffer.from(img.data.buffer, img.data.byteOffset, img.data.byteLength), { raw: { width: WIDTH, height: HEIGHT, channels: 4 } })
          .removeAlpha()
          .jpeg({ quality: 86 })
          .withExif({
            IFD0: { Make: "Demo Optics", Model: "Copy-stand camera A", Software: "Rustline demo generator" },
            IFD2: { DateTimeOriginal: exifLocal(shotAt), OffsetTimeOriginal: OFFSET, ExposureTime: "1/60", FNumber: "11/1", ISOSpeedRatings: "200", FocalLength: "60/1", LensModel: "60 mm macro" },
            IFD3: GPS,
          })
          .toBuffer();
        const key = photoKey({ labId: ids.labId, photoId, ext: "jpg" });
        const [exif, derived] = await Promise.all([extractPhotoExif(jpeg), makeDerivatives(jpeg), putObject({ key, body: jpeg, contentType: "image/jpeg" })]);
        const derivatives = await storeDerivatives(key, derived);
        rows.push({
          id: photoId, labId: ids.labId, trialId: ids.trialId, inspectionId: insp.id, specimenId: sp.id, objectKey: key, filename,
          status: "ready", contentType: "image/jpeg", sizeBytes: jpeg.byteLength, sha256: createHash("sha256").update(jpeg).digest("hex"),
          width: derived.width, height: derived.height, capturedAtRaw: exif.capturedAtRaw, capturedOffset: exif.capturedOffset, capturedAt: exif.capturedAt,
          camera: exif.camera, lens: exif.lens, exposure: exif.exposure, orientation: exif.orientation, gps: exif.gps, derivatives,
          uploadedBy: ids.technicianId, createdAt: new Date(insp.doneAt!.getTime() + 20 * 60_000),
        });
        done++;
        if (done % 24 === 0 || done === total) console.log(`[seed] demo photos ${done}/${total} (${((Date.now() - t0) / 1000).toFixed(1)} s)`);
      })();
      inFlight.add(task);
      task.finally(() => inFlight.delete(task)).catch(() => undefined);
      if (inFlight.size >= IN_FLIGHT) await Promise.race(inFlight);
    }
  }
  await Promise.all(inFlight);

  rows.sort((a, b) => a.filename.localeCompare(b.filename));
  await db.transaction(async (tx) => {
    for (let i = 0; i < rows.length; i += 100) await tx.insert(s.photos).values(rows.slice(i, i + 100));
    // Scores were made on these photos; link them so scoring pages can open the photo scored.
    for (const r of rows) {
      await tx.update(s.scores).set({ photoId: r.id! }).where(and(eq(s.scores.inspectionId, r.inspectionId!), eq(s.scores.specimenId, r.specimenId)));
    }
    // The protocol was followed for every photo but the one from the wrong memory card (its points are left
    // unconfirmed, so the grid and report flag it); the fixed framing gives each specimen's series one scale,
    // marked on the bar's ends in its first photo.
    const [trial] = await tx.select({ protocol: s.trials.photoProtocol }).from(s.trials).where(eq(s.trials.id, ids.trialId));
    for (let i = 0; i < rows.length; i += 100) {
      await tx.insert(s.photoEvidence).values(rows.slice(i, i + 100).map((r) => ({
        photoId: r.id!, labId: ids.labId, trialId: ids.trialId, protocolConfirmed: r.id === wrongCardPhoto ? [] : trial.protocol, recordedBy: ids.technicianId,
      })));
    }
    await tx.insert(s.seriesScales).values([...bars].map(([specimenId, bar]) => ({
      labId: ids.labId, trialId: ids.trialId, specimenId, pxPerMm: Math.hypot(bar.b.x - bar.a.x, bar.b.y - bar.a.y) / bar.lengthMm,
      scaleSource: { kind: "points" as const, a: bar.a, b: bar.b, lengthMm: bar.lengthMm }, setBy: ids.technicianId,
    })));
    await recordAudit(tx, { labId: ids.labId, userId: ids.technicianId, entity: "photo", entityId: ids.trialId, trialId: ids.trialId, action: "create", summary: `Demo photos loaded (${rows.length}) with their protocol points and series scales`, after: { photos: rows.length } });
  });
  console.log(`[seed] ${rows.length} demo photos with previews in ${((Date.now() - t0) / 1000).toFixed(1)} s (painted rust within ${worstGap.toFixed(2)} points of the scores)`);
  return rows.length;
}
