import { createHash } from "node:crypto";
import { drizzle, type NodePgDatabase } from "drizzle-orm/node-postgres";
import pg from "pg";
import * as schema from "./schema";

export type Db = NodePgDatabase<typeof schema>;
export type Tx = Parameters<Parameters<Db["transaction"]>[0]>[0];
export type DbOrTx = Db | Tx;

// Reads run as named prepared statements (pg's `name` option), so each connection parses and plans a
// query shape once instead of on every call: on the large demo, planning the due list's join took longer
// than running it. The name is a hash of the SQL text (values stay parameters), only for SELECTs up to
// 8 kB with at most MAX_NAMED_PARAMS values (long IN lists would each be a shape of their own), and at
// most STATEMENTS_PER_CONNECTION per connection; anything else runs unnamed. The pool also sets
// plan_cache_mode = force_generic_plan, which applies to every parameterized statement on these
// connections, named or not: plans are made without looking at the values (benchmarked, README).
// Named statements outlive a schema change on an open connection, so migrate before starting the app
// (npm start does), and use a session-mode pooler if any (transaction-mode PgBouncer drops them).
export const STATEMENTS_PER_CONNECTION = 200;
const MAX_NAMED_SQL = 8_000;
const MAX_NAMED_PARAMS = 20;
const namesOf = new WeakMap<pg.PoolClient, Set<string>>();

export function statementName(text: string): string | null {
  if (text.length > MAX_NAMED_SQL || !/^\s*(select|with)\b/i.test(text)) return null;
  return `rl_${createHash("sha1").update(text).digest("hex").slice(0, 24)}`;
}

function nameStatements(client: pg.PoolClient) {
  const query = client.query.bind(client) as (...args: unknown[]) => unknown;
  const seen = new Set<string>();
  namesOf.set(client, seen);
  (client as unknown as { query: (...args: unknown[]) => unknown }).query = (config: unknown, ...rest: unknown[]) => {
    const values = (config as pg.QueryConfig | null)?.values ?? (Array.isArray(rest[0]) ? rest[0] : []);
    if (config && typeof config === "object" && typeof (config as pg.QueryConfig).text === "string" && !(config as pg.QueryConfig).name && values.length <= MAX_NAMED_PARAMS) {
      const name = statementName((config as pg.QueryConfig).text);
      if (name && (seen.has(name) || seen.size < STATEMENTS_PER_CONNECTION)) {
        seen.add(name);
        config = { ...(config as pg.QueryConfig), name };
      }
    }
    return query(config, ...rest);
  };
}

/** How many statement names a pooled connection has used (for tests). */
export const namedStatementsOf = (client: pg.PoolClient) => namesOf.get(client)?.size ?? 0;

// One pool per process; kept on globalThis so Next's module reloading does not open a pool per import.
const g = globalThis as unknown as { rustlinePool?: pg.Pool; rustlineDb?: Db };

export function getPool(): pg.Pool {
  if (!g.rustlinePool) {
    const url = process.env.DATABASE_URL;
    if (!url) throw new Error("DATABASE_URL is not set");
    g.rustlinePool = new pg.Pool({
      connectionString: url, max: Number(process.env.PG_POOL_MAX ?? 10), connectionTimeoutMillis: 5000,
      // Named statements keep one generic plan instead of re-planning with each call's values: PostgreSQL's
      // "auto" mode kept re-planning the due list and the lab home (their date bounds make custom plans look
      // cheaper), which cost more than running them. Benchmarked on the large demo (README, Benchmarks).
      // JIT is off: the app's reads take milliseconds, but range scans over a year of readings are
      // estimated high enough to trigger JIT compilation, which cost ~230 ms on the collection overview.
      options: "-c plan_cache_mode=force_generic_plan -c jit=off",
    });
    // An idle client losing its server (a restart) must not crash the process.
    g.rustlinePool.on("error", (err) => console.error("[db] idle client error:", err.message));
    g.rustlinePool.on("connect", nameStatements);
  }
  return g.rustlinePool;
}

export const db: Db = new Proxy({} as Db, {
  get(_t, prop) {
    if (!g.rustlineDb) g.rustlineDb = drizzle(getPool(), { schema });
    return Reflect.get(g.rustlineDb, prop);
  },
});

export async function closeDb() {
  await g.rustlinePool?.end();
  g.rustlinePool = undefined;
  g.rustlineDb = undefined;
}
