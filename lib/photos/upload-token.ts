// The receipt a browser gets with its presigned URL and hands back to finalise the upload.
// Nothing is written to the database at presign time, so this HMAC-signed token is what proves
// the server approved this key for this lab, user, inspection, specimen, type and size.
import { createHmac, timingSafeEqual } from "node:crypto";

export type UploadClaim = {
  key: string;
  labId: string;
  userId: string;
  trialId: string;
  inspectionId: string;
  specimenId: string;
  contentType: string;
  sizeBytes: number;
  /** Hex SHA-256 the upload URL was signed for. */
  sha256: string;
  filename: string;
  /** Unix seconds after which the token is refused. */
  exp: number;
};

function mac(secret: string, payload: string): Buffer {
  return createHmac("sha256", `rustline-photo-upload:${secret}`).update(payload).digest();
}

export function signUploadToken(claim: UploadClaim, secret: string): string {
  if (!secret) throw new Error("an upload-token secret is required");
  const payload = Buffer.from(JSON.stringify({ v: 2, ...claim })).toString("base64url");
  return `${payload}.${mac(secret, payload).toString("base64url")}`;
}

export type TokenResult = { ok: true; claim: UploadClaim } | { ok: false; reason: "malformed" | "bad-signature" | "expired" };

export function verifyUploadToken(token: string, secret: string, nowS = Math.floor(Date.now() / 1000)): TokenResult {
  const [payload, sig, extra] = token.split(".");
  if (!payload || !sig || extra !== undefined) return { ok: false, reason: "malformed" };
  const expected = mac(secret, payload);
  const given = Buffer.from(sig, "base64url");
  if (given.length !== expected.length || !timingSafeEqual(given, expected)) return { ok: false, reason: "bad-signature" };
  let claim: UploadClaim & { v?: number };
  try {
    claim = JSON.parse(Buffer.from(payload, "base64url").toString("utf8"));
  } catch {
    return { ok: false, reason: "malformed" };
  }
  if (claim.v !== 2 || typeof claim.key !== "string" || typeof claim.sha256 !== "string" || typeof claim.exp !== "number" || !Number.isInteger(claim.sizeBytes)) {
    return { ok: false, reason: "malformed" };
  }
  if (claim.exp < nowS) return { ok: false, reason: "expired" };
  const { v: _v, ...rest } = claim;
  return { ok: true, claim: rest };
}
