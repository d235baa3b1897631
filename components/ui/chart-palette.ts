// The product's own categorical colours for charts: verdigris and rust (tailwind.config.ts) first, then
// hues chosen to stay apart from each other and from those two, at different lightness, so neighbouring
// curves do not share a dark tone (after Paul Tol's "bright" qualitative scheme, SRON/EPS/TN/09-002).
// Charts name their colours from here instead of falling back to the charting library's default scheme.
export const CATEGORY_PALETTE = [
  "#1b7667", "#c95b1f", "#4477aa", "#aa3377", "#ccbb44", "#66ccee",
  "#4a525c", "#ee6677", "#228833", "#882255", "#99836b", "#332288",
] as const;

/**
 * Dash patterns (vega-lite strokeDash: dash, gap, … in pixels) given alongside the colours, so lines stay
 * apart in greyscale print and for readers who do not tell the colours apart. Solid first.
 */
export const DASH_PATTERNS: readonly (readonly number[])[] = [
  [1, 0], [8, 4], [2, 3], [10, 3, 2, 3], [4, 4], [12, 3, 2, 3, 2, 3],
  [1, 0], [8, 4], [2, 3], [10, 3, 2, 3], [4, 4], [12, 3, 2, 3, 2, 3],
];

/** A vega-lite colour scale giving each category, in the order given, the next palette colour. */
export function categoryScale(domain: readonly string[]): { domain: string[]; range: string[] } {
  return { domain: [...domain], range: domain.map((_, i) => CATEGORY_PALETTE[i % CATEGORY_PALETTE.length]) };
}

/** A vega-lite strokeDash scale in step with categoryScale: category i gets dash pattern i. */
export function dashScale(domain: readonly string[]): { domain: string[]; range: number[][] } {
  return { domain: [...domain], range: domain.map((_, i) => [...DASH_PATTERNS[i % DASH_PATTERNS.length]]) };
}
