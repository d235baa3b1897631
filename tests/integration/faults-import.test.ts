// Fault: the process running a logger CSV import is killed (SIGKILL) while it is storing rows.
// The import is one transaction, so PostgreSQL rolls it back: no readings and no import record remain.
import { spawn } from "node:child_process";
import path from "node:path";
import { afterAll, beforeAll, expect, it } from "vitest";
import { and, count, eq } from "drizzle-orm";
import { closeDb, db } from "@/db/client";
import * as s from "@/db/schema";
import { createTestLab, type TestLab } from "../support/db";
import { repoRoot } from "../support/s3";

let lab: TestLab;

beforeAll(async () => {
  lab = await createTestLab("Killed import");
});
afterAll(() => closeDb());

it("leaves nothing behind when the importing process dies half way", async () => {
  const [chamber] = await db.insert(s.chambers).values({ labId: lab.labId, name: "Kill jar", kind: "saturated-salt", saltId: "MgCl2", nominalTempC: 20, setpointRhPercent: 33, toleranceRhPercent: 2 }).returning();
  const child = spawn(process.execPath, ["--conditions=react-server", "--import", "tsx", path.join("tests", "support", "import-child.ts"), lab.labId, lab.users.researcher.id, chamber.id, "100000"], {
    cwd: repoRoot, env: process.env, stdio: ["ignore", "pipe", "pipe"],
  });
  let out = "";
  const killedAt = await new Promise<string>((resolve, reject) => {
    child.stdout.on("data", (d: Buffer) => {
      out += d.toString();
      const m = /storing (\d+)\/(\d+)/.exec(out);
      if (m && Number(m[1]) > 0 && Number(m[1]) < Number(m[2])) {
        child.kill("SIGKILL");
        resolve(m[0]);
      }
    });
    child.on("exit", () => reject(new Error(`import ended before it could be killed: ${out}`)));
  });
  expect(killedAt).toMatch(/storing \d+\/100000/);
  await new Promise((r) => setTimeout(r, 500)); // the server notices the dead connection and rolls back
  const [{ n: readings }] = await db.select({ n: count() }).from(s.readings).where(eq(s.readings.chamberId, chamber.id));
  const imports = await db.select().from(s.readingImports).where(and(eq(s.readingImports.labId, lab.labId), eq(s.readingImports.chamberId, chamber.id)));
  const audit = await db.select().from(s.auditEvents).where(and(eq(s.auditEvents.labId, lab.labId), eq(s.auditEvents.entity, "reading-import")));
  expect({ readings, imports: imports.length, audit: audit.length }).toEqual({ readings: 0, imports: 0, audit: 0 });
}, 120_000);
