// First-load JavaScript per page: the scripts a signed-in browser loads for each main page, summed
// gzip-compressed, and whether charting code (vega) is among them. Budget: lab home < 200 kB.
import zlib from "node:zlib";
import { like } from "drizzle-orm";
import { closeDb, db } from "@/db/client";
import * as s from "@/db/schema";
import { signedInClient, type Client } from "../tests/support/http";

const chunkCache = new Map<string, { gz: number; vega: boolean }>();

async function chunk(client: Client, src: string) {
  if (!chunkCache.has(src)) {
    const body = Buffer.from(await (await client.fetch(src)).arrayBuffer());
    chunkCache.set(src, { gz: zlib.gzipSync(body).length, vega: /vega-lite|vega-embed|vega-dataflow/.test(body.toString("utf8")) });
  }
  return chunkCache.get(src)!;
}

export async function runPagesBench() {
  const client = await signedInClient("lead@tarrow.example", "rustline-demo-1");
  const [trial] = await db.select({ id: s.trials.id }).from(s.trials).where(like(s.trials.title, "Storage humidity%"));
  const [chamber] = await db.select({ id: s.chambers.id }).from(s.chambers).where(like(s.chambers.name, "Jar C%"));
  const pages = ["/", "/trials", "/due", "/chambers", `/chambers/${chamber?.id}`, "/specimens", "/treatments", "/analysis", `/trials/${trial?.id}`, `/trials/${trial?.id}/compare`, "/audit", "/settings"];
  const rows = [];
  for (const p of pages) {
    const res = await client.fetch(p);
    const html = await res.text();
    const srcs = [...html.matchAll(/<script[^>]+src="([^"]+\.js[^"]*)"/g)].map((m) => m[1]);
    let gz = 0;
    let vega = false;
    for (const src of new Set(srcs)) {
      const c = await chunk(client, src);
      gz += c.gz;
      vega ||= c.vega;
    }
    rows.push({ page: p.replace(/[0-9a-f-]{36}/, "[id]"), status: res.status, kB: Math.round(gz / 1024), scripts: srcs.length, vega });
  }
  for (const r of rows) console.log(`${r.page.padEnd(26)} ${String(r.status).padStart(3)}  ${String(r.kB).padStart(4)} kB gzip in ${String(r.scripts).padStart(2)} scripts  charting code in first load: ${r.vega ? "yes" : "no"}`);
  const home = rows[0];
  console.log(`lab home first-load JS: ${home.kB} kB (budget 200 kB: ${home.kB < 200 ? "within" : "OVER"})`);
  return rows;
}

if (process.argv[1]?.endsWith("pages-bench.ts")) {
  runPagesBench()
    .then(() => closeDb())
    .catch(async (e) => {
      console.error(e);
      await closeDb();
      process.exit(1);
    });
}
