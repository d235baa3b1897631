// AWS Signature Version 4 verification for the S3 fake. s3rver accepts any V4 signature
// unchecked, so this recomputes each one with the SDK's own signer from what actually arrived:
// method, raw path, query and the signed headers' real values. Anything the client signed that
// differs on the wire (content-type, content-length, host, x-amz-*) changes the signature.
import { createHash, createHmac, timingSafeEqual } from "node:crypto";
import { SignatureV4 } from "@smithy/signature-v4";
import { S3Rejection } from "./s3-error.mjs";

const ALGORITHM = "AWS4-HMAC-SHA256";
const UNSIGNED_PAYLOAD = "UNSIGNED-PAYLOAD";
const MAX_SKEW_MS = 15 * 60 * 1000; // S3's allowed clock skew for header-signed requests
const MAX_PRESIGN_S = 7 * 24 * 3600; // S3's longest presigned URL lifetime
const AUTH_QUERY_PARAMS = ["X-Amz-Algorithm", "X-Amz-Credential", "X-Amz-Date", "X-Amz-Expires", "X-Amz-SignedHeaders", "X-Amz-Signature"];

function toBuffer(data) {
  if (typeof data === "string") return Buffer.from(data, "utf8");
  if (ArrayBuffer.isView(data)) return Buffer.from(data.buffer, data.byteOffset, data.byteLength);
  return Buffer.from(data);
}

/** SHA-256 / HMAC-SHA-256 in the shape the signer expects (the @aws-crypto package is not installed). */
class NodeSha256 {
  constructor(secret) {
    this.hash = secret === undefined ? createHash("sha256") : createHmac("sha256", toBuffer(secret));
  }
  update(data) {
    this.hash.update(toBuffer(data));
  }
  async digest() {
    return new Uint8Array(this.hash.digest());
  }
}

const denied = (message) => new S3Rejection(403, "AccessDenied", message);
const mismatch = () =>
  new S3Rejection(
    403,
    "SignatureDoesNotMatch",
    "The request signature we calculated does not match the signature you provided. Check your key and signing method.",
  );

function safeEqualHex(a, b) {
  const x = Buffer.from(String(a));
  const y = Buffer.from(String(b));
  return x.length === y.length && timingSafeEqual(x, y);
}

function decode(component) {
  try {
    return decodeURIComponent(component);
  } catch {
    throw new S3Rejection(400, "InvalidArgument", "Malformed percent-encoding in the request URL.");
  }
}

/** Query string → { key: value | value[] }, '+' kept literal as S3 does. */
export function parseQuery(rawQuery) {
  const query = {};
  for (const part of (rawQuery ?? "").split("&")) {
    if (!part) continue;
    const eq = part.indexOf("=");
    const key = decode(eq < 0 ? part : part.slice(0, eq));
    const value = eq < 0 ? "" : decode(part.slice(eq + 1));
    if (Object.hasOwn(query, key)) query[key] = [].concat(query[key], value);
    else query[key] = value;
  }
  return query;
}

/** "20250101T120000Z" → Date, or null. */
function parseAmzDate(text) {
  const m = /^(\d{4})(\d{2})(\d{2})T(\d{2})(\d{2})(\d{2})Z$/.exec(String(text ?? ""));
  if (!m) return null;
  const [, y, mo, d, h, mi, s] = m.map(Number);
  return new Date(Date.UTC(y, mo - 1, d, h, mi, s));
}

function splitUrl(rawUrl) {
  const q = rawUrl.indexOf("?");
  return q < 0 ? { path: rawUrl, rawQuery: "" } : { path: rawUrl.slice(0, q), rawQuery: rawUrl.slice(q + 1) };
}

/** Credential "AKID/20250101/us-east-1/s3/aws4_request" → secret, or a rejection. */
function lookUpSecret(credential, credentials) {
  const accessKeyId = String(credential ?? "").split("/")[0];
  const secret = accessKeyId ? credentials.get(accessKeyId) : undefined;
  if (!secret) {
    throw new S3Rejection(403, "InvalidAccessKeyId", "The AWS Access Key Id you provided does not exist in our records.");
  }
  return { accessKeyId, secretAccessKey: secret };
}

/** Only the headers the client said it signed, with the values that actually arrived. */
function signedHeaderValues(names, headers) {
  const picked = {};
  for (const name of names) {
    const value = headers[name];
    if (value === undefined) throw mismatch();
    picked[name] = Array.isArray(value) ? value.join(",") : String(value);
  }
  return picked;
}

function makeSigner(creds, region) {
  // S3 signs the path as sent (no double escaping) and reads the payload hash from the header.
  return new SignatureV4({ credentials: creds, region, service: "s3", sha256: NodeSha256, uriEscapePath: false, applyChecksum: false });
}

async function verifyPresigned({ method, path, query, headers, credentials, region, now }) {
  if (query["X-Amz-Algorithm"] !== ALGORITHM) {
    throw new S3Rejection(400, "AuthorizationQueryParametersError", 'X-Amz-Algorithm only supports "AWS4-HMAC-SHA256"');
  }
  for (const p of AUTH_QUERY_PARAMS) {
    if (typeof query[p] !== "string") {
      throw new S3Rejection(400, "AuthorizationQueryParametersError", `Query-string authentication version 4 requires ${p} once.`);
    }
  }
  const creds = lookUpSecret(query["X-Amz-Credential"], credentials);
  const signingDate = parseAmzDate(query["X-Amz-Date"]);
  const expiresInS = Number(query["X-Amz-Expires"]);
  if (!signingDate) throw new S3Rejection(400, "AuthorizationQueryParametersError", "X-Amz-Date must be in the ISO8601 basic format.");
  if (!Number.isInteger(expiresInS) || expiresInS < 1 || expiresInS > MAX_PRESIGN_S) {
    throw new S3Rejection(400, "AuthorizationQueryParametersError", "X-Amz-Expires must be between 1 and 604800 seconds.");
  }
  if (now.getTime() > signingDate.getTime() + expiresInS * 1000) throw denied("Request has expired");
  if (signingDate.getTime() > now.getTime() + MAX_SKEW_MS) throw denied("Request is not valid yet");

  const names = query["X-Amz-SignedHeaders"].toLowerCase().split(";").filter(Boolean);
  if (!names.includes("host")) throw denied("Host must be a signed header.");
  const signedHeaders = signedHeaderValues(names, headers);
  const unsignable = new Set();
  if (!names.includes("x-amz-content-sha256")) {
    // Presigned URLs always cover UNSIGNED-PAYLOAD; hand it to the signer as the payload hash only.
    signedHeaders["x-amz-content-sha256"] = UNSIGNED_PAYLOAD;
    unsignable.add("x-amz-content-sha256");
  }
  const unsigned = { ...query };
  for (const p of AUTH_QUERY_PARAMS) delete unsigned[p];
  const request = { method, protocol: "http:", hostname: "", path, query: unsigned, headers: signedHeaders };
  const resigned = await makeSigner(creds, region).presign(request, {
    signingDate,
    expiresIn: expiresInS,
    signableHeaders: new Set(names),
    unsignableHeaders: unsignable,
    // Headers stay where the client put them; hoisted ones are already in the query.
    unhoistableHeaders: new Set(Object.keys(signedHeaders)),
  });
  const ok =
    safeEqualHex(resigned.query["X-Amz-Signature"], query["X-Amz-Signature"]) &&
    resigned.query["X-Amz-SignedHeaders"] === query["X-Amz-SignedHeaders"].toLowerCase();
  if (!ok) throw mismatch();
  return creds.accessKeyId;
}

function parseAuthorization(value) {
  const text = String(value).trim();
  if (!text.startsWith(`${ALGORITHM} `)) {
    throw new S3Rejection(400, "InvalidArgument", "Unsupported Authorization Type; only AWS4-HMAC-SHA256 is accepted.");
  }
  const parts = {};
  for (const piece of text.slice(ALGORITHM.length).split(",")) {
    const eq = piece.indexOf("=");
    if (eq > 0) parts[piece.slice(0, eq).trim()] = piece.slice(eq + 1).trim();
  }
  if (!parts.Credential || !parts.SignedHeaders || !parts.Signature) {
    throw new S3Rejection(
      400,
      "AuthorizationHeaderMalformed",
      "The authorization header is malformed; it requires Credential, SignedHeaders and Signature.",
    );
  }
  return parts;
}

async function verifyHeaderSigned({ method, path, query, headers, credentials, region, now }) {
  const auth = parseAuthorization(headers.authorization);
  const creds = lookUpSecret(auth.Credential, credentials);
  const signingDate = parseAmzDate(headers["x-amz-date"]);
  if (!signingDate) throw denied("AWS authentication requires a valid x-amz-date header");
  if (Math.abs(now.getTime() - signingDate.getTime()) > MAX_SKEW_MS) {
    throw new S3Rejection(403, "RequestTimeTooSkewed", "The difference between the request time and the current time is too large.");
  }
  const payloadHash = headers["x-amz-content-sha256"];
  if (!payloadHash) {
    throw new S3Rejection(400, "InvalidRequest", "Missing required header for this request: x-amz-content-sha256");
  }
  const names = auth.SignedHeaders.toLowerCase().split(";").filter(Boolean);
  if (!names.includes("host")) throw denied("Host must be a signed header.");
  const signedHeaders = signedHeaderValues(names, headers);
  const unsignable = new Set();
  if (!names.includes("x-amz-content-sha256")) {
    signedHeaders["x-amz-content-sha256"] = String(payloadHash);
    unsignable.add("x-amz-content-sha256");
  }
  const request = { method, protocol: "http:", hostname: "", path, query, headers: signedHeaders };
  const resigned = await makeSigner(creds, region).sign(request, {
    signingDate,
    signableHeaders: new Set(names),
    unsignableHeaders: unsignable,
  });
  const recomputed = parseAuthorization(resigned.headers.authorization);
  const ok =
    safeEqualHex(recomputed.Signature, auth.Signature) && recomputed.SignedHeaders === auth.SignedHeaders.toLowerCase();
  if (!ok) throw mismatch();
  return creds.accessKeyId;
}

/**
 * Verify a request's SigV4 signature. Resolves to the access key id; rejects with S3Rejection.
 * @param {{ method: string, rawUrl: string, headers: import("node:http").IncomingHttpHeaders,
 *   credentials: Map<string, string>, region: string, now?: Date }} input
 */
export async function verifySigV4({ method, rawUrl, headers, credentials, region, now = new Date() }) {
  const { path, rawQuery } = splitUrl(rawUrl);
  const query = parseQuery(rawQuery);
  const presigned = Object.hasOwn(query, "X-Amz-Signature") || Object.hasOwn(query, "X-Amz-Algorithm");
  const headerSigned = headers.authorization !== undefined;
  if (presigned && headerSigned) {
    throw new S3Rejection(400, "InvalidArgument", "Only one auth mechanism allowed; use the X-Amz-Algorithm query parameter or the Authorization header.");
  }
  if (Object.hasOwn(query, "Signature") || Object.hasOwn(query, "AWSAccessKeyId")) {
    throw new S3Rejection(400, "InvalidArgument", "Signature Version 2 is not supported; sign with AWS4-HMAC-SHA256.");
  }
  const input = { method, path, query, headers, credentials, region, now };
  if (presigned) return verifyPresigned(input);
  if (headerSigned) return verifyHeaderSigned(input);
  throw denied("Access Denied");
}
