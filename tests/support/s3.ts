// Makes the S3 fake available to integration tests. Normally scripts/test.mjs has started it on the
// env's port and this only checks it answers; run standalone, it starts a private instance on a free
// port with a temporary data folder and points the S3_* variables at it until stop().
import { spawn, type ChildProcess } from "node:child_process";
import fs from "node:fs";
import net from "node:net";
import os from "node:os";
import path from "node:path";
import { fileURLToPath } from "node:url";

export const repoRoot = path.resolve(path.dirname(fileURLToPath(import.meta.url)), "..", "..");

export function freePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const srv = net.createServer();
    srv.once("error", reject);
    srv.listen(0, "127.0.0.1", () => {
      const address = srv.address();
      const port = typeof address === "object" && address ? address.port : 0;
      srv.close(() => resolve(port));
    });
  });
}

/** Run `node <script>` from the repo root until stdout shows `readyText`; stop() ends it. */
export function spawnService(
  script: string,
  env: NodeJS.ProcessEnv,
  readyText: string,
  timeoutMs = 20_000,
): Promise<{ child: ChildProcess; stop: () => Promise<void> }> {
  const child = spawn(process.execPath, [path.join(repoRoot, script)], { cwd: repoRoot, env, stdio: ["ignore", "pipe", "pipe"] });
  let output = "";
  const stop = () =>
    new Promise<void>((resolve) => {
      if (child.exitCode !== null || child.signalCode !== null) return resolve();
      child.once("exit", () => resolve());
      child.kill("SIGTERM");
    });
  return new Promise((resolve, reject) => {
    const timer = setTimeout(() => {
      void stop();
      reject(new Error(`${script} did not print "${readyText}" within ${timeoutMs} ms:\n${output}`));
    }, timeoutMs);
    child.stdout?.on("data", (chunk: Buffer) => {
      output += chunk.toString();
      if (output.includes(readyText)) {
        clearTimeout(timer);
        resolve({ child, stop });
      }
    });
    child.stderr?.on("data", (chunk: Buffer) => (output += chunk.toString()));
    child.once("exit", (code) => {
      clearTimeout(timer);
      reject(new Error(`${script} exited with code ${code}:\n${output}`));
    });
  });
}

export interface S3Fake {
  endpoint: string;
  bucket: string;
  /** Origins the fake answers CORS for (never "*": the tests need one that is refused). */
  corsOrigins: string[];
  startedHere: boolean;
  stop(): Promise<void>;
}

const DEFAULT_ORIGINS = "http://localhost:3000,http://127.0.0.1:3000";

async function isOurs(endpoint: string): Promise<boolean> {
  try {
    const res = await fetch(`${endpoint}/__health`, { signal: AbortSignal.timeout(1500) });
    return res.ok && (await res.text()).includes("rustline-s3-fake");
  } catch {
    return false;
  }
}

function origins(raw: string | undefined): string[] {
  return (raw ?? DEFAULT_ORIGINS).split(",").map((o) => o.trim()).filter(Boolean);
}

export async function ensureS3Fake(): Promise<S3Fake> {
  process.env.S3_BUCKET ||= "rustline-test";
  const bucket = process.env.S3_BUCKET;
  const endpoint = process.env.S3_ENDPOINT || `http://127.0.0.1:${process.env.S3_PORT || 9390}`;
  const configured = origins(process.env.S3_CORS_ORIGINS);
  if (!configured.includes("*") && (await isOurs(endpoint))) {
    process.env.S3_ENDPOINT = endpoint;
    return { endpoint, bucket, corsOrigins: configured, startedHere: false, stop: async () => {} };
  }

  const saved = { S3_ENDPOINT: process.env.S3_ENDPOINT, S3_PUBLIC_ENDPOINT: process.env.S3_PUBLIC_ENDPOINT };
  const port = await freePort();
  const dataDir = fs.mkdtempSync(path.join(os.tmpdir(), "rustline-s3-test-"));
  const corsOrigins = configured.filter((o) => o !== "*");
  if (corsOrigins.length === 0) corsOrigins.push(...origins(DEFAULT_ORIGINS));
  const service = await spawnService(
    "docker-free-minio-fake/server.mjs",
    {
      ...process.env,
      S3_PORT: String(port),
      S3_DATA_DIR: dataDir,
      S3_BUCKETS: [...new Set(["rustline", "rustline-test", bucket])].join(","),
      S3_CORS_ORIGINS: corsOrigins.join(","),
    },
    "rustline-s3-fake ready",
  );
  const own = `http://127.0.0.1:${port}`;
  process.env.S3_ENDPOINT = own;
  process.env.S3_PUBLIC_ENDPOINT = own;
  return {
    endpoint: own,
    bucket,
    corsOrigins,
    startedHere: true,
    async stop() {
      await service.stop();
      fs.rmSync(dataDir, { recursive: true, force: true });
      for (const [name, value] of Object.entries(saved)) {
        if (value === undefined) delete process.env[name];
        else process.env[name] = value;
      }
    },
  };
}
