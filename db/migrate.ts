// Apply the committed drizzle-kit migrations. `--reset` empties the database first (test runs only).
import path from "node:path";
import { migrate } from "drizzle-orm/node-postgres/migrator";
import { closeDb, db, getPool } from "./client";

async function main() {
  if (process.argv.includes("--reset")) {
    if (!/_test\b|_test$/.test(process.env.DATABASE_URL ?? "")) {
      throw new Error("--reset is only allowed on a database whose name ends in _test");
    }
    await getPool().query("drop schema if exists public cascade; drop schema if exists drizzle cascade; drop schema if exists pgboss cascade; create schema public;");
  }
  await migrate(db, { migrationsFolder: path.join(process.cwd(), "db", "migrations") });
  await closeDb();
}

main().catch(async (err) => {
  console.error(err instanceof Error ? err.message : err);
  await closeDb();
  process.exit(1);
});
