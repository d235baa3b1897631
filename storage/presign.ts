// Presigned URLs: the browser uploads and downloads photos straight from storage.
// An upload URL is bound to one content type, one exact byte count and, given its SHA-256, to the
// exact bytes: storage checks x-amz-checksum-sha256 against the body (AWS S3 API reference, checksum
// headers), and the header is signed, so the bytes cannot be replaced while the URL is still valid.
import { GetObjectCommand, PutObjectCommand } from "@aws-sdk/client-s3";
import { getSignedUrl } from "@aws-sdk/s3-request-presigner";
import { getStorage } from "./client";

const MAX_EXPIRES_S = 7 * 24 * 3600; // SigV4 presigned URLs live at most a week

function checkExpiry(expiresInS: number): void {
  if (!Number.isInteger(expiresInS) || expiresInS < 1 || expiresInS > MAX_EXPIRES_S) {
    throw new Error(`expiresInS must be a whole number of seconds from 1 to ${MAX_EXPIRES_S}`);
  }
}

export interface PresignedUpload {
  url: string;
  method: "PUT";
  /** Headers the browser must send unchanged (Content-Length is set by the browser from the body). */
  headers: { "Content-Type": string; "x-amz-checksum-sha256"?: string };
  expiresAt: string;
}

export async function presignPut({
  key,
  contentType,
  contentLength,
  sha256,
  expiresInS = 600,
}: {
  key: string;
  contentType: string;
  contentLength: number;
  /** Hex SHA-256 of the bytes to be uploaded; only those bytes are then accepted. */
  sha256?: string;
  expiresInS?: number;
}): Promise<PresignedUpload> {
  checkExpiry(expiresInS);
  if (!Number.isInteger(contentLength) || contentLength < 0) throw new Error("contentLength must be a whole number of bytes");
  if (sha256 !== undefined && !/^[0-9a-f]{64}$/.test(sha256)) throw new Error("sha256 must be 64 lower-case hex digits");
  const checksum = sha256 === undefined ? undefined : Buffer.from(sha256, "hex").toString("base64");
  const { presignClient, config } = getStorage();
  const command = new PutObjectCommand({
    Bucket: config.bucket,
    Key: key,
    ContentType: contentType,
    ContentLength: contentLength,
    ChecksumSHA256: checksum,
  });
  const url = await getSignedUrl(presignClient, command, {
    expiresIn: expiresInS,
    // The presigner leaves content-type unsigned by default; signing it pins the upload. The
    // checksum stays a header (not hoisted into the query) so storage checks it against the body.
    signableHeaders: new Set(["content-type", "content-length", ...(checksum ? ["x-amz-checksum-sha256"] : [])]),
    unhoistableHeaders: new Set(checksum ? ["x-amz-checksum-sha256"] : []),
  });
  return {
    url,
    method: "PUT",
    headers: { "Content-Type": contentType, ...(checksum ? { "x-amz-checksum-sha256": checksum } : {}) },
    expiresAt: new Date(Date.now() + expiresInS * 1000).toISOString(),
  };
}

/** `attachment; filename="..."` with an ASCII fallback and the exact UTF-8 name (RFC 6266). */
function contentDisposition(filename: string, disposition: "inline" | "attachment"): string {
  const ascii = filename.replace(/[^\x20-\x7e]/g, "_").replace(/["\\]/g, "_");
  const encoded = encodeURIComponent(filename).replace(/['()*]/g, (c) => `%${c.charCodeAt(0).toString(16).toUpperCase()}`);
  return `${disposition}; filename="${ascii}"; filename*=UTF-8''${encoded}`;
}

/** A time-limited GET URL; with `filename` the browser saves the file under that name. */
export async function presignGet({
  key,
  expiresInS = 300,
  filename,
  disposition = "attachment",
}: {
  key: string;
  expiresInS?: number;
  filename?: string;
  disposition?: "inline" | "attachment";
}): Promise<string> {
  checkExpiry(expiresInS);
  const { presignClient, config } = getStorage();
  const command = new GetObjectCommand({
    Bucket: config.bucket,
    Key: key,
    ResponseContentDisposition: filename ? contentDisposition(filename, disposition) : undefined,
  });
  return getSignedUrl(presignClient, command, { expiresIn: expiresInS });
}
