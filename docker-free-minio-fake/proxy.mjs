// Forward a verified request to the internal s3rver and stream its answer back.
// Request bodies are spooled to a file first (memory stays flat for large photos): s3rver writes
// straight over the object file as bytes arrive, so a dropped or short upload would otherwise leave
// a truncated object behind. Only a body whose length (and SHA-256, when signed or sent as
// x-amz-checksum-sha256) checks out is sent on.
import { createHash, randomBytes } from "node:crypto";
import fs from "node:fs";
import http from "node:http";
import path from "node:path";
import { Transform } from "node:stream";
import { pipeline } from "node:stream/promises";
import { S3Rejection } from "./s3-error.mjs";

const HOP_BY_HOP = new Set([
  "connection", "keep-alive", "proxy-connection", "transfer-encoding", "te", "trailer", "upgrade", "expect", "host",
]);
const MAX_SINGLE_PUT_BYTES = 5 * 1024 ** 3; // S3's limit for one PutObject

function hasBody(req) {
  const length = req.headers["content-length"];
  return req.headers["transfer-encoding"] !== undefined || (length !== undefined && length !== "0");
}

/**
 * Reject request bodies the fake cannot pass on faithfully, before any byte is read.
 * @param {import("node:http").IncomingMessage} req
 */
export function checkBodyHeaders(req) {
  const sha = String(req.headers["x-amz-content-sha256"] ?? "");
  const encoding = String(req.headers["content-encoding"] ?? "");
  if (sha.startsWith("STREAMING-") || encoding.split(",").some((e) => e.trim() === "aws-chunked")) {
    throw new S3Rejection(
      501,
      "NotImplemented",
      "aws-chunked (streaming signature / trailing checksum) uploads are not supported by rustline-s3-fake; " +
        'configure the S3 client with requestChecksumCalculation: "WHEN_REQUIRED".',
    );
  }
  const length = req.headers["content-length"];
  if (req.method === "PUT" && length === undefined) {
    throw new S3Rejection(411, "MissingContentLength", "You must provide the Content-Length HTTP header.");
  }
  if (length !== undefined && Number(length) > MAX_SINGLE_PUT_BYTES) {
    throw new S3Rejection(400, "EntityTooLarge", "Your proposed upload exceeds the maximum allowed object size.");
  }
}

/** Read the body into a spool file, counting bytes and hashing; checks length and signed SHA-256. */
async function spoolBody(req, spoolDir) {
  const file = path.join(spoolDir, `${Date.now()}-${randomBytes(8).toString("hex")}.part`);
  const sha256 = createHash("sha256");
  let bytes = 0;
  const counter = new Transform({
    transform(chunk, _enc, done) {
      bytes += chunk.length;
      if (bytes > MAX_SINGLE_PUT_BYTES) return done(new S3Rejection(400, "EntityTooLarge", "Upload too large."));
      sha256.update(chunk);
      done(null, chunk);
    },
  });
  try {
    await pipeline(req, counter, fs.createWriteStream(file));
  } catch (err) {
    fs.rmSync(file, { force: true });
    throw err instanceof S3Rejection ? err : new S3Rejection(400, "IncompleteBody", "The request body ended early.");
  }
  const declared = req.headers["content-length"];
  const expectedSha = String(req.headers["x-amz-content-sha256"] ?? "");
  if (declared !== undefined && Number(declared) !== bytes) {
    fs.rmSync(file, { force: true });
    throw new S3Rejection(400, "IncompleteBody", "You did not provide the number of bytes specified by the Content-Length HTTP header.");
  }
  const digest = sha256.digest();
  if (/^[0-9a-f]{64}$/i.test(expectedSha) && digest.toString("hex") !== expectedSha.toLowerCase()) {
    fs.rmSync(file, { force: true });
    throw new S3Rejection(400, "XAmzContentSHA256Mismatch", "The provided 'x-amz-content-sha256' header does not match what was computed.");
  }
  // Additional checksum (S3 API reference, "Checking object integrity"): x-amz-checksum-sha256 is the
  // base64 SHA-256 of the body; when a presigned URL signs it, only those exact bytes can be stored.
  const checksum = req.headers["x-amz-checksum-sha256"];
  if (checksum !== undefined && String(checksum) !== digest.toString("base64")) {
    fs.rmSync(file, { force: true });
    throw new S3Rejection(400, "BadDigest", "The SHA256 you specified did not match the calculated checksum.");
  }
  return { file, bytes };
}

function forwardHeaders(headers, upstream, bodyBytes) {
  const out = {};
  for (const [name, value] of Object.entries(headers)) {
    if (!HOP_BY_HOP.has(name) && value !== undefined) out[name] = value;
  }
  out.host = `${upstream.host}:${upstream.port}`;
  if (bodyBytes !== undefined) out["content-length"] = String(bodyBytes);
  return out;
}

/**
 * Proxy `req` to s3rver at `upstream`; `extraHeaders` (CORS) are added to the response.
 * Resolves when the response has been sent; rejects with S3Rejection before anything is sent.
 */
export async function forwardToS3rver(req, res, { upstream, spoolDir, extraHeaders }) {
  const spooled = hasBody(req) ? await spoolBody(req, spoolDir) : null;
  const cleanup = () => spooled && fs.rmSync(spooled.file, { force: true });
  try {
    await new Promise((resolve, reject) => {
      const outgoing = http.request(
        {
          host: upstream.host,
          port: upstream.port,
          method: req.method,
          path: req.url,
          headers: forwardHeaders(req.headers, upstream, spooled ? spooled.bytes : undefined),
        },
        (answer) => {
          const headers = {};
          for (const [name, value] of Object.entries(answer.headers)) {
            if (!HOP_BY_HOP.has(name) && !name.startsWith("access-control-") && name !== "vary" && value !== undefined) {
              headers[name] = value;
            }
          }
          res.writeHead(answer.statusCode ?? 502, { ...headers, ...extraHeaders });
          pipeline(answer, res).then(resolve, (err) => {
            res.destroy();
            resolve(err);
          });
        },
      );
      outgoing.on("error", () =>
        reject(new S3Rejection(503, "ServiceUnavailable", "The storage backend behind rustline-s3-fake is not reachable.")),
      );
      if (spooled) {
        pipeline(fs.createReadStream(spooled.file), outgoing).catch(() => outgoing.destroy());
      } else {
        outgoing.end();
      }
    });
  } finally {
    cleanup();
  }
}
