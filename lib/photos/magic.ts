// Magic-byte checks: what a file's first bytes say it is, whatever its name or claimed type says.
// Signatures: JPEG SOI FF D8 FF; PNG 89 50 4E 47 0D 0A 1A 0A; TIFF "II*\0" / "MM\0*";
// HEIF/HEIC an ISO-BMFF "ftyp" box at offset 4 with a HEIF brand (common practice / the formats' specs).
import type { PhotoContentType } from "./config";

const HEIF_BRANDS = new Set(["heic", "heix", "hevc", "hevx", "heim", "heis", "hevm", "hevs", "mif1", "msf1", "mif2"]);

function ascii(bytes: Uint8Array, start: number, end: number): string {
  return String.fromCharCode(...bytes.subarray(start, end));
}

/** The image type the bytes start with, or null when none of the accepted ones. Needs ≥ 12 bytes. */
export function sniffImageType(bytes: Uint8Array): PhotoContentType | null {
  const b = bytes;
  if (b.length >= 3 && b[0] === 0xff && b[1] === 0xd8 && b[2] === 0xff) return "image/jpeg";
  if (b.length >= 8 && [0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a].every((v, i) => b[i] === v)) return "image/png";
  if (b.length >= 4 && ((b[0] === 0x49 && b[1] === 0x49 && b[2] === 0x2a && b[3] === 0x00) || (b[0] === 0x4d && b[1] === 0x4d && b[2] === 0x00 && b[3] === 0x2a))) {
    return "image/tiff";
  }
  if (b.length >= 12 && ascii(b, 4, 8) === "ftyp") {
    // Major brand first, then the compatible brands that fit in what we were given.
    const boxSize = ((b[0] << 24) | (b[1] << 16) | (b[2] << 8) | b[3]) >>> 0;
    const end = Math.min(b.length, Math.max(16, boxSize));
    const brands = [ascii(b, 8, 12)];
    for (let o = 16; o + 4 <= end; o += 4) brands.push(ascii(b, o, o + 4));
    if (brands.some((brand) => HEIF_BRANDS.has(brand))) return "image/heic";
  }
  return null;
}

export function describeSniffed(t: PhotoContentType | null): string {
  if (t === null) return "not an image type we accept";
  return { "image/jpeg": "a JPEG", "image/png": "a PNG", "image/tiff": "a TIFF", "image/heic": "a HEIC/HEIF image" }[t];
}
