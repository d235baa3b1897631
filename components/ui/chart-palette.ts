// The product's own categorical colours for charts, from the Tailwind theme (tailwind.config.ts):
// verdigris, rust and iron first, then tones that stay apart in print. Charts name their colours from
// here instead of falling back to the charting library's default category scheme.
export const CATEGORY_PALETTE = [
  "#1b7667", "#c95b1f", "#4a525c", "#6b4fa8", "#2f78b5", "#a8841f",
  "#8a3b5e", "#3faf99", "#e07638", "#8f98a3", "#4f8a2b", "#1f4468",
] as const;

/** A vega-lite colour scale giving each category, in the order given, the next palette colour. */
export function categoryScale(domain: readonly string[]): { domain: string[]; range: string[] } {
  return { domain: [...domain], range: domain.map((_, i) => CATEGORY_PALETTE[i % CATEGORY_PALETTE.length]) };
}
