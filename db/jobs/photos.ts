// Photo jobs: previews (thumbnail 320 px, display 1600 px) made from the original by the queue, and
// the hourly sweep of uploads that were never finalised. No "server-only" marker: the worker and
// the seed (plain tsx) import this too.
import { and, eq, gt, inArray, like, lt } from "drizzle-orm";
import type PgBoss from "pg-boss";
import sharp from "sharp";
import { PHOTO_TYPES, isPhotoContentType, readPhotoConfig } from "@/lib/photos/config";
import { derivativeKey } from "@/storage/keys";
import { deleteKeys, getObjectBytes, headObject, listKeys, putObject } from "@/storage/objects";
import { db } from "../client";
import { photos } from "../schema";
import { getBoss, QUEUES } from "./queue";

export const DERIVATIVES = { thumb: 320, display: 1600 } as const;
export type DerivativeName = keyof typeof DERIVATIVES;
export type PhotoProcessJob = { photoId: string; labId: string };

export type Derivatives = {
  /** Size of the original once its EXIF orientation is applied. */
  width: number;
  height: number;
  images: Record<DerivativeName, Buffer>;
};

/**
 * JPEG previews with the EXIF orientation applied (`rotate()` with no angle) and no metadata:
 * sharp writes none unless asked, so GPS, camera serials and the rest stay in the original only.
 */
export async function makeDerivatives(original: Uint8Array): Promise<Derivatives> {
  const input = Buffer.from(original.buffer, original.byteOffset, original.byteLength);
  const meta = await sharp(input).metadata();
  if (!meta.width || !meta.height) throw new Error("the image has no size");
  const swap = (meta.orientation ?? 1) >= 5;
  const images = {} as Record<DerivativeName, Buffer>;
  for (const [name, px] of Object.entries(DERIVATIVES) as [DerivativeName, number][]) {
    images[name] = await sharp(input)
      .rotate()
      .resize({ width: px, height: px, fit: "inside", withoutEnlargement: true })
      .jpeg({ quality: name === "thumb" ? 78 : 85 })
      .toBuffer();
  }
  return { width: swap ? meta.height : meta.width, height: swap ? meta.width : meta.height, images };
}

/** Store the previews beside the original; returns { thumb: key, display: key }. */
export async function storeDerivatives(objectKey: string, d: Derivatives): Promise<Record<DerivativeName, string>> {
  const keys = {} as Record<DerivativeName, string>;
  await Promise.all((Object.keys(DERIVATIVES) as DerivativeName[]).map(async (name) => {
    keys[name] = derivativeKey(objectKey, DERIVATIVES[name], "jpg");
    await putObject({ key: keys[name], body: d.images[name], contentType: "image/jpeg" });
  }));
  return keys;
}

async function markFailed(photoId: string, note: string) {
  await db.update(photos).set({ status: "failed", processingNote: note }).where(eq(photos.id, photoId));
}

/**
 * Make and record the previews of one photo. Idempotent: a ready photo is left alone. A file that
 * cannot be decoded is marked failed at once (retrying will not help); storage errors throw so the
 * queue retries.
 */
export async function processPhoto(job: PhotoProcessJob): Promise<"ready" | "already" | "failed" | "missing"> {
  const [p] = await db.select().from(photos).where(and(eq(photos.id, job.photoId), eq(photos.labId, job.labId)));
  if (!p) return "missing";
  if (p.status === "ready" && p.derivatives.thumb && p.derivatives.display) return "already";
  if (!isPhotoContentType(p.contentType) || !PHOTO_TYPES[p.contentType].previewable) {
    await markFailed(p.id, `No preview: this server cannot decode ${isPhotoContentType(p.contentType) ? PHOTO_TYPES[p.contentType].label : p.contentType} files. The original is kept; export a JPEG for scoring.`);
    return "failed";
  }
  const bytes = await getObjectBytes(p.objectKey);
  if (!bytes) {
    await markFailed(p.id, "The original file is missing from storage.");
    return "failed";
  }
  let d: Derivatives;
  try {
    d = await makeDerivatives(bytes);
  } catch (err) {
    console.error(`[photos] cannot decode ${p.id}:`, (err as Error).message);
    await markFailed(p.id, "No preview: the file could not be decoded as an image. The original is kept.");
    return "failed";
  }
  const keys = await storeDerivatives(p.objectKey, d);
  await db.update(photos).set({ derivatives: keys, width: d.width, height: d.height, status: "ready", processingNote: null }).where(eq(photos.id, p.id));
  return "ready";
}

export async function enqueuePhotoProcess(job: PhotoProcessJob): Promise<void> {
  const boss = await getBoss();
  await boss.send(QUEUES.photoProcess, job, { retryLimit: 5, retryDelay: 15, retryBackoff: true, expireInSeconds: 600 });
}

const PHOTO_FOLDER = /^(labs\/[^/]+\/photos\/[^/]+)\//;

export type SweepResult = { scanned: number; deleted: string[]; kept: number; requeued: number };

/**
 * Delete objects under labs/<lab>/photos/ that belong to no photo row and are older than the
 * orphan age (default 1 h): uploads that were approved but never finalised, or refused. A folder
 * belongs to a row when the row's original key is in it (previews sit in its derived/ subfolder).
 */
export async function sweepOrphanPhotos({
  now = new Date(),
  olderThanMs = readPhotoConfig().orphanAgeMs,
  prefix = "labs/",
  enqueue = enqueuePhotoProcess,
}: { now?: Date; olderThanMs?: number; prefix?: string; enqueue?: (job: PhotoProcessJob) => Promise<void> } = {}): Promise<SweepResult> {
  const keys = (await listKeys(prefix)).filter((k) => PHOTO_FOLDER.test(k));
  const folders = new Map<string, string[]>();
  for (const k of keys) {
    const folder = k.match(PHOTO_FOLDER)![1];
    folders.set(folder, [...(folders.get(folder) ?? []), k]);
  }
  const originals = keys.filter((k) => !k.includes("/derived/"));
  const owned = new Set<string>();
  for (let i = 0; i < originals.length; i += 500) {
    const rows = await db.select({ key: photos.objectKey }).from(photos).where(inArray(photos.objectKey, originals.slice(i, i + 500)));
    for (const r of rows) owned.add(r.key.match(PHOTO_FOLDER)?.[1] ?? "");
  }
  const doomed: string[] = [];
  for (const [folder, folderKeys] of folders) {
    if (owned.has(folder)) continue;
    if (!folderKeys.some((k) => !k.includes("/derived/"))) {
      // Only previews left: make sure no row points into the folder before calling them orphans.
      const [row] = await db.select({ id: photos.id }).from(photos).where(like(photos.objectKey, `${folder}/%`)).limit(1);
      if (row) continue;
    }
    for (const k of folderKeys) {
      const info = await headObject(k);
      if (info?.lastModified && now.getTime() - info.lastModified.getTime() > olderThanMs) doomed.push(k);
    }
  }
  if (doomed.length) await deleteKeys(doomed);
  const labOnly = prefix.match(/^labs\/([0-9a-f-]{36})\//)?.[1];
  const requeued = await requeueStalePhotos(now, enqueue, labOnly);
  return { scanned: keys.length, deleted: doomed, kept: keys.length - doomed.length, requeued };
}

/** Photos still pending ten minutes after upload (queue down, worker restarted) get another job, for a week. */
async function requeueStalePhotos(now: Date, enqueue: (job: PhotoProcessJob) => Promise<void>, labId?: string): Promise<number> {
  const stale = await db.select({ photoId: photos.id, labId: photos.labId }).from(photos)
    .where(and(eq(photos.status, "pending"), lt(photos.createdAt, new Date(now.getTime() - 10 * 60_000)), gt(photos.createdAt, new Date(now.getTime() - 7 * 86_400_000)), labId ? eq(photos.labId, labId) : undefined))
    .limit(500);
  for (const s of stale) await enqueue(s);
  return stale.length;
}

/** Called once by scripts/worker.ts. */
export async function registerPhotoJobs(boss: PgBoss, pollS: number): Promise<void> {
  const pollingIntervalSeconds = Math.max(0.5, pollS);
  await boss.work<PhotoProcessJob>(QUEUES.photoProcess, { pollingIntervalSeconds }, async (jobs) => {
    for (const job of jobs) {
      const r = await processPhoto(job.data);
      console.log(`[worker] photo ${job.data.photoId}: ${r}`);
    }
  });
  await boss.work(QUEUES.orphanSweep, { pollingIntervalSeconds }, async () => {
    const r = await sweepOrphanPhotos();
    if (r.deleted.length || r.requeued) console.log(`[worker] photo sweep: ${r.deleted.length} orphan object(s) deleted, ${r.requeued} photo(s) requeued`);
  });
  await boss.schedule(QUEUES.orphanSweep, "17 * * * *");
}
