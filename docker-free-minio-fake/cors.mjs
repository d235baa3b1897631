// CORS for browser uploads: the app's pages PUT photos straight to presigned URLs, so the
// browser preflights them. Answered here because s3rver only does CORS from per-bucket XML.
import { sendS3Error } from "./s3-error.mjs";

const ALLOWED_METHODS = ["GET", "PUT", "HEAD"];

/** @param {string | undefined} raw comma list; "*" allows any origin */
export function parseOrigins(raw) {
  return (raw ?? "")
    .split(",")
    .map((o) => o.trim().replace(/\/+$/, ""))
    .filter(Boolean);
}

/**
 * The Access-Control-Allow-Origin value for this origin, or null when it is not allowed.
 * @param {string | undefined} origin @param {string[]} allowed
 */
export function allowOriginFor(origin, allowed) {
  if (!origin) return null;
  if (allowed.includes("*")) return "*";
  return allowed.includes(origin) ? origin : null;
}

/** Headers added to every non-preflight response for an allowed origin. */
export function corsHeaders(origin, allowed) {
  const allow = allowOriginFor(origin, allowed);
  const headers = { Vary: "Origin" };
  if (allow) {
    headers["Access-Control-Allow-Origin"] = allow;
    // The upload code reads ETag to confirm what landed.
    headers["Access-Control-Expose-Headers"] = "ETag";
  }
  return headers;
}

/**
 * Answer an OPTIONS preflight. Like S3, a disallowed origin or method gets 403 without CORS headers.
 * @param {import("node:http").IncomingMessage} req @param {import("node:http").ServerResponse} res
 */
export function answerPreflight(req, res, allowed) {
  const origin = req.headers.origin;
  const method = String(req.headers["access-control-request-method"] ?? "").toUpperCase();
  const vary = "Origin, Access-Control-Request-Headers, Access-Control-Request-Method";
  const allow = allowOriginFor(origin, allowed);
  const resource = (req.url ?? "/").split("?")[0];
  if (!origin || !method) {
    sendS3Error(res, {
      status: 400,
      code: "BadRequest",
      message: "Insufficient information. Origin request header needed.",
      resource,
      headers: { Vary: vary },
    });
    return;
  }
  if (!allow || !ALLOWED_METHODS.includes(method)) {
    sendS3Error(res, {
      status: 403,
      code: "AccessForbidden",
      message: "CORSResponse: This CORS request is not allowed. This is usually because the evalution of Origin, request method / Access-Control-Request-Method or Access-Control-Request-Headers are not whitelisted by the resource's CORS spec.",
      resource,
      headers: { Vary: vary },
    });
    return;
  }
  const headers = {
    "Access-Control-Allow-Origin": allow,
    "Access-Control-Allow-Methods": ALLOWED_METHODS.join(", "),
    "Access-Control-Expose-Headers": "ETag",
    "Access-Control-Max-Age": "3000",
    Vary: vary,
    "Content-Length": "0",
  };
  const requested = req.headers["access-control-request-headers"];
  if (requested) headers["Access-Control-Allow-Headers"] = String(requested);
  res.writeHead(200, headers);
  res.end();
}
