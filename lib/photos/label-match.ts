// Find which specimen a photo shows from its file name, e.g. "TV-M-001_day14.jpg" → TV-M-001.
// Separators in labels are loose ("tv_m_001", "TVM001" match too), but a label must not run on into
// more letters or digits: "TV-M-0012" is not TV-M-001.

export type LabelCandidate = { id: string; label: string };
export type LabelMatch =
  | { kind: "match"; id: string; label: string }
  | { kind: "none" }
  | { kind: "ambiguous"; labels: string[] };

function escape(s: string): string {
  return s.replace(/[.*+?^${}()|[\]\\]/g, "\\$&");
}

function labelPattern(label: string): RegExp | null {
  const parts = label.toLowerCase().match(/[\p{L}\p{N}]+/gu);
  if (!parts) return null;
  return new RegExp(`(?:^|[^\\p{L}\\p{N}])${parts.map(escape).join("[-_ .]?")}(?![\\p{L}\\p{N}])`, "u");
}

/** The file name without folders or extension, lower-cased. */
export function fileStem(fileName: string): string {
  const base = fileName.split(/[\\/]/).pop() ?? fileName;
  return base.replace(/\.[A-Za-z0-9]{1,5}$/, "").toLowerCase();
}

export function matchSpecimenLabel(fileName: string, candidates: readonly LabelCandidate[]): LabelMatch {
  const stem = fileStem(fileName);
  const hits = candidates.filter((c) => labelPattern(c.label)?.test(stem));
  if (hits.length === 0) return { kind: "none" };
  // "A-1" and "A-1-b" may both match "A-1-b.jpg": the longer label is the more specific one.
  const longest = Math.max(...hits.map((h) => h.label.length));
  const best = hits.filter((h) => h.label.length === longest);
  if (best.length > 1) return { kind: "ambiguous", labels: best.map((b) => b.label) };
  return { kind: "match", id: best[0].id, label: best[0].label };
}

/** A safe display name for an uploaded file: no folders, no control characters, at most 200 characters. */
export function cleanFileName(fileName: string): string {
  const base = (fileName.split(/[\\/]/).pop() ?? "").replace(/[\u0000-\u001f\u007f]/g, "").trim();
  return (base || "photo").slice(0, 200);
}
