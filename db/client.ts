import { drizzle, type NodePgDatabase } from "drizzle-orm/node-postgres";
import pg from "pg";
import * as schema from "./schema";

export type Db = NodePgDatabase<typeof schema>;
export type Tx = Parameters<Parameters<Db["transaction"]>[0]>[0];
export type DbOrTx = Db | Tx;

// One pool per process; kept on globalThis so Next's module reloading does not open a pool per import.
const g = globalThis as unknown as { rustlinePool?: pg.Pool; rustlineDb?: Db };

export function getPool(): pg.Pool {
  if (!g.rustlinePool) {
    const url = process.env.DATABASE_URL;
    if (!url) throw new Error("DATABASE_URL is not set");
    g.rustlinePool = new pg.Pool({ connectionString: url, max: Number(process.env.PG_POOL_MAX ?? 10), connectionTimeoutMillis: 5000 });
    // An idle client losing its server (a restart) must not crash the process.
    g.rustlinePool.on("error", (err) => console.error("[db] idle client error:", err.message));
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
