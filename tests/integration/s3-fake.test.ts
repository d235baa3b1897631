// The S3 fake and storage/ together: what the browser does with presigned URLs (global fetch),
// what the server does with the SDK, and every way a request that S3 would refuse is refused.
// Status codes and error codes follow the Amazon S3 API Reference, "Error responses" (from memory).
import { GetObjectCommand } from "@aws-sdk/client-s3";
import { randomBytes, randomUUID } from "node:crypto";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { createS3Client, readStorageConfig } from "@/storage/client";
import { derivativeKey, keyBelongsToLab, labPrefix, photoKey } from "@/storage/keys";
import { presignGet, presignPut } from "@/storage/presign";
import { deleteKeys, deleteObject, getObjectBytes, getObjectRange, headObject, listKeys, putObject } from "@/storage/objects";
import { ensureS3Fake, type S3Fake } from "../support/s3";

let s3: S3Fake;
const labId = `lab-${randomUUID()}`;

beforeAll(async () => {
  s3 = await ensureS3Fake();
});

afterAll(async () => {
  if (s3) {
    const left = await listKeys(labPrefix(labId)).catch(() => []);
    if (left.length) await deleteKeys(left).catch(() => undefined);
    await s3.stop();
  }
});

function newPhotoKey(ext = "jpg") {
  return photoKey({ labId, photoId: randomUUID(), ext });
}

/** Upload through a presigned URL as the browser does. */
async function uploadBytes(key: string, bytes: Uint8Array<ArrayBuffer>, contentType = "image/jpeg") {
  const up = await presignPut({ key, contentType, contentLength: bytes.byteLength });
  return fetch(up.url, { method: up.method, headers: up.headers, body: bytes });
}

describe("presigned URLs", () => {
  it("round-trips a photo: presigned PUT then presigned GET returns identical bytes", async () => {
    const key = newPhotoKey();
    const bytes = new Uint8Array(randomBytes(200_000));
    const put = await uploadBytes(key, bytes);
    expect(put.status).toBe(200);
    expect(put.headers.get("etag")).toMatch(/^"[0-9a-f]{32}"$/);

    const get = await fetch(await presignGet({ key }));
    expect(get.status).toBe(200);
    expect(Buffer.from(await get.arrayBuffer()).equals(Buffer.from(bytes))).toBe(true);

    const info = await headObject(key);
    expect(info?.sizeBytes).toBe(bytes.byteLength);
    expect(info?.contentType).toBe("image/jpeg");
  });

  it("signs content-type and content-length into the upload URL", async () => {
    const up = await presignPut({ key: newPhotoKey(), contentType: "image/png", contentLength: 10 });
    const signed = new URL(up.url).searchParams.get("X-Amz-SignedHeaders")?.split(";");
    expect(signed).toEqual(expect.arrayContaining(["content-length", "content-type", "host"]));
  });

  it("names the download with the requested filename", async () => {
    const key = newPhotoKey();
    expect((await uploadBytes(key, new Uint8Array([1, 2, 3]))).status).toBe(200);
    const get = await fetch(await presignGet({ key, filename: "M-12 day 3.jpg" }));
    expect(get.status).toBe(200);
    expect(get.headers.get("content-disposition")).toContain('filename="M-12 day 3.jpg"');
  });

  it("refuses a tampered signature with 403 SignatureDoesNotMatch", async () => {
    const key = newPhotoKey();
    expect((await uploadBytes(key, new Uint8Array([9, 9, 9]))).status).toBe(200);
    const url = new URL(await presignGet({ key }));
    const sig = url.searchParams.get("X-Amz-Signature") ?? "";
    url.searchParams.set("X-Amz-Signature", sig.slice(0, -1) + (sig.endsWith("0") ? "1" : "0"));
    const res = await fetch(url);
    expect(res.status).toBe(403); // S3 API Reference: SignatureDoesNotMatch is 403 (from memory)
    expect(await res.text()).toContain("<Code>SignatureDoesNotMatch</Code>");
  });

  it("refuses a URL for another object than the one signed", async () => {
    const key = newPhotoKey();
    const other = newPhotoKey();
    expect((await uploadBytes(other, new Uint8Array([7]))).status).toBe(200);
    const url = (await presignGet({ key })).replace(key, other);
    expect((await fetch(url)).status).toBe(403);
  });

  it("refuses an expired URL with 403 AccessDenied 'Request has expired'", async () => {
    const key = newPhotoKey();
    expect((await uploadBytes(key, new Uint8Array([1]))).status).toBe(200);
    const url = await presignGet({ key, expiresInS: 1 });
    await new Promise((r) => setTimeout(r, 2100));
    const res = await fetch(url);
    expect(res.status).toBe(403); // S3 API Reference: AccessDenied is 403 (from memory)
    const body = await res.text();
    expect(body).toContain("<Code>AccessDenied</Code>");
    expect(body).toContain("Request has expired");
  });

  it("refuses an upload with another content type than the one signed, and stores nothing", async () => {
    const key = newPhotoKey();
    const bytes = new Uint8Array(randomBytes(1000));
    const up = await presignPut({ key, contentType: "image/jpeg", contentLength: bytes.byteLength });
    const res = await fetch(up.url, { method: "PUT", headers: { "Content-Type": "image/png" }, body: bytes });
    expect(res.status).toBe(403);
    expect(await res.text()).toContain("<Code>SignatureDoesNotMatch</Code>");
    expect(await headObject(key)).toBeNull();
  });

  it("refuses an upload of another length than the one signed, and stores nothing", async () => {
    const key = newPhotoKey();
    const up = await presignPut({ key, contentType: "image/jpeg", contentLength: 1000 });
    for (const size of [1001, 999]) {
      const res = await fetch(up.url, { method: "PUT", headers: up.headers, body: new Uint8Array(size) });
      expect(res.status).toBe(403);
    }
    expect(await headObject(key)).toBeNull();
  });

  it("refuses unsigned requests with 403 AccessDenied", async () => {
    const key = newPhotoKey();
    expect((await uploadBytes(key, new Uint8Array([5, 6]))).status).toBe(200);
    const get = await fetch(`${s3.endpoint}/${s3.bucket}/${key}`);
    expect(get.status).toBe(403);
    expect(await get.text()).toContain("<Code>AccessDenied</Code>");
    const put = await fetch(`${s3.endpoint}/${s3.bucket}/${newPhotoKey()}`, { method: "PUT", body: "x" });
    expect(put.status).toBe(403);
    const list = await fetch(`${s3.endpoint}/${s3.bucket}?list-type=2`);
    expect(list.status).toBe(403);
  });
});

describe("SDK operations", () => {
  it("puts, heads, reads (whole and ranged), lists and deletes objects", async () => {
    const key = newPhotoKey("png");
    // PNG signature, PNG spec (ISO/IEC 15948) section 5.2: 89 50 4E 47 0D 0A 1A 0A
    const png = Uint8Array.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a, ...randomBytes(5000)]);
    const { etag } = await putObject({ key, body: png, contentType: "image/png" });
    expect(etag).toMatch(/^"[0-9a-f]{32}"$/);

    const info = await headObject(key);
    expect(info).toMatchObject({ key, sizeBytes: png.byteLength, contentType: "image/png", etag });

    const whole = await getObjectBytes(key);
    expect(Buffer.from(whole ?? []).equals(Buffer.from(png))).toBe(true);
    const head8 = await getObjectRange(key, 0, 7);
    expect(Array.from(head8 ?? [])).toEqual([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]);

    const thumb = derivativeKey(key, 256);
    await putObject({ key: thumb, body: "thumbnail", contentType: "image/jpeg" });
    expect((await listKeys(labPrefix(labId))).filter((k) => k === key || k === thumb).sort()).toEqual([key, thumb].sort());

    await deleteObject(key);
    expect(await headObject(key)).toBeNull();
    expect(await getObjectBytes(key)).toBeNull();
    await deleteKeys([thumb]);
    expect(await headObject(thumb)).toBeNull();
  });

  it("carries a 3 MB body through intact", async () => {
    const key = newPhotoKey("tif");
    const big = new Uint8Array(randomBytes(3 * 1024 * 1024));
    await putObject({ key, body: big, contentType: "image/tiff" });
    expect(Buffer.from((await getObjectBytes(key)) ?? []).equals(Buffer.from(big))).toBe(true);
  });

  it("refuses a client that signs with a wrong secret or an unknown key", async () => {
    const key = newPhotoKey();
    await putObject({ key, body: "x", contentType: "text/plain" });
    const config = readStorageConfig();
    const wrongSecret = createS3Client({ ...config, secretAccessKey: `${config.secretAccessKey}-wrong` });
    await expect(wrongSecret.send(new GetObjectCommand({ Bucket: config.bucket, Key: key }))).rejects.toMatchObject({
      name: "SignatureDoesNotMatch",
      $metadata: { httpStatusCode: 403 },
    });
    const unknownKey = createS3Client({ ...config, accessKeyId: "someone-else" });
    await expect(unknownKey.send(new GetObjectCommand({ Bucket: config.bucket, Key: key }))).rejects.toMatchObject({
      name: "InvalidAccessKeyId",
      $metadata: { httpStatusCode: 403 },
    });
    wrongSecret.destroy();
    unknownKey.destroy();
  });
});

describe("CORS for browser uploads", () => {
  it("answers a preflight from an allowed origin with the headers a browser needs", async () => {
    const origin = s3.corsOrigins[0];
    const res = await fetch(`${s3.endpoint}/${s3.bucket}/${newPhotoKey()}`, {
      method: "OPTIONS",
      headers: { Origin: origin, "Access-Control-Request-Method": "PUT", "Access-Control-Request-Headers": "content-type" },
    });
    // Fetch Standard, CORS protocol: an OK status plus matching Allow-Origin/-Methods/-Headers
    expect(res.status).toBe(200);
    expect(res.headers.get("access-control-allow-origin")).toBe(origin);
    expect(res.headers.get("access-control-allow-methods")).toContain("PUT");
    expect(res.headers.get("access-control-allow-headers")?.toLowerCase()).toContain("content-type");
    expect(res.headers.get("access-control-expose-headers")).toContain("ETag");
  });

  it("gives no CORS headers to another origin", async () => {
    const res = await fetch(`${s3.endpoint}/${s3.bucket}/${newPhotoKey()}`, {
      method: "OPTIONS",
      headers: { Origin: "http://elsewhere.example", "Access-Control-Request-Method": "PUT" },
    });
    expect(res.status).toBe(403);
    expect(res.headers.get("access-control-allow-origin")).toBeNull();
  });

  it("adds Allow-Origin to a real response for an allowed origin only", async () => {
    const key = newPhotoKey();
    expect((await uploadBytes(key, new Uint8Array([1, 2]))).status).toBe(200);
    const url = await presignGet({ key });
    const allowed = await fetch(url, { headers: { Origin: s3.corsOrigins[0] } });
    expect(allowed.headers.get("access-control-allow-origin")).toBe(s3.corsOrigins[0]);
    const other = await fetch(url, { headers: { Origin: "http://elsewhere.example" } });
    expect(other.status).toBe(200);
    expect(other.headers.get("access-control-allow-origin")).toBeNull();
  });
});

describe("storage keys", () => {
  it("puts each photo under its lab with an unguessable 128-bit folder", () => {
    const a = photoKey({ labId: "lab1", photoId: "p1", ext: "JPG" });
    const b = photoKey({ labId: "lab1", photoId: "p1", ext: "jpg" });
    expect(a).toMatch(/^labs\/lab1\/photos\/[0-9a-f]{32}\/p1\.jpg$/);
    expect(a).not.toBe(b);
    expect(keyBelongsToLab(a, "lab1")).toBe(true);
    expect(keyBelongsToLab(a, "lab2")).toBe(false);
    expect(keyBelongsToLab("labs/lab1/../lab2/photos/x/p.jpg", "lab1")).toBe(false);
    expect(derivativeKey(a, "thumb")).toBe(a.replace(/\/p1\.jpg$/, "/derived/p1-thumb.jpg"));
    expect(() => photoKey({ labId: "../x", photoId: "p", ext: "jpg" })).toThrow();
  });
});
