// Colour-based rust estimate on a 24-megapixel (6000 × 4000) synthetic specimen face, in Node.
// Run: npx tsx bench/scoring-bench.ts [--noise]   — target: median under 1000 ms.
// Timing covers the estimate only, not rendering the synthetic image.
import { pathToFileURL } from "node:url";
import { renderSpecimenFace, scatterRustSpots, specimenFaceOutline } from "@/lib/demo-images/specimen-face";
import { estimateRustFraction } from "@/lib/scoring/rust-estimate";

export type ScoringBenchResult = {
  width: number;
  height: number;
  runs: number;
  /** Every run, in order; the first includes filling the colour-verdict cache. */
  runsMs: number[];
  medianMs: number;
  targetMs: number;
  withinTarget: boolean;
  estimatedFraction: number;
  trueFraction: number;
  /**
   * One run on uniform random noise of the same size, first thing in the process if nothing ran
   * before: nearly every pixel a new colour, so the verdict cache barely helps. A bound, not a
   * photo — real photos repeat colours far more. Only measured when asked for.
   */
  noiseImageMs?: number;
};

export function runScoringBench(
  opts: { width?: number; height?: number; runs?: number; noiseImage?: boolean } = {},
): ScoringBenchResult {
  const width = opts.width ?? 6000;
  const height = opts.height ?? 4000;
  const runs = opts.runs ?? 5;
  const noiseImageMs = opts.noiseImage ? timeNoiseImage(width, height) : undefined;
  const seed = "bench-24mp";
  const rustSpots = scatterRustSpots(specimenFaceOutline(width, height, seed), {
    count: 40,
    rMin: width / 200,
    rMax: width / 40,
    seed,
  });
  const image = renderSpecimenFace({ width, height, seed, kind: "stony-iron", rustSpots });

  const runsMs: number[] = [];
  let estimatedFraction = 0;
  for (let i = 0; i < runs; i++) {
    const t0 = performance.now();
    estimatedFraction = estimateRustFraction(image, image.face);
    runsMs.push(performance.now() - t0);
  }
  const sorted = runsMs.slice().sort((a, b) => a - b);
  const medianMs = sorted[Math.floor(sorted.length / 2)];
  return {
    width,
    height,
    runs,
    runsMs,
    medianMs,
    targetMs: 1000,
    withinTarget: medianMs < 1000,
    estimatedFraction,
    trueFraction: image.trueRustFraction,
    noiseImageMs,
  };
}

function timeNoiseImage(width: number, height: number): number {
  const data = new Uint8ClampedArray(width * height * 4);
  let state = 12345;
  for (let i = 0; i < data.length; i++) {
    state = (Math.imul(state, 1103515245) + 12345) >>> 0;
    data[i] = state >>> 24;
  }
  const face = [
    { x: 0, y: 0 },
    { x: width, y: 0 },
    { x: width, y: height },
    { x: 0, y: height },
  ];
  const t0 = performance.now();
  estimateRustFraction({ width, height, data }, face);
  return performance.now() - t0;
}

if (process.argv[1] && import.meta.url === pathToFileURL(process.argv[1]).href) {
  const r = runScoringBench({ noiseImage: process.argv.includes("--noise") });
  console.log(`estimateRustFraction on ${r.width}×${r.height} (${((r.width * r.height) / 1e6).toFixed(0)} MP), ${r.runs} runs`);
  console.log(`  runs: ${r.runsMs.map((ms) => ms.toFixed(0)).join(", ")} ms`);
  console.log(`  median: ${r.medianMs.toFixed(0)} ms (target < ${r.targetMs} ms) — ${r.withinTarget ? "OK" : "TOO SLOW"}`);
  console.log(`  estimate ${(100 * r.estimatedFraction).toFixed(2)} % vs painted ${(100 * r.trueFraction).toFixed(2)} %`);
  if (r.noiseImageMs !== undefined) {
    console.log(`  random-noise image, cold cache (worst case, not a photo): ${r.noiseImageMs.toFixed(0)} ms`);
  }
  if (!r.withinTarget) process.exitCode = 1;
}
