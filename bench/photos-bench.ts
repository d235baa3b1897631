// Photo uploads: N photos of 5 MB through presigned URLs from a Node client (what the browser does)
// against the same bytes PUT directly with the SDK, both to the S3 store at the same concurrency.
// Target: presigned throughput ≥ 0.9 × direct. The presigned path never sends bytes through Next:
// with APP_URL and APP_PID set, URLs are presigned by the running app's /api/photos/presign (signed
// in as the demo technician) and the app process's CPU time is measured over the run.
// Run: node --conditions=react-server --import tsx bench/photos-bench.ts
//      PHOTOS_BENCH_COUNT=200 PHOTOS_BENCH_MB=5 PHOTOS_BENCH_CONCURRENCY=8 APP_URL=… APP_PID=…
import { createHash, randomBytes, randomUUID } from "node:crypto";
import fs from "node:fs";
import http from "node:http";
import https from "node:https";
import { pathToFileURL } from "node:url";
import { and, eq, isNotNull } from "drizzle-orm";
import { closeDb, db } from "@/db/client";
import * as s from "@/db/schema";
import { photoKey } from "@/storage/keys";
import { presignPut } from "@/storage/presign";
import { deleteKeys, putObject } from "@/storage/objects";

export type PhotosBenchResult = {
  photos: number;
  sizeBytes: number;
  concurrency: number;
  presignedMBps: number;
  directMBps: number;
  ratio: number;
  target: number;
  withinTarget: boolean;
  signedBy: "app" | "in-process";
  /** CPU seconds the app process used during the presigned run (only with APP_PID). */
  appCpuS: number | null;
  presignCpuUsPerUrl: number;
};

type Signed = { key: string; url: string; headers: Record<string, string> };
const sha256Hex = (body: Buffer) => createHash("sha256").update(body).digest("hex");

const MB = 1024 * 1024;

/** utime + stime of a process and its direct children (the app's cluster workers) in seconds, from /proc (Linux). */
function cpuSeconds(pid: number): number {
  const stat = (p: string) => {
    const text = fs.readFileSync(`/proc/${p}/stat`, "utf8");
    return text.slice(text.lastIndexOf(")") + 2).split(" ");
  };
  let total = 0;
  for (const p of fs.readdirSync("/proc").filter((d) => /^\d+$/.test(d))) {
    try {
      const f = stat(p);
      if (Number(p) === pid || Number(f[1]) === pid) total += (Number(f[11]) + Number(f[12])) / 100; // USER_HZ is 100 on Linux
    } catch {
      // the process ended while we looked
    }
  }
  return total;
}

// One keep-alive agent per scheme, as a browser keeps its connections to the storage host.
const agents = { "http:": new http.Agent({ keepAlive: true, maxSockets: 64 }), "https:": new https.Agent({ keepAlive: true, maxSockets: 64 }) };

/** PUT through a presigned URL with plain node:http (the SDK's own transport), so only the URL differs. */
function putPresigned(signed: Signed, body: Buffer): Promise<{ status: number; text: string }> {
  const url = new URL(signed.url);
  const lib = url.protocol === "https:" ? https : http;
  return new Promise((resolve, reject) => {
    const req = lib.request(url, { method: "PUT", agent: agents[url.protocol as "http:" | "https:"], headers: { ...signed.headers, "Content-Length": String(body.byteLength) } }, (res) => {
      let text = "";
      res.setEncoding("utf8");
      res.on("data", (c: string) => (text += c));
      res.on("end", () => resolve({ status: res.statusCode ?? 0, text }));
    });
    req.on("error", reject);
    req.end(body);
  });
}

async function pool<T>(items: T[], concurrency: number, fn: (item: T, i: number) => Promise<void>) {
  let next = 0;
  await Promise.all(Array.from({ length: concurrency }, async () => {
    while (next < items.length) {
      const i = next++;
      await fn(items[i], i);
    }
  }));
}

/** Bodies that start like a JPEG; a few distinct buffers reused so 1 GB need not sit in memory. */
function payloads(sizeBytes: number, distinct: number): Buffer[] {
  return Array.from({ length: distinct }, () => {
    const b = randomBytes(sizeBytes);
    b[0] = 0xff; b[1] = 0xd8; b[2] = 0xff;
    return b;
  });
}

async function appSigner(appUrl: string) {
  const { signedInClient } = await import("../tests/support/http");
  const client = await signedInClient("technician@tarrow.example", process.env.DEMO_PASSWORD ?? "rustline-demo-1");
  const [target] = await db
    .select({ inspectionId: s.inspections.id, specimenId: s.placements.specimenId })
    .from(s.inspections)
    .innerJoin(s.trials, eq(s.trials.id, s.inspections.trialId))
    .innerJoin(s.placements, eq(s.placements.trialId, s.trials.id))
    .where(and(eq(s.trials.status, "running"), isNotNull(s.inspections.doneAt)))
    .limit(1);
  if (!target) throw new Error(`no running trial with a done inspection behind ${appUrl}`);
  return async (body: Buffer): Promise<Signed> => {
    const res = await client.fetch("/api/photos/presign", {
      method: "POST",
      headers: { "content-type": "application/json" },
      body: JSON.stringify({ ...target, filename: "bench.jpg", contentType: "image/jpeg", sizeBytes: body.byteLength, sha256: sha256Hex(body) }),
    });
    if (!res.ok) throw new Error(`presign via the app answered ${res.status}: ${await res.text()}`);
    const r = (await res.json()) as { key: string; upload: { url: string; headers: Record<string, string> } };
    return { key: r.key, url: r.upload.url, headers: r.upload.headers };
  };
}

export async function runPhotosBench(opts: { count?: number; sizeBytes?: number; concurrency?: number; appUrl?: string; appPid?: number } = {}): Promise<PhotosBenchResult> {
  const count = opts.count ?? Number(process.env.PHOTOS_BENCH_COUNT ?? 200);
  const sizeBytes = opts.sizeBytes ?? Math.round(Number(process.env.PHOTOS_BENCH_MB ?? 5) * MB);
  const concurrency = opts.concurrency ?? Number(process.env.PHOTOS_BENCH_CONCURRENCY ?? 8);
  const appPid = opts.appPid ?? (process.env.APP_PID ? Number(process.env.APP_PID) : undefined);
  const appUrl = opts.appUrl ?? process.env.APP_URL;
  const labId = `bench-${randomUUID().slice(0, 8)}`;
  const bodies = payloads(sizeBytes, Math.min(8, count));
  const written: string[] = [];

  const useApp = Boolean(appPid && appUrl);
  const sign = useApp ? await appSigner(appUrl!) : async (body: Buffer): Promise<Signed> => {
    const key = photoKey({ labId, photoId: randomUUID(), ext: "jpg" });
    const up = await presignPut({ key, contentType: "image/jpeg", contentLength: body.byteLength, sha256: sha256Hex(body), expiresInS: 300 });
    return { key, url: up.url, headers: up.headers };
  };

  // In-process signing cost, for the record (what the app spends per upload).
  const c0 = process.cpuUsage();
  for (let i = 0; i < 200; i++) await presignPut({ key: photoKey({ labId, photoId: randomUUID(), ext: "jpg" }), contentType: "image/jpeg", contentLength: sizeBytes });
  const cu = process.cpuUsage(c0);
  const presignCpuUsPerUrl = (cu.user + cu.system) / 200;

  // Warm both paths (connections, the store's folders).
  await pool(bodies, concurrency, async (b) => {
    const sg = await sign(b);
    written.push(sg.key);
    await putPresigned(sg, b);
    const k = photoKey({ labId, photoId: randomUUID(), ext: "jpg" });
    written.push(k);
    await putObject({ key: k, body: b, contentType: "image/jpeg" });
  });

  // Alternate the two paths in rounds so drift in the machine's load hits both alike.
  const rounds = Math.max(1, Math.min(4, Math.floor(count / (concurrency * 2))));
  let presignedS = 0;
  let directS = 0;
  let appCpuS: number | null = appPid ? 0 : null;
  const presigned = async (items: Buffer[]) => {
    const cpuBefore = appPid ? cpuSeconds(appPid) : 0;
    const t = performance.now();
    // Like a browser with a queue of files, URLs for the next files are requested while earlier
    // ones upload (two signing requests at a time), so the signing round trip is not idle time.
    const signed: Promise<Signed>[] = [];
    const chain: Promise<unknown>[] = [Promise.resolve(), Promise.resolve()];
    items.forEach((b, i) => {
      const p = chain[i % 2].then(() => sign(b));
      chain[i % 2] = p.catch(() => undefined);
      signed.push(p);
    });
    let next = 0;
    await pool(items, concurrency, async (b) => {
      const sg = await signed[next++];
      written.push(sg.key);
      const res = await putPresigned(sg, b);
      if (res.status !== 200) throw new Error(`presigned PUT answered ${res.status}: ${res.text}`);
    });
    presignedS += (performance.now() - t) / 1000;
    if (appPid && appCpuS != null) appCpuS += cpuSeconds(appPid) - cpuBefore;
  };
  const direct = async (items: Buffer[]) => {
    const t = performance.now();
    await pool(items, concurrency, async (b) => {
      const key = photoKey({ labId, photoId: randomUUID(), ext: "jpg" });
      written.push(key);
      await putObject({ key, body: b, contentType: "image/jpeg" });
    });
    directS += (performance.now() - t) / 1000;
  };
  for (let r = 0; r < rounds; r++) {
    const from = Math.floor((r * count) / rounds);
    const items = Array.from({ length: Math.floor(((r + 1) * count) / rounds) - from }, (_, i) => bodies[(from + i) % bodies.length]);
    if (r % 2 === 0) { await presigned(items); await direct(items); } else { await direct(items); await presigned(items); }
  }

  await deleteKeys(written);
  for (const a of Object.values(agents)) a.destroy();
  const totalMB = (count * sizeBytes) / MB;
  const presignedMBps = totalMB / presignedS;
  const directMBps = totalMB / directS;
  const ratio = presignedMBps / directMBps;
  return { photos: count, sizeBytes, concurrency, presignedMBps, directMBps, ratio, target: 0.9, withinTarget: ratio >= 0.9, signedBy: useApp ? "app" : "in-process", appCpuS, presignCpuUsPerUrl };
}

if (process.argv[1] && import.meta.url === pathToFileURL(process.argv[1]).href) {
  runPhotosBench()
    .then((r) => {
      const mb = (r.photos * r.sizeBytes) / MB;
      console.log(`photos bench: ${r.photos} photos × ${(r.sizeBytes / MB).toFixed(1)} MB = ${mb.toFixed(0)} MB, ${r.concurrency} at a time`);
      console.log(`  presigned PUT (${r.signedBy === "app" ? "URLs from the app's /api/photos/presign" : "URLs signed in-process"}): ${r.presignedMBps.toFixed(1)} MB/s`);
      console.log(`  direct SDK PutObject:                 ${r.directMBps.toFixed(1)} MB/s`);
      console.log(`  ratio presigned / direct: ${r.ratio.toFixed(2)} (target ≥ ${r.target}) ${r.withinTarget ? "✓" : "✗ below target"}`);
      console.log(`  signing one URL costs ${r.presignCpuUsPerUrl.toFixed(0)} µs of CPU in-process`);
      if (r.appCpuS != null) {
        console.log(`  app server CPU during the presigned run: ${r.appCpuS.toFixed(2)} s for ${mb.toFixed(0)} MB (${((r.appCpuS * 1000) / r.photos).toFixed(1)} ms per upload) — it signs, the bytes go straight to storage`);
      } else {
        console.log("  the presigned path bypasses the app by design: the client PUTs straight to storage and the app only signs URLs");
        console.log("  (set APP_URL and APP_PID to presign through a running app and measure its CPU)");
      }
    })
    .catch((err) => {
      console.error(err);
      process.exitCode = 1;
    })
    .finally(() => closeDb());
}
