// The session secret and what ships, tried the way a careless operator or an outsider would:
// serving with DEMO_MODE=0 and no real secret, forging a cookie with the value once published in the
// repository, a fresh demo installation, and what a production install (npm ci --omit=dev) pulls in.
import { spawnSync } from "node:child_process";
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeDb } from "@/db/client";
import { encode } from "@/lib/auth/jwt";
// @ts-expect-error plain ESM scripts without type declarations
import { PUBLISHED_SECRETS, resolveSecret } from "../../scripts/lib/secret.mjs";
import { createTestLab, type TestLab } from "../support/db";
import { APP_URL } from "../support/http";
import { repoRoot } from "../support/s3";

const published: string = PUBLISHED_SECRETS[0];

/** Run a script of ours with a given environment; what an operator would see. */
function runScript(script: string, env: Record<string, string | undefined>) {
  const clean = Object.fromEntries(Object.entries({ ...process.env, ...env }).filter(([, v]) => v !== undefined)) as NodeJS.ProcessEnv;
  const r = spawnSync(process.execPath, [script], { cwd: repoRoot, env: clean, encoding: "utf8", timeout: 60_000 });
  return { status: r.status, output: `${r.stdout}${r.stderr}` };
}

let lab: TestLab;
beforeAll(async () => {
  lab = await createTestLab("Secret");
});
afterAll(async () => {
  await closeDb();
});

describe("session secret outside demo mode", () => {
  for (const [what, secret] of [["unset", undefined], ["empty", ""], ["the published development value", published], ["31 characters", "a".repeat(31)]] as const) {
    it(`npm run serve refuses with DEMO_MODE=0 and a secret that is ${what}`, () => {
      const r = runScript("scripts/serve.mjs", { DEMO_MODE: "0", NEXTAUTH_SECRET: secret, PORT: "1" });
      expect(r.status).not.toBe(0);
      expect(r.output).toContain("NEXTAUTH_SECRET");
      expect(r.output).not.toMatch(/app process/); // refused before any server process started
    });
  }

  it("npm start refuses with DEMO_MODE=0 and the published value, before starting any service", () => {
    const r = runScript("scripts/start.mjs", { DEMO_MODE: "0", NEXTAUTH_SECRET: published, PORT: "1" });
    expect(r.status).not.toBe(0);
    expect(r.output).toContain("NEXTAUTH_SECRET");
    expect(r.output).not.toMatch(/\[services\]/);
  });

  it("accepts a random secret of 32 characters or more", () => {
    const strong = "k".repeat(12) + "Qz8-".repeat(6);
    expect(resolveSecret({ DEMO_MODE: "0", NEXTAUTH_SECRET: strong }, os.tmpdir())).toBe(strong);
  });
});

describe("session secret in demo mode", () => {
  it("each installation makes its own random secret once, kept under .data/", () => {
    const a = fs.mkdtempSync(path.join(os.tmpdir(), "rustline-secret-a-"));
    const b = fs.mkdtempSync(path.join(os.tmpdir(), "rustline-secret-b-"));
    const first = resolveSecret({ DEMO_MODE: "1" }, a);
    expect(first.length).toBeGreaterThanOrEqual(32);
    expect(resolveSecret({ DEMO_MODE: "1" }, a)).toBe(first); // a restart keeps the sessions valid
    expect(resolveSecret({ DEMO_MODE: "1" }, b)).not.toBe(first); // another clone has another secret
    expect(fs.statSync(path.join(a, "nextauth-secret")).mode & 0o077).toBe(0); // readable by the owner only
    fs.rmSync(a, { recursive: true, force: true });
    fs.rmSync(b, { recursive: true, force: true });
  });

  it("the app under test does not run with the published value", () => {
    expect(process.env.NEXTAUTH_SECRET).toBeTruthy();
    expect(PUBLISHED_SECRETS).not.toContain(process.env.NEXTAUTH_SECRET);
  });

  it("a session cookie forged with the published value for the lab lead's id is not accepted", async () => {
    const token = await encode({ token: { sub: lab.users.lead.id, userId: lab.users.lead.id, labId: lab.labId, role: "lead" }, secret: published, maxAge: 3600 });
    const res = await fetch(`${APP_URL}/api/trials`, { headers: { cookie: `next-auth.session-token=${token}` } });
    expect(res.status).toBe(401);
  });
});

describe("what ships", () => {
  it("the local stand-ins are development dependencies, so a production install leaves them out", () => {
    const pkg = JSON.parse(fs.readFileSync(path.join(repoRoot, "package.json"), "utf8")) as { dependencies: Record<string, string>; devDependencies: Record<string, string> };
    for (const name of ["s3rver", "smtp-server", "mailparser", "@smithy/signature-v4"]) {
      expect(pkg.dependencies[name], name).toBeUndefined();
      expect(pkg.devDependencies[name], name).toBeTruthy();
    }
    // busboy 0.3 → dicer and fast-xml-parser 3 came only through s3rver.
    const lock = JSON.parse(fs.readFileSync(path.join(repoRoot, "package-lock.json"), "utf8")) as { packages: Record<string, { dev?: boolean }> };
    const shipped = Object.entries(lock.packages).filter(([p, v]) => p.startsWith("node_modules/") && !v.dev).map(([p]) => p);
    expect(shipped.filter((p) => /node_modules\/(s3rver|dicer|busboy|smtp-server|mailparser)$/.test(p))).toEqual([]);
  });

  it("a process that builds an S3 client prints no Node-version notice from the SDK", () => {
    const code = 'const m = require("./storage/client.ts"); m.createS3Client(m.readStorageConfig()); setTimeout(() => {}, 200);';
    const env = { ...process.env };
    delete env.AWS_SDK_JS_NODE_VERSION_SUPPORT_WARNING_DISABLED;
    const r = spawnSync(process.execPath, ["--import", "tsx", "-e", code], { cwd: repoRoot, env, encoding: "utf8", timeout: 60_000 });
    expect(r.status).toBe(0);
    expect(r.stderr).not.toMatch(/NodeVersionSupportWarning/);
  });
});
