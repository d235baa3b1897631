// Web worker: the colour-based rust estimate on the display image, off the main thread.
// Loads the image itself (fetch → ImageBitmap → OffscreenCanvas), keeps the last image's pixels so a
// re-run after editing the face does not download again, and answers with the fraction and a PNG of
// the mask for the overlay.
import type { Point } from "@/lib/scoring/geometry";
import { estimateRustFraction, rustMask, type RgbaImage } from "@/lib/scoring/rust-estimate";

export type EstimateRequest = { id: number; url: string; face: Point[]; originalWidth: number; originalHeight: number };
export type EstimateResponse =
  | { id: number; type: "progress"; stage: "loading" | "classifying" | "drawing" }
  | { id: number; type: "done"; fraction: number; rustPixels: number; imageWidth: number; imageHeight: number; mask: Blob }
  | { id: number; type: "error"; message: string };

// Typed locally: the project's TypeScript lib is "dom", and mixing in "webworker" clashes with it.
const scope = self as unknown as { postMessage(msg: EstimateResponse): void; onmessage: ((e: MessageEvent<EstimateRequest>) => void) | null };

// Overlay colour: cyan, far from both rust and the orange marks, so the two can be compared.
const OVERLAY = [40, 210, 255, 200] as const;

let cached: { url: string; image: RgbaImage } | null = null;

async function loadPixels(url: string): Promise<RgbaImage> {
  // Signed URLs change on every page load; the object path identifies the image.
  const key = url.split("?")[0];
  if (cached?.url === key) return cached.image;
  const res = await fetch(url, { mode: "cors", credentials: "omit" });
  if (!res.ok) throw new Error(`the image could not be loaded (HTTP ${res.status})`);
  const bitmap = await createImageBitmap(await res.blob());
  const canvas = new OffscreenCanvas(bitmap.width, bitmap.height);
  const ctx = canvas.getContext("2d", { willReadFrequently: true });
  if (!ctx) throw new Error("this browser cannot read image pixels in a worker");
  ctx.drawImage(bitmap, 0, 0);
  bitmap.close();
  const data = ctx.getImageData(0, 0, canvas.width, canvas.height);
  const image = { width: data.width, height: data.height, data: data.data };
  cached = { url: key, image };
  return image;
}

async function maskPng(image: RgbaImage, mask: Uint8Array): Promise<Blob> {
  const rgba = new Uint8ClampedArray(image.width * image.height * 4);
  for (let i = 0; i < mask.length; i++) {
    if (!mask[i]) continue;
    const o = i * 4;
    rgba[o] = OVERLAY[0];
    rgba[o + 1] = OVERLAY[1];
    rgba[o + 2] = OVERLAY[2];
    rgba[o + 3] = OVERLAY[3];
  }
  const canvas = new OffscreenCanvas(image.width, image.height);
  canvas.getContext("2d")!.putImageData(new ImageData(rgba, image.width, image.height), 0, 0);
  return canvas.convertToBlob({ type: "image/png" });
}

scope.onmessage = async (e) => {
  const { id, url, face, originalWidth, originalHeight } = e.data;
  try {
    scope.postMessage({ id, type: "progress", stage: "loading" });
    const image = await loadPixels(url);
    // The face is drawn in original-image pixels; the display copy may be smaller.
    const sx = image.width / originalWidth;
    const sy = image.height / originalHeight;
    const scaled = face.map((p) => ({ x: p.x * sx, y: p.y * sy }));
    scope.postMessage({ id, type: "progress", stage: "classifying" });
    const mask = rustMask(image, scaled);
    const fraction = estimateRustFraction(image, scaled);
    let rustPixels = 0;
    for (let i = 0; i < mask.length; i++) rustPixels += mask[i];
    scope.postMessage({ id, type: "progress", stage: "drawing" });
    const png = await maskPng(image, mask);
    scope.postMessage({ id, type: "done", fraction, rustPixels, imageWidth: image.width, imageHeight: image.height, mask: png });
  } catch (err) {
    scope.postMessage({ id, type: "error", message: err instanceof Error ? err.message : String(err) });
  }
};
