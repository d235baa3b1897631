// Due list and specimen table under load, in a throwaway lab with 5,000 specimens and 100,000
// inspections (40 running trials × 2,500), removed again at the end.
// Always: the query functions themselves, 20 concurrent calls per round. Also, when an app answers
// on APP_URL: the HTTP endpoints with 20 connections (autocannon), signed in as the bench lab's lead.
//   node --conditions=react-server --import tsx bench/trials-bench.ts
import crypto from "node:crypto";
import { eq, inArray } from "drizzle-orm";
import { closeDb, db, getPool } from "@/db/client";
import * as s from "@/db/schema";
import { listInspections } from "@/db/queries/inspections";
import { listSpecimens } from "@/db/queries/specimens";
import { hashPassword } from "@/lib/auth/password";
import { APP_URL, signedInClient } from "../tests/support/http";
import { loadRun, percentiles } from "./support";

process.env.PG_POOL_MAX ??= "20"; // read at the first query: 20 concurrent calls need 20 connections
const SIZE = { specimens: 5000, trials: 40, inspectionsPerTrial: 2500 };
const CONCURRENCY = Number(process.env.BENCH_CONCURRENCY ?? 20);
const ROUNDS = Number(process.env.BENCH_ROUNDS ?? 25);
const HTTP_SECONDS = Number(process.env.BENCH_HTTP_SECONDS ?? 10);
const PASSWORD = `bench-${crypto.randomBytes(6).toString("hex")}-1`;

type Figure = { name: string; mode: "function" | "http"; calls: number; p50: number; p95: number; max: number; errors: number };

async function seed() {
  const tag = crypto.randomBytes(3).toString("hex");
  const [lab] = await db.insert(s.labs).values({ name: `Bench trials ${tag}` }).returning();
  const [lead] = await db.insert(s.users).values({ name: "Bench lead", email: `bench-lead-${tag}@bench.example`, passwordHash: await hashPassword(PASSWORD) }).returning();
  await db.insert(s.memberships).values({ userId: lead.id, labId: lab.id, role: "lead" });
  const [chamber] = await db.insert(s.chambers).values({ labId: lab.id, name: "Bench jar", kind: "saturated-salt", nominalTempC: 21, setpointRhPercent: 75, toleranceRhPercent: 2 }).returning();
  const [treatment] = await db.insert(s.treatments).values({ labId: lab.id, name: "Bench control", kind: "control" }).returning();
  const pool = getPool();
  await pool.query(
    `insert into specimens (lab_id, label, material_class, find_name, mass_g, surface_prep)
     select $1, 'BT-' || lpad(g::text, 5, '0'), (array['iron-meteorite','stony-iron','chondrite','archaeological-iron','steel-coupon'])[1 + g % 5]::material_class,
            'Bench find ' || (g % 131), 5 + (g % 73) * 0.7, 'cut, polished'
     from generate_series(1, $2) g`, [lab.id, SIZE.specimens]);
  // Started 1,000 days ago, one inspection a day: days 0–994 done (40 %), 995–999 overdue, the rest ahead.
  const trials = await pool.query(
    `insert into trials (lab_id, title, question, status, schedule_plan, started_at)
     select $1, 'Bench trial ' || g, 'Load', 'running', $2::jsonb, now() - interval '1000 days'
     from generate_series(1, $3) g returning id`,
    [lab.id, JSON.stringify({ kind: "fixed", intervalDays: 1, count: SIZE.inspectionsPerTrial }), SIZE.trials]);
  for (const t of trials.rows as { id: string }[]) {
    await pool.query(
      `insert into inspections (lab_id, trial_id, day_number, planned_at, done_at)
       select $1, $2, d, now() - interval '1000 days' + d * interval '1 day',
              case when d < 995 then now() - interval '1000 days' + d * interval '1 day' + interval '2 hours' end
       from generate_series(0, $3 - 1) d`, [lab.id, t.id, SIZE.inspectionsPerTrial]);
  }
  await pool.query("analyze specimens; analyze inspections; analyze trials");
  return { labId: lab.id, leadEmail: lead.email, leadId: lead.id, chamberId: chamber.id, treatmentId: treatment.id, trialIds: (trials.rows as { id: string }[]).map((r) => r.id) };
}

async function cleanup(labId: string, userId: string) {
  // Children before parents: trial rows restrict deletes, so the lab cascade alone would fail.
  const trialIds = (await db.select({ id: s.trials.id }).from(s.trials).where(eq(s.trials.labId, labId))).map((t) => t.id);
  if (trialIds.length) {
    await db.delete(s.inspections).where(inArray(s.inspections.trialId, trialIds));
    await db.delete(s.placements).where(inArray(s.placements.trialId, trialIds));
    await db.delete(s.trialAllocations).where(inArray(s.trialAllocations.trialId, trialIds));
    await db.delete(s.trialMembers).where(inArray(s.trialMembers.trialId, trialIds));
    await db.delete(s.trialArms).where(inArray(s.trialArms.trialId, trialIds));
    await db.delete(s.trials).where(inArray(s.trials.id, trialIds));
  }
  await db.delete(s.specimens).where(eq(s.specimens.labId, labId));
  await db.delete(s.treatments).where(eq(s.treatments.labId, labId));
  await db.delete(s.chambers).where(eq(s.chambers.labId, labId));
  await db.delete(s.labs).where(eq(s.labs.id, labId));
  await db.delete(s.users).where(eq(s.users.id, userId));
}

async function measure(name: string, call: (i: number) => Promise<unknown>): Promise<Figure> {
  await call(0); // warm the plan cache and the pool
  const times: number[] = [];
  let errors = 0;
  for (let r = 0; r < ROUNDS; r++) {
    await Promise.all(Array.from({ length: CONCURRENCY }, async (_, i) => {
      const t0 = performance.now();
      try {
        await call(r * CONCURRENCY + i);
      } catch {
        errors++;
      }
      times.push(performance.now() - t0);
    }));
  }
  const { p50, p95, max } = percentiles(times);
  return { name, mode: "function", calls: times.length, p50, p95, max, errors };
}

async function appAnswers() {
  try {
    return (await fetch(`${APP_URL}/sign-in`, { signal: AbortSignal.timeout(3000) })).ok;
  } catch {
    return false;
  }
}

async function httpFigure(name: string, path: string, cookie: string): Promise<Figure> {
  const r = await loadRun({ url: `${APP_URL}${path}`, connections: CONCURRENCY, duration: HTTP_SECONDS, headers: { cookie } });
  return { name, mode: "http", calls: r.requests, p50: r.p50, p95: r.p95, max: r.max, errors: r.errors + r.non2xx };
}

export async function runTrialsBench(): Promise<Figure[]> {
  const t0 = performance.now();
  const lab = await seed();
  console.log(`seeded ${SIZE.specimens} specimens and ${SIZE.trials * SIZE.inspectionsPerTrial} inspections in ${((performance.now() - t0) / 1000).toFixed(1)} s`);
  const figures: Figure[] = [];
  try {
    const week = () => new Date(Date.now() + 7 * 86_400_000);
    figures.push(await measure("due list (open, next 7 days, ≤500 rows)", () => listInspections({ labId: lab.labId, status: "open", before: week(), pageSize: 500 })));
    figures.push(await measure("due list API default (open, 50 rows)", () => listInspections({ labId: lab.labId, status: "open", pageSize: 50 })));
    figures.push(await measure("overdue filter", () => listInspections({ labId: lab.labId, status: "overdue", pageSize: 50 })));
    figures.push(await measure("specimen table page 1 (label)", () => listSpecimens({ labId: lab.labId, sort: "label", dir: "asc", page: 1, pageSize: 50 })));
    figures.push(await measure("specimen table deep page, mass desc", (i) => listSpecimens({ labId: lab.labId, sort: "massG", dir: "desc", page: 40 + (i % 50), pageSize: 50 })));
    figures.push(await measure("specimen table text + class filter", (i) => listSpecimens({ labId: lab.labId, q: `find ${i % 131}`, materialClass: "stony-iron", sort: "findName", dir: "asc", page: 1, pageSize: 50 })));
    if (await appAnswers()) {
      const client = await signedInClient(lab.leadEmail, PASSWORD);
      figures.push(await httpFigure("GET /api/inspections?status=open", "/api/inspections?status=open&pageSize=50", client.cookie));
      figures.push(await httpFigure("GET /api/specimens (page 1)", "/api/specimens?page=1&pageSize=50", client.cookie));
      figures.push(await httpFigure("GET /specimens (HTML page)", "/specimens?page=3&pageSize=50&sort=massG&dir=desc", client.cookie));
    } else {
      console.log(`no app answers on ${APP_URL}: HTTP figures skipped, function figures only`);
    }
  } finally {
    await cleanup(lab.labId, lab.leadId);
  }
  for (const f of figures) {
    console.log(`${f.mode.padEnd(8)} ${f.name.padEnd(42)} p50 ${f.p50.toFixed(1).padStart(7)} ms  p95 ${f.p95.toFixed(1).padStart(7)} ms  max ${f.max.toFixed(1).padStart(7)} ms  ${String(f.calls).padStart(6)} calls  errors ${f.errors}`);
  }
  return figures;
}

if (process.argv[1]?.endsWith("trials-bench.ts")) {
  console.log(`trials bench: ${CONCURRENCY} concurrent calls × ${ROUNDS} rounds per query function; HTTP ${HTTP_SECONDS} s × ${CONCURRENCY} connections against ${APP_URL} if it answers`);
  runTrialsBench()
    .then(() => closeDb())
    .catch(async (e) => {
      console.error(e);
      await closeDb();
      process.exit(1);
    });
}
