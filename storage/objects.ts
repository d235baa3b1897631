// Server-side object operations on the configured bucket. "Not there" is an answer (null), not an error.
import {
  DeleteObjectCommand,
  DeleteObjectsCommand,
  GetObjectCommand,
  HeadObjectCommand,
  ListObjectsV2Command,
  PutObjectCommand,
} from "@aws-sdk/client-s3";
import type { Readable } from "node:stream";
import { getStorage } from "./client";

export interface ObjectInfo {
  key: string;
  sizeBytes: number;
  contentType: string | undefined;
  etag: string | undefined;
  lastModified: Date | undefined;
}

function isNotFound(err: unknown): boolean {
  const e = err as { name?: string; $metadata?: { httpStatusCode?: number } };
  return e?.$metadata?.httpStatusCode === 404 || e?.name === "NotFound" || e?.name === "NoSuchKey";
}

export async function headObject(key: string): Promise<ObjectInfo | null> {
  const { client, config } = getStorage();
  try {
    const out = await client.send(new HeadObjectCommand({ Bucket: config.bucket, Key: key }));
    return {
      key,
      sizeBytes: out.ContentLength ?? 0,
      contentType: out.ContentType,
      etag: out.ETag,
      lastModified: out.LastModified,
    };
  } catch (err) {
    if (isNotFound(err)) return null;
    throw err;
  }
}

async function getBytes(key: string, range?: string): Promise<Uint8Array | null> {
  const { client, config } = getStorage();
  try {
    const out = await client.send(new GetObjectCommand({ Bucket: config.bucket, Key: key, Range: range }));
    if (!out.Body) return new Uint8Array();
    return await out.Body.transformToByteArray();
  } catch (err) {
    if (isNotFound(err)) return null;
    throw err;
  }
}

/** The whole object, or null when it does not exist. */
export function getObjectBytes(key: string): Promise<Uint8Array | null> {
  return getBytes(key);
}

/**
 * Bytes `startByte`..`endByte` inclusive (HTTP Range semantics), e.g. (key, 0, 15) for magic bytes.
 * A range past the end is cut short by the store; a missing object gives null.
 */
export function getObjectRange(key: string, startByte: number, endByte: number): Promise<Uint8Array | null> {
  if (!Number.isInteger(startByte) || !Number.isInteger(endByte) || startByte < 0 || endByte < startByte) {
    throw new Error(`bad byte range ${startByte}-${endByte}`);
  }
  return getBytes(key, `bytes=${startByte}-${endByte}`);
}

export async function putObject({
  key,
  body,
  contentType,
  contentLength,
}: {
  key: string;
  body: Uint8Array | string | Readable;
  contentType: string;
  /** Required for a stream body (S3 needs the length up front). */
  contentLength?: number;
}): Promise<{ etag: string | undefined }> {
  const { client, config } = getStorage();
  const length = typeof body === "string" ? Buffer.byteLength(body) : body instanceof Uint8Array ? body.byteLength : contentLength;
  if (length === undefined) throw new Error("putObject: contentLength is required for a stream body");
  const out = await client.send(
    new PutObjectCommand({ Bucket: config.bucket, Key: key, Body: body, ContentType: contentType, ContentLength: length }),
  );
  return { etag: out.ETag };
}

/** Deleting a key that does not exist succeeds, as in S3. */
export async function deleteObject(key: string): Promise<void> {
  const { client, config } = getStorage();
  await client.send(new DeleteObjectCommand({ Bucket: config.bucket, Key: key }));
}

/** Delete many keys (1000 per request, S3's limit); throws if the store reports any failure. */
export async function deleteKeys(keys: string[]): Promise<void> {
  const { client, config } = getStorage();
  for (let i = 0; i < keys.length; i += 1000) {
    const batch = keys.slice(i, i + 1000);
    const out = await client.send(
      new DeleteObjectsCommand({ Bucket: config.bucket, Delete: { Objects: batch.map((Key) => ({ Key })), Quiet: true } }),
    );
    if (out.Errors?.length) {
      const first = out.Errors[0];
      throw new Error(`could not delete ${out.Errors.length} object(s), e.g. ${first.Key}: ${first.Code} ${first.Message}`);
    }
  }
}

/** Every key under `prefix`, following continuation tokens. */
export async function listKeys(prefix: string): Promise<string[]> {
  const { client, config } = getStorage();
  const keys: string[] = [];
  let token: string | undefined;
  do {
    const out = await client.send(
      new ListObjectsV2Command({ Bucket: config.bucket, Prefix: prefix, ContinuationToken: token }),
    );
    for (const item of out.Contents ?? []) if (item.Key) keys.push(item.Key);
    token = out.IsTruncated ? out.NextContinuationToken : undefined;
  } while (token);
  return keys;
}
