// Reads run as named prepared statements (db/client.ts): checked against PostgreSQL's own view of the
// session, pg_prepared_statements, on a real connection from the app's pool.
import { afterAll, expect, it } from "vitest";
import { eq } from "drizzle-orm";
import { closeDb, db, getPool, namedStatementsOf, statementName, STATEMENTS_PER_CONNECTION } from "@/db/client";
import * as s from "@/db/schema";

afterAll(async () => {
  await closeDb();
});

const prepared = async (client: import("pg").PoolClient) =>
  (await client.query<{ name: string; statement: string }>("select name, statement from pg_prepared_statements")).rows;

it("names a SELECT by its text, so the connection parses it once and reuses it with other values", async () => {
  const client = await getPool().connect();
  try {
    const text = "select $1::int * 2 as doubled";
    expect((await client.query({ text, values: [21] })).rows).toEqual([{ doubled: 42 }]);
    expect((await client.query({ text, values: [5] })).rows).toEqual([{ doubled: 10 }]);
    const rows = await prepared(client);
    expect(rows.filter((r) => r.name === statementName(text))).toEqual([{ name: statementName(text), statement: text }]);
  } finally {
    client.release();
  }
});

it("leaves a statement with many values (a long IN list) unnamed", async () => {
  const client = await getPool().connect();
  try {
    const values = Array.from({ length: 21 }, (_, i) => i);
    const text = `select ${values.map((_, i) => `$${i + 1}::int`).join(" + ")} as total`;
    expect((await client.query({ text, values })).rows).toEqual([{ total: 210 }]);
    expect((await prepared(client)).some((r) => r.name === statementName(text))).toBe(false);
  } finally {
    client.release();
  }
});

it("leaves writes, transaction control and very long statements unnamed", () => {
  expect(statementName("insert into labs (name) values ($1)")).toBeNull();
  expect(statementName("begin")).toBeNull();
  expect(statementName(`select ${"1 + ".repeat(3000)}1`)).toBeNull();
  expect(statementName("  WITH x as (select 1) select * from x")).toMatch(/^rl_[0-9a-f]{24}$/);
});

it(`stops naming after ${STATEMENTS_PER_CONNECTION} shapes on one connection and still answers correctly`, async () => {
  const client = await getPool().connect();
  try {
    const before = namedStatementsOf(client);
    for (let i = 0; i < STATEMENTS_PER_CONNECTION + 20; i++) {
      const { rows } = await client.query({ text: `select $1::int + ${i} as v`, values: [1] });
      expect(rows[0].v).toBe(1 + i);
    }
    expect(before).toBeLessThanOrEqual(STATEMENTS_PER_CONNECTION);
    expect(namedStatementsOf(client)).toBe(STATEMENTS_PER_CONNECTION);
    expect((await prepared(client)).filter((r) => r.name.startsWith("rl_")).length).toBe(STATEMENTS_PER_CONNECTION);
  } finally {
    client.release(true); // close this full connection so later tests get one with room
  }
});

it("runs Drizzle's queries through the same path with correct results", async () => {
  const [lab] = await db.insert(s.labs).values({ name: "Prepared statements lab" }).returning();
  for (let i = 0; i < 7; i++) {
    // Past PostgreSQL's five custom plans, a cached generic plan answers.
    const [row] = await db.select({ name: s.labs.name }).from(s.labs).where(eq(s.labs.id, lab.id));
    expect(row.name).toBe("Prepared statements lab");
  }
  await db.delete(s.labs).where(eq(s.labs.id, lab.id));
});

it("plans named statements once per connection (plan_cache_mode = force_generic_plan)", async () => {
  const client = await getPool().connect();
  try {
    expect((await client.query("show plan_cache_mode")).rows[0].plan_cache_mode).toBe("force_generic_plan");
    const text = "select count(*)::int as n from labs where created_at <= $1";
    for (let i = 0; i < 3; i++) await client.query({ text, values: [new Date()] });
    const [row] = (await client.query<{ generic_plans: string; custom_plans: string }>("select generic_plans, custom_plans from pg_prepared_statements where name = $1", [statementName(text)])).rows;
    expect(Number(row.generic_plans)).toBe(3);
    expect(Number(row.custom_plans)).toBe(0);
  } finally {
    client.release();
  }
});
