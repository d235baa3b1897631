// Which points of a trial's photo protocol a photo was recorded without. A photo with no record
// misses every point; a point reworded since is missing until confirmed again.
export function missingProtocolPoints(protocol: readonly string[], confirmed: readonly string[] | null | undefined): string[] {
  const have = new Set((confirmed ?? []).map((l) => l.trim()));
  return protocol.filter((l) => !have.has(l.trim()));
}

/** The scale that holds for a photo: its own, else its specimen's series scale, else none. */
export function effectivePxPerMm(own: number | null | undefined, series: number | null | undefined): { pxPerMm: number; from: "photo" | "series" } | null {
  if (own != null && own > 0) return { pxPerMm: own, from: "photo" };
  if (series != null && series > 0) return { pxPerMm: series, from: "series" };
  return null;
}
