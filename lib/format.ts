// Display formats used across pages. Times show in UTC with the zone named, so colleagues in
// different places read the same instant.
export function formatDateTime(d: Date | string): string {
  const date = typeof d === "string" ? new Date(d) : d;
  return `${date.toISOString().slice(0, 16).replace("T", " ")} UTC`;
}

export function formatDate(d: Date | string): string {
  const date = typeof d === "string" ? new Date(d) : d;
  return date.toISOString().slice(0, 10);
}

export function formatNumber(x: number | null | undefined, digits = 1, unit = ""): string {
  if (x == null || !Number.isFinite(x)) return "—";
  return `${x.toFixed(digits)}${unit ? `\u202f${unit}` : ""}`;
}
