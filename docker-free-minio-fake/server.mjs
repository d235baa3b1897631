// rustline-s3-fake — a local S3-compatible server on loopback: s3rver stores the objects on an
// internal port; this front checks every request's SigV4 signature (s3rver does not) and CORS.
// Run: node docker-free-minio-fake/server.mjs   (env: see README.md beside this file)
import fs from "node:fs";
import http from "node:http";
import { createRequire } from "node:module";
import path from "node:path";
import S3rver from "s3rver";
import { answerPreflight, corsHeaders, parseOrigins } from "./cors.mjs";
import { checkBodyHeaders, forwardToS3rver } from "./proxy.mjs";
import { S3Rejection, sendS3Error } from "./s3-error.mjs";
import { verifySigV4 } from "./sigv4.mjs";

const require = createRequire(import.meta.url);

const env = process.env;
const port = Number(env.S3_PORT ?? 9390);
const host = env.S3_HOST ?? "127.0.0.1";
const accessKeyId = env.S3_ACCESS_KEY_ID ?? "rustline-local";
const secretAccessKey = env.S3_SECRET_ACCESS_KEY ?? "rustline-local-secret-key";
const region = env.S3_REGION ?? "us-east-1";
const buckets = (env.S3_BUCKETS ?? "rustline,rustline-test").split(",").map((b) => b.trim()).filter(Boolean);
const dataDir = path.resolve(env.S3_DATA_DIR ?? ".data/objects");
const origins = parseOrigins(env.S3_CORS_ORIGINS ?? "http://localhost:3000,http://127.0.0.1:3000");

function fail(message) {
  console.error(`rustline-s3-fake: ${message}`);
  process.exit(1);
}

// Loopback only: this is a development stand-in with a well-known key, never a network service.
if (host !== "127.0.0.1") fail(`S3_HOST must be 127.0.0.1 (got "${host}")`);
if (!Number.isInteger(port) || port < 1 || port > 65535) fail(`S3_PORT must be a port number (got "${env.S3_PORT}")`);
for (const bucket of buckets) {
  if (!/^[a-z0-9][a-z0-9.-]{1,61}[a-z0-9]$/.test(bucket)) fail(`"${bucket}" in S3_BUCKETS is not a valid bucket name`);
}

const bucketsDir = path.join(dataDir, "buckets");
const spoolDir = path.join(dataDir, "spool");
fs.mkdirSync(bucketsDir, { recursive: true });
fs.rmSync(spoolDir, { recursive: true, force: true }); // leftovers of uploads cut short by a crash
fs.mkdirSync(spoolDir, { recursive: true });

const credentials = new Map([[accessKeyId, secretAccessKey]]);

// s3rver accepts V4 requests from keys in its registry without checking them; this front has
// already checked them, so the key is registered to let verified requests through unchanged.
const AWSAccount = require("s3rver/lib/models/account");
AWSAccount.DUMMY_ACCOUNT.createKeyPair(accessKeyId, secretAccessKey);

const backend = new S3rver({
  address: "127.0.0.1",
  port: 0,
  silent: true,
  directory: bucketsDir,
  vhostBuckets: false,
  configureBuckets: buckets.map((name) => ({ name })),
});
const backendAddress = await backend.run();
const upstream = { host: "127.0.0.1", port: backendAddress.port };

/** @param {http.IncomingMessage} req @param {http.ServerResponse} res */
async function handle(req, res, expectsContinue = false) {
  const origin = req.headers.origin;
  const cors = corsHeaders(origin, origins);
  const resource = (req.url ?? "/").split("?")[0];
  try {
    if (resource === "/__health" && (req.method === "GET" || req.method === "HEAD")) {
      const body = JSON.stringify({ service: "rustline-s3-fake" });
      res.writeHead(200, { "Content-Type": "application/json", "Content-Length": Buffer.byteLength(body) });
      res.end(body);
      return;
    }
    if (req.method === "OPTIONS") {
      answerPreflight(req, res, origins);
      return;
    }
    await verifySigV4({ method: req.method ?? "GET", rawUrl: req.url ?? "/", headers: req.headers, credentials, region });
    checkBodyHeaders(req);
    // Only now ask the client for the body: rejected uploads are never read.
    if (expectsContinue) res.writeContinue();
    await forwardToS3rver(req, res, { upstream, spoolDir, extraHeaders: cors });
  } catch (err) {
    if (err instanceof S3Rejection) {
      if (err.status === 403 || err.status >= 500) {
        console.error(`rustline-s3-fake: ${req.method} ${resource} → ${err.status} ${err.code}: ${err.message}`);
      }
      sendS3Error(res, { status: err.status, code: err.code, message: err.message, resource, headers: cors });
      return;
    }
    console.error(`rustline-s3-fake: ${req.method} ${resource} failed:`, err);
    sendS3Error(res, { status: 500, code: "InternalError", message: "We encountered an internal error.", resource, headers: cors });
  }
}

const server = http.createServer((req, res) => void handle(req, res));
server.on("checkContinue", (req, res) => void handle(req, res, true));
server.on("error", (err) => {
  if (err && /** @type {NodeJS.ErrnoException} */ (err).code === "EADDRINUSE") {
    fail(`port ${port} is taken by another program; set S3_PORT to a free port`);
  }
  fail(String(err?.message ?? err));
});
server.listen(port, host, () => {
  console.log(`rustline-s3-fake ready on http://${host}:${port}`);
});

let closing = false;
function shutdown() {
  if (closing) return;
  closing = true;
  server.close();
  server.closeAllConnections();
  backend.close().finally(() => process.exit(0));
  setTimeout(() => process.exit(0), 3000).unref();
}
process.on("SIGTERM", shutdown);
process.on("SIGINT", shutdown);
