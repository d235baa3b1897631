// Collection care at scale: a lab of its own with LOCATIONS storage locations (10 rooms holding the
// rest as boxes), OBJECTS objects spread over them, two entered storage rules, and a reading every
// 10 minutes for DAYS days per location loaded by COPY (pg-copy-streams), which also fires the
// hourly-summary triggers. Then a location's page (one page again and again, and every location in
// turn), the collection overview and the lab home at CONNECTIONS concurrent connections (target: p95
// under 300 ms) and the alert scan once.
// Defaults are the scale (200 locations, 20,000 objects, a year ≈ 10.5 million readings);
// COLLECTION_LOCATIONS, COLLECTION_OBJECTS, COLLECTION_DAYS, LOAD_SECONDS and LOAD_CONNECTIONS scale it down.
// For working on the pages: COLLECTION_KEEP=1 leaves the bench lab in place (its id is printed) and
// COLLECTION_LAB=<id> measures that lab again without loading it (run the file by hand against a served app).
import { Readable } from "node:stream";
import { pipeline } from "node:stream/promises";
import { from as copyFrom } from "pg-copy-streams";
import { eq } from "drizzle-orm";
import { closeDb, db, getPool } from "@/db/client";
import { claimLocationAlerts } from "@/db/jobs/location-alerts";
import { refreshStaleLocationStatuses } from "@/db/queries/location-status";
import { SERIES_KEPT } from "@/db/queries/readings-series";
import * as s from "@/db/schema";
import { hashPassword } from "@/lib/auth/password";
import { signedInClient, APP_URL } from "../tests/support/http";
import { loadRun, percentiles } from "./support";

const LOCATIONS = Number(process.env.COLLECTION_LOCATIONS ?? 200);
const OBJECTS = Number(process.env.COLLECTION_OBJECTS ?? 20_000);
const DAYS = Number(process.env.COLLECTION_DAYS ?? 365);
const seconds = Number(process.env.LOAD_SECONDS ?? 20);
const connections = Number(process.env.LOAD_CONNECTIONS ?? 20);
const TARGET_MS = 300;
const STEP_MS = 10 * 60_000;
const PASSWORD = "collection-bench-1";

const secs = (t0: number) => ((performance.now() - t0) / 1000).toFixed(1);

/** Invented climate: a daily swing around a mean that differs per location, with now and then a wet spell. */
function rhAt(loc: number, i: number): number {
  const mean = 30 + (loc % 7) * 3;
  const daily = 4 * Math.sin((2 * Math.PI * (i % 144)) / 144);
  const spell = (i + loc * 997) % 4001 < 40 ? 15 : 0;
  return Math.round((mean + daily + spell) * 10) / 10;
}

async function setUp() {
  const t0 = performance.now();
  const [lab] = await db.insert(s.labs).values({ name: `Collection bench ${Date.now()}` }).returning();
  const [lead] = await db.insert(s.users).values({ name: "Bench keeper", email: `collection-bench-${lab.id.slice(0, 8)}@bench.example`, passwordHash: await hashPassword(PASSWORD) }).returning();
  await db.insert(s.memberships).values({ labId: lab.id, userId: lead.id, role: "lead" });
  const rooms = Math.min(10, LOCATIONS);
  const ids: string[] = [];
  for (let i = 0; i < LOCATIONS; i++) {
    const room = i < rooms;
    const [row] = await db.insert(s.chambers).values({
      labId: lab.id, name: room ? `Room ${i + 1}` : `Box ${i + 1}`, kind: room ? "open-shelf" : "desiccant", locationKind: room ? "room" : "sealed-box",
      parentId: room ? null : ids[i % rooms], keeperId: room ? lead.id : null, nominalTempC: 18, setpointRhPercent: 35, toleranceRhPercent: 10,
    }).returning({ id: s.chambers.id });
    ids.push(row.id);
  }
  await db.insert(s.storageRules).values([
    { labId: lab.id, materialClass: "archaeological-iron", treatmentName: "Any treatment", version: 1, thresholdRhPercent: 35, origin: "entered", source: "Bench rule A", sourceDate: "2024-01-01", method: "Entered by hand.", statement: "Bench rule A" },
    { labId: lab.id, materialClass: "iron-meteorite", treatmentName: "Any treatment", version: 1, thresholdRhPercent: 30, origin: "entered", source: "Bench rule B", sourceDate: "2024-01-01", method: "Entered by hand.", statement: "Bench rule B" },
  ]);
  const since = new Date(Date.now() - (DAYS + 1) * 86_400_000);
  for (let from = 0; from < OBJECTS; from += 2000) {
    const n = Math.min(2000, OBJECTS - from);
    const specimens = await db.insert(s.specimens).values(Array.from({ length: n }, (_, k) => ({
      labId: lab.id, label: `CB-${from + k + 1}`, materialClass: (from + k) % 3 === 0 ? "iron-meteorite" as const : "archaeological-iron" as const, findName: "Bench find",
    }))).returning({ id: s.specimens.id });
    await db.insert(s.objectLocations).values(specimens.map((sp, k) => ({ labId: lab.id, specimenId: sp.id, locationId: ids[(from + k) % LOCATIONS], fromAt: since })));
  }
  console.log(`set-up: ${LOCATIONS} locations, ${OBJECTS} objects in ${secs(t0)} s`);
  return { labId: lab.id, email: lead.email, ids };
}

async function copyReadings(labId: string, ids: string[]) {
  const perLocation = Math.floor((DAYS * 86_400_000) / STEP_MS);
  const start = Math.floor((Date.now() - DAYS * 86_400_000) / STEP_MS) * STEP_MS;
  const t0 = performance.now();
  const client = await getPool().connect();
  try {
    for (let loc = 0; loc < ids.length; loc++) {
      function* lines() {
        for (let i = 0; i < perLocation; i += 1000) {
          let chunk = "";
          for (let j = i; j < Math.min(perLocation, i + 1000); j++) chunk += `${labId}\t${ids[loc]}\t${new Date(start + j * STEP_MS).toISOString()}\t${rhAt(loc, j)}\t18\tcsv\t\n`;
          yield chunk;
        }
      }
      await pipeline(Readable.from(lines()), client.query(copyFrom("copy readings (lab_id, chamber_id, taken_at, rh_percent, temp_c, source, instrument) from stdin")));
      if ((loc + 1) % 20 === 0 || loc + 1 === ids.length) console.log(`  copied ${loc + 1}/${ids.length} locations (${((loc + 1) * perLocation).toLocaleString("en")} readings) in ${secs(t0)} s`);
    }
  } finally {
    client.release();
  }
  await db.execute("analyze readings");
  await db.execute("analyze reading_blocks");
  console.log(`readings: ${(ids.length * perLocation).toLocaleString("en")} by COPY (summaries kept by the triggers) in ${secs(t0)} s`);
}

/** A lab loaded by an earlier run with COLLECTION_KEEP=1. */
async function reuse(labId: string) {
  const [lead] = await db.select({ email: s.users.email }).from(s.memberships).innerJoin(s.users, eq(s.users.id, s.memberships.userId)).where(eq(s.memberships.labId, labId));
  if (!lead) throw new Error(`No bench lab ${labId}: load one with COLLECTION_KEEP=1 first.`);
  const rows = await db.select({ id: s.chambers.id }).from(s.chambers).where(eq(s.chambers.labId, labId)).orderBy(s.chambers.createdAt, s.chambers.name);
  console.log(`reusing lab ${labId}: ${rows.length} locations`);
  return { labId, email: lead.email, ids: rows.map((r) => r.id) };
}

async function run() {
  const reused = process.env.COLLECTION_LAB;
  console.log(`collection: ${LOCATIONS} locations, ${OBJECTS} objects, ${DAYS} days of 10-minute readings; ${connections} connections × ${seconds} s per page (target p95 < ${TARGET_MS} ms)`);
  const { labId, email, ids } = reused ? await reuse(reused) : await setUp();
  if (!reused) await copyReadings(labId, ids);
  const t0 = performance.now();
  const claimed = await claimLocationAlerts(new Date(), labId);
  console.log(`alert scan over every location: ${secs(t0)} s, ${claimed} alert(s) claimed`);
  // The worker's 10-minute scan also counts and stores every location's status; the pages read those.
  const t1 = performance.now();
  const counted = await refreshStaleLocationStatuses({ labId, maxAgeMs: 0 });
  console.log(`location statuses counted and stored, as the scan does: ${counted} in ${secs(t1)} s`);
  const client = await signedInClient(email, PASSWORD);
  // Two warming requests and five timed ones each first, then the load; the location page first, so the
  // overview's backlog does not count against it, and a pause after each load for the server to drain.
  // The lab home last, for scale: what the lightest page of the lab costs on the same machine.
  // A location's page twice: the same one again and again (its chart is computed once a minute and then
  // reused, db/queries/readings-series.ts getChamberSeriesReused), and each request another of the lab's
  // locations in turn (more than a process keeps, so the chart is computed for nearly every request).
  // One sequence of paths for the single requests, the warm-up and the timed run, so that none of them
  // asks for a location another has just asked for.
  let turn = 0;
  const anotherLocation = () => `/chambers/${ids[turn++ % ids.length]}`;
  if (ids.length <= 2 * SERIES_KEPT) console.log(`note: ${ids.length} locations, not many more than a process keeps charts for (${SERIES_KEPT}): "each another" reuses many charts`);
  const pages: [string, string, (() => string)?][] = [
    ["location page", `/chambers/${ids[ids.length - 1]}`], ["location, each another", "", anotherLocation],
    ["collection overview", "/collection/overview"], ["lab home (for scale)", "/"],
  ];
  for (const [name, fixed, nextPath] of pages) {
    const path = nextPath ? nextPath() : fixed;
    const single: number[] = [];
    for (let i = 0; i < 2; i++) await (await client.fetch(nextPath ? nextPath() : path)).text(); // warm the server's code for this page
    for (let i = 0; i < 5; i++) {
      const t = performance.now();
      const res = await client.fetch(nextPath ? nextPath() : path);
      await res.text();
      single.push(performance.now() - t);
    }
    const one = percentiles(single);
    // A few seconds of load first, untimed: the JIT compiles this page's code paths under load, as it
    // has on a server that has been up for a while.
    await loadRun({ url: `${APP_URL}${path}`, connections: Math.max(1, connections / 2), duration: Math.min(5, seconds), headers: { cookie: client.cookie }, nextPath });
    await new Promise((r) => setTimeout(r, 5_000));
    const r = await loadRun({ url: `${APP_URL}${path}`, connections, duration: seconds, headers: { cookie: client.cookie }, nextPath });
    const met = r.p95 < TARGET_MS && r.errors + r.non2xx === 0;
    await new Promise((r) => setTimeout(r, 15_000));
    const cpu = r.cpuMsPerRequest === null ? "" : `  machine CPU ${r.cpuMsPerRequest.toFixed(1)} ms per request (${r.cores} cores: at most ~${Math.round((r.cores * 1000) / r.cpuMsPerRequest)} req/s)`;
    console.log(`${name.padEnd(23)} alone p50 ${one.p50.toFixed(0)} ms; at ${connections} connections p50 ${r.p50.toFixed(0)} ms  p95 ${r.p95.toFixed(0)} ms  ${r.rps} req/s  errors ${r.errors}  non-2xx ${r.non2xx}${cpu}  ${path === "/" ? "" : met ? "target met" : "TARGET NOT MET"}`);
  }
  if (reused || process.env.COLLECTION_KEEP) {
    console.log(`bench lab kept: COLLECTION_LAB=${labId}`);
    return;
  }
  // Leave the bench database as the other benches expect it.
  const t2 = performance.now();
  await db.delete(s.readings).where(eq(s.readings.labId, labId));
  await db.delete(s.labs).where(eq(s.labs.id, labId));
  console.log(`clean-up: ${secs(t2)} s`);
}

run()
  .then(() => closeDb())
  .catch(async (e) => {
    console.error(e);
    await closeDb();
    process.exit(1);
  });
