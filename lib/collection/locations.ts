// The collection tree: rooms hold cabinets, cabinets cases and drawers, drawers sealed boxes. Every
// node is a chamber row (db/schema/chambers.ts), so readings, logger tokens, CSV imports, desiccant
// upkeep and hygrometer checks are the chamber ones; a trial jar is the location kind used in trials.
import type { ChamberKind } from "@/lib/humidity/hazards";

export const LOCATION_KINDS = ["trial-jar", "room", "cabinet", "case", "drawer", "sealed-box"] as const;
export type LocationKind = (typeof LOCATION_KINDS)[number];
/** Kinds that hold collection objects (a trial jar holds trial specimens through placements). */
export const STORAGE_KINDS = ["room", "cabinet", "case", "drawer", "sealed-box"] as const satisfies readonly LocationKind[];
export type StorageKind = (typeof STORAGE_KINDS)[number];

export const LOCATION_KIND_LABELS: Record<LocationKind, string> = {
  "trial-jar": "Trial jar",
  room: "Room",
  cabinet: "Cabinet",
  case: "Case",
  drawer: "Drawer",
  "sealed-box": "Sealed box",
};

export type Microclimate = "desiccant" | "salt-buffered" | "open" | "inert-gas" | "vacuum";
export const MICROCLIMATE_LABELS: Record<Microclimate, string> = {
  desiccant: "Desiccant",
  "salt-buffered": "Salt-buffered",
  open: "Open to the room",
  "inert-gas": "Inert gas",
  vacuum: "Vacuum",
};

/**
 * The microclimate a location keeps, read from how its humidity is held (the chamber kind): one
 * column, not two that could disagree. Pure water and "other" are no storage microclimate.
 */
export function microclimateOf(kind: ChamberKind): Microclimate | null {
  switch (kind) {
    case "desiccant": return "desiccant";
    case "saturated-salt": return "salt-buffered";
    case "open-shelf": return "open";
    case "inert-gas": return "inert-gas";
    case "vacuum": return "vacuum";
    default: return null;
  }
}

export function isStorageKind(kind: string): kind is StorageKind {
  return (STORAGE_KINDS as readonly string[]).includes(kind);
}

/**
 * Would giving `id` the parent `parentId` close a loop? Walks up from the new parent through the
 * current parents; a loop already present in `parentOf` also answers true rather than spinning.
 */
export function wouldCycle(id: string, parentId: string | null, parentOf: ReadonlyMap<string, string | null>): boolean {
  const seen = new Set<string>();
  for (let at: string | null = parentId; at !== null; at = parentOf.get(at) ?? null) {
    if (at === id || seen.has(at)) return true;
    seen.add(at);
  }
  return false;
}

export type TreeNode<T> = T & { depth: number; path: string[]; children: TreeNode<T>[] };

/**
 * Nodes as a forest in name order; a node whose parent is missing (archived or filtered out) becomes
 * a root so nothing disappears. `path` holds the names from the root down to the node.
 */
export function buildTree<T extends { id: string; parentId: string | null; name: string }>(rows: readonly T[]): TreeNode<T>[] {
  const byId = new Map(rows.map((r) => [r.id, r]));
  const kids = new Map<string | null, T[]>();
  for (const r of rows) {
    const key = r.parentId !== null && byId.has(r.parentId) ? r.parentId : null;
    kids.set(key, [...(kids.get(key) ?? []), r]);
  }
  const seen = new Set<string>();
  const grow = (r: T, depth: number, path: string[]): TreeNode<T> => {
    seen.add(r.id);
    const p = [...path, r.name];
    const children = (kids.get(r.id) ?? []).filter((c) => !seen.has(c.id)).sort(byName).map((c) => grow(c, depth + 1, p));
    return { ...r, depth, path: p, children };
  };
  return (kids.get(null) ?? []).sort(byName).map((r) => grow(r, 0, []));
}

const byName = (a: { name: string }, b: { name: string }) => a.name.localeCompare(b.name, "en", { numeric: true });

/** Depth-first order of a forest, for a flat indented list or a select. */
export function flattenTree<T>(nodes: readonly TreeNode<T>[]): TreeNode<T>[] {
  return nodes.flatMap((n) => [n, ...flattenTree(n.children)]);
}
