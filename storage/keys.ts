// Object key naming. Every key of a lab sits under labs/<labId>/ so lab scoping is a prefix test;
// each photo gets a random 128-bit folder so a key cannot be guessed from ids alone.
import { randomBytes } from "node:crypto";

const SEGMENT = /^[A-Za-z0-9_-]{1,128}$/;
const EXT = /^[a-z0-9]{1,8}$/;
const SIZE = /^[a-z0-9]{1,16}$/;

function assertSegment(value: string, what: string): void {
  if (!SEGMENT.test(value)) throw new Error(`${what} "${value}" cannot be used in a storage key`);
}

function assertExt(ext: string): void {
  if (!EXT.test(ext)) throw new Error(`extension "${ext}" cannot be used in a storage key`);
}

export function labPrefix(labId: string): string {
  assertSegment(labId, "labId");
  return `labs/${labId}/`;
}

/** `labs/<labId>/photos/<random 128-bit hex>/<photoId>.<ext>` */
export function photoKey({ labId, photoId, ext }: { labId: string; photoId: string; ext: string }): string {
  assertSegment(photoId, "photoId");
  const cleanExt = ext.replace(/^\./, "").toLowerCase();
  assertExt(cleanExt);
  return `${labPrefix(labId)}photos/${randomBytes(16).toString("hex")}/${photoId}.${cleanExt}`;
}

/**
 * Key of a resized copy kept beside its original:
 * `labs/<lab>/photos/<rand>/<photoId>.jpg` → `labs/<lab>/photos/<rand>/derived/<photoId>-<size>.<ext>`.
 */
export function derivativeKey(originalKey: string, size: string | number, ext = "jpg"): string {
  const sizeText = String(size);
  if (!SIZE.test(sizeText)) throw new Error(`derivative size "${sizeText}" cannot be used in a storage key`);
  assertExt(ext);
  const slash = originalKey.lastIndexOf("/");
  if (slash < 0) throw new Error(`"${originalKey}" is not a photo key`);
  const dir = originalKey.slice(0, slash);
  const file = originalKey.slice(slash + 1);
  const base = file.includes(".") ? file.slice(0, file.lastIndexOf(".")) : file;
  assertSegment(base, "photo file name");
  return `${dir}/derived/${base}-${sizeText}.${ext}`;
}

/** True when `key` is a well-formed key inside the lab's prefix (no traversal tricks). */
export function keyBelongsToLab(key: string, labId: string): boolean {
  if (!SEGMENT.test(labId)) return false;
  if (!key.startsWith(`labs/${labId}/`)) return false;
  const rest = key.slice(`labs/${labId}/`.length).split("/");
  return rest.length > 0 && rest.every((part) => /^[A-Za-z0-9_.-]+$/.test(part) && part !== "." && part !== "..");
}
