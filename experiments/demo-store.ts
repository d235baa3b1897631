// The demo's small store (invented): one room, two cabinets, drawers and sealed boxes, and
// archaeological iron finds that were never in a trial, each with its storage history.
export type DemoLocation = {
  key: string; name: string; parent: string | null; locationKind: "room" | "cabinet" | "case" | "drawer" | "sealed-box";
  kind: "open-shelf" | "desiccant" | "saturated-salt" | "inert-gas"; saltId?: "MgCl2"; desiccantKind?: "silica-gel"; desiccantMassG?: number;
  setpointRhPercent: number; toleranceRhPercent: number; keeper?: "technician" | "researcher";
  /** Mean and daily swing of the logged RH (%RH) for the demo readings; null for no logger. */
  climate: { meanRh: number; swingRh: number } | null;
};

export const demoLocations: DemoLocation[] = [
  { key: "store", name: "Store 2 (basement)", parent: null, locationKind: "room", kind: "open-shelf", setpointRhPercent: 45, toleranceRhPercent: 10, keeper: "technician", climate: { meanRh: 48, swingRh: 6 } },
  { key: "cabMetals", name: "Metals cabinet M1", parent: "store", locationKind: "cabinet", kind: "open-shelf", setpointRhPercent: 40, toleranceRhPercent: 8, keeper: "technician", climate: null },
  { key: "drawer1", name: "Drawer M1-1", parent: "cabMetals", locationKind: "drawer", kind: "open-shelf", setpointRhPercent: 40, toleranceRhPercent: 8, climate: null },
  { key: "drawer2", name: "Drawer M1-2", parent: "cabMetals", locationKind: "drawer", kind: "open-shelf", setpointRhPercent: 40, toleranceRhPercent: 8, climate: null },
  { key: "box14", name: "Sealed box 14 (silica gel)", parent: "drawer1", locationKind: "sealed-box", kind: "desiccant", desiccantKind: "silica-gel", desiccantMassG: 500, setpointRhPercent: 15, toleranceRhPercent: 5, keeper: "researcher", climate: { meanRh: 14, swingRh: 1.5 } },
  { key: "box15", name: "Sealed box 15 (silica gel)", parent: "drawer2", locationKind: "sealed-box", kind: "desiccant", desiccantKind: "silica-gel", desiccantMassG: 500, setpointRhPercent: 15, toleranceRhPercent: 5, climate: { meanRh: 19, swingRh: 2 } },
  { key: "case3", name: "Display case 3", parent: "store", locationKind: "case", kind: "saturated-salt", saltId: "MgCl2", setpointRhPercent: 33, toleranceRhPercent: 4, climate: { meanRh: 35, swingRh: 2.5 } },
];

export type DemoObject = { label: string; accessionNumber: string; findName: string; chlorideState: "unknown" | "not-detected" | "present" | "active" | "desalinated"; treatmentsApplied: string; storageNotes: string; massG: number;
  /** Where it was, oldest first: location key and days ago it arrived. */
  stays: { at: string; daysAgo: number }[] };

export const demoObjects: DemoObject[] = [
  { label: "TV-A-101", accessionNumber: "TAR.1964.12.1", findName: "Hollin Ford nail hoard", chlorideState: "active", treatmentsApplied: "", storageNotes: "Weeping spots in 2019; keep dry.", massG: 8.4, stays: [{ at: "drawer1", daysAgo: 80 }, { at: "box14", daysAgo: 40 }] },
  { label: "TV-A-102", accessionNumber: "TAR.1964.12.2", findName: "Hollin Ford nail hoard", chlorideState: "present", treatmentsApplied: "", storageNotes: "", massG: 7.9, stays: [{ at: "box14", daysAgo: 80 }] },
  { label: "TV-A-117", accessionNumber: "TAR.1971.3.4", findName: "Greyholm knife", chlorideState: "desalinated", treatmentsApplied: "Alkaline sulfite 1996; microcrystalline wax", storageNotes: "", massG: 41.2, stays: [{ at: "case3", daysAgo: 80 }, { at: "drawer2", daysAgo: 21 }, { at: "box15", daysAgo: 7 }] },
  { label: "TV-A-130", accessionNumber: "TAR.1988.7.1", findName: "Brackley Mire buckle", chlorideState: "unknown", treatmentsApplied: "Tannin 1988", storageNotes: "Not yet surveyed.", massG: 12.6, stays: [{ at: "drawer2", daysAgo: 80 }] },
  { label: "TV-A-131", accessionNumber: "TAR.1988.7.2", findName: "Brackley Mire strap end", chlorideState: "not-detected", treatmentsApplied: "", storageNotes: "", massG: 3.1, stays: [{ at: "case3", daysAgo: 60 }] },
];

/** Logged RH of a demo location at an hour: mean plus a daily swing (invented, deterministic). */
export function demoStoreRh(climate: { meanRh: number; swingRh: number }, hour: number): number {
  return Math.round((climate.meanRh + climate.swingRh * Math.sin((2 * Math.PI * (hour % 24)) / 24)) * 10) / 10;
}
