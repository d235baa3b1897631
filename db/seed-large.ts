// The large demo for benchmarks: adds to the demo lab 5,000 specimens, 50 running trials with
// 100,000 inspections in all, and a chamber with 500,000 minute readings (about a year).
// Generated in SQL (generate_series) so it loads in seconds. Invented data, like the demo.
import { eq } from "drizzle-orm";
import { demoLab } from "@/experiments/demo-lab";
import { closeDb, db, getPool } from "./client";
import * as s from "./schema";

export const LARGE = { specimens: 5000, trials: 50, inspectionsPerTrial: 2000, readings: 500_000 };

export async function seedLarge() {
  const [lab] = await db.select().from(s.labs).where(eq(s.labs.name, demoLab.name));
  if (!lab) throw new Error("Seed the demo lab first (db/seed.ts)");
  const [chamber] = await db.select().from(s.chambers).where(eq(s.chambers.labId, lab.id)).limit(1);
  const [treatment] = await db.select().from(s.treatments).where(eq(s.treatments.labId, lab.id)).limit(1);
  const pool = getPool();
  const client = await pool.connect();
  try {
    await client.query("begin");
    await client.query(
      `insert into specimens (lab_id, label, material_class, find_name, description, mass_g)
       select $1, 'LG-' || lpad(g::text, 5, '0'),
              (array['iron-meteorite','stony-iron','archaeological-iron','steel-coupon'])[1 + g % 4]::material_class,
              'Bench find ' || (g % 97), 'Generated for load tests', 5 + (g % 50)
       from generate_series(1, $2) g`,
      [lab.id, LARGE.specimens],
    );
    const trials = await client.query(
      `insert into trials (lab_id, title, question, status, schedule_plan, started_at)
       select $1, 'Load trial ' || g, 'Generated for load tests', 'running', '{"kind":"fixed","intervalDays":1,"count":2000}'::jsonb,
              now() - interval '1000 days'
       from generate_series(1, $2) g returning id`,
      [lab.id, LARGE.trials],
    );
    for (const t of trials.rows as { id: string }[]) {
      await client.query(
        `insert into inspections (lab_id, trial_id, day_number, planned_at, done_at)
         select $1, $2, d, now() - interval '1000 days' + d * interval '1 day',
                case when d < 1000 then now() - interval '1000 days' + d * interval '1 day' + interval '1 hour' end
         from generate_series(0, $3 - 1) d`,
        [lab.id, t.id, LARGE.inspectionsPerTrial],
      );
    }
    // One arm-less placement per specimen spread over the trials, so trial lists have specimen counts.
    await client.query(
      `insert into placements (lab_id, trial_id, specimen_id, chamber_id, treatment_id, from_at, reason)
       select $1, t.id, sp.id, $2, $3, now() - interval '1000 days', 'Load test'
       from (select id, row_number() over (order by id) - 1 as rn from specimens where lab_id = $1 and label like 'LG-%') sp
       join (select id, row_number() over (order by id) - 1 as rn from trials where lab_id = $1 and title like 'Load trial %') t
         on t.rn = sp.rn % $4`,
      [lab.id, chamber.id, treatment.id, LARGE.trials],
    );
    const [logger] = (await client.query(
      `insert into chambers (lab_id, name, kind, salt_id, nominal_temp_c, volume_l, setpoint_rh_percent, tolerance_rh_percent, notes)
       values ($1, 'Jar L · logger stress (NaCl)', 'saturated-salt', 'NaCl', 21, 2, 75.4, 2, 'Generated: a year of minute readings') returning id`,
      [lab.id],
    )).rows as { id: string }[];
    await client.query(
      `insert into readings (lab_id, chamber_id, taken_at, rh_percent, temp_c, source, instrument)
       select $1, $2, now() - ($3 - g) * interval '1 minute',
              75.4 + sin(g / 700.0) * 1.2 + ((g::bigint * 7919) % 100) / 250.0, 21 + sin(g / 1440.0 * 6.283) * 0.5, 'csv', 'logger-L'
       from generate_series(1, $3) g`,
      [lab.id, logger.id, LARGE.readings],
    );
    await client.query("commit");
    await client.query("analyze");
  } catch (err) {
    await client.query("rollback");
    throw err;
  } finally {
    client.release();
  }
}

if (process.argv[1]?.endsWith("seed-large.ts")) {
  const t0 = Date.now();
  seedLarge()
    .then(() => console.log(`[seed-large] ${LARGE.specimens} specimens, ${LARGE.trials * LARGE.inspectionsPerTrial} inspections, ${LARGE.readings} readings in ${((Date.now() - t0) / 1000).toFixed(1)} s`))
    .then(() => closeDb())
    .catch(async (err) => {
      console.error("[seed-large] failed:", err);
      await closeDb();
      process.exit(1);
    });
}
