// Web worker: the colour-based rust estimate on the display image, off the main thread.
// Loads the image itself (fetch → ImageBitmap → OffscreenCanvas), keeps the last image's pixels so a
// re-run after editing the face does not download again, and answers with the fraction and a PNG of
// the mask for the overlay. With a grey patch, the patch is read on the same pixels and the face is
// classified through its white-balance and exposure gains; a patch that cannot be used is an error
// naming the patch, and no estimate.
import { gainTable, measurePatch, normalisedBasis, patchProblem, type EstimateColourBasis, type PatchRect } from "@/lib/scoring/colour-normalise";
import type { Point } from "@/lib/scoring/geometry";
import { countRust, type RgbaImage } from "@/lib/scoring/rust-estimate";
import type { ColourPatchInput } from "@/lib/validation/scores";

export type EstimateRequest = {
  id: number; url: string; face: Point[]; originalWidth: number; originalHeight: number;
  /** The grey patch in original-image pixels and its known L*; null: classify the pixels as they are. */
  patch: (PatchRect & { patchLightness: number }) | null;
};
export type EstimateResponse =
  | { id: number; type: "progress"; stage: "loading" | "measuring" | "classifying" | "drawing" }
  | {
    id: number; type: "done"; fraction: number; facePixels: number; rustPixels: number; byClass: [number, number, number]; imageWidth: number; imageHeight: number; mask: Blob;
    basis: EstimateColourBasis; patchReading: ColourPatchInput | null;
  }
  | { id: number; type: "error"; message: string; field?: "patch" };

// Typed locally: the project's TypeScript lib is "dom", and mixing in "webworker" clashes with it.
const scope = self as unknown as { postMessage(msg: EstimateResponse): void; onmessage: ((e: MessageEvent<EstimateRequest>) => void) | null };

// Overlay colours by class: cyan (rust), blue (dark rust), magenta (pale droplets) — far from the
// orange marks and from each other, so the classes can be told apart.
const OVERLAY = [[0, 0, 0, 0], [40, 210, 255, 200], [60, 90, 255, 210], [235, 60, 220, 210]] as const;

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
    rgba.set(OVERLAY[mask[i]], i * 4);
  }
  const canvas = new OffscreenCanvas(image.width, image.height);
  canvas.getContext("2d")!.putImageData(new ImageData(rgba, image.width, image.height), 0, 0);
  return canvas.convertToBlob({ type: "image/png" });
}

scope.onmessage = async (e) => {
  const { id, url, face, originalWidth, originalHeight, patch } = e.data;
  try {
    scope.postMessage({ id, type: "progress", stage: "loading" });
    const image = await loadPixels(url);
    // The face and patch are drawn in original-image pixels; the display copy may be smaller.
    const sx = image.width / originalWidth;
    const sy = image.height / originalHeight;
    const scaled = face.map((p) => ({ x: p.x * sx, y: p.y * sy }));
    let table: Uint8Array | null = null;
    let basis: EstimateColourBasis = { normalised: false };
    let patchReading: ColourPatchInput | null = null;
    if (patch) {
      scope.postMessage({ id, type: "progress", stage: "measuring" });
      const stats = measurePatch(image, { x: patch.x * sx, y: patch.y * sy, width: patch.width * sx, height: patch.height * sy });
      const problem = patchProblem(stats);
      if (problem) {
        scope.postMessage({ id, type: "error", message: problem.message, field: "patch" });
        return;
      }
      patchReading = { ...patch, ...stats };
      basis = normalisedBasis(patchReading);
      if (basis.normalised) table = gainTable(basis.gains);
    }
    scope.postMessage({ id, type: "progress", stage: "classifying" });
    const mask = new Uint8Array(image.width * image.height);
    const counts = countRust(image, scaled, table, mask);
    scope.postMessage({ id, type: "progress", stage: "drawing" });
    const png = await maskPng(image, mask);
    scope.postMessage({
      id, type: "done", fraction: counts.rust / counts.face, facePixels: counts.face, rustPixels: counts.rust, byClass: [counts.byClass[1], counts.byClass[2], counts.byClass[3]],
      imageWidth: image.width, imageHeight: image.height, mask: png, basis, patchReading,
    });
  } catch (err) {
    scope.postMessage({ id, type: "error", message: err instanceof Error ? err.message : String(err) });
  }
};
