// The collection tree's pure rules: cycles refused, a forest built in name order, microclimates read
// from the chamber kind. Expected values are worked by hand on the small trees written out here.
import { describe, expect, it } from "vitest";
import { buildTree, flattenTree, microclimateOf, wouldCycle } from "@/lib/collection/locations";

// Store → Cabinet A → Drawer 1 → Box 14; Store → Cabinet B (drawn by hand).
const parentOf = new Map<string, string | null>([["store", null], ["cabA", "store"], ["d1", "cabA"], ["box14", "d1"], ["cabB", "store"]]);

describe("wouldCycle", () => {
  it("refuses a location inside itself, its child or any deeper descendant", () => {
    expect(wouldCycle("cabA", "cabA", parentOf)).toBe(true);
    expect(wouldCycle("cabA", "d1", parentOf)).toBe(true);
    expect(wouldCycle("store", "box14", parentOf)).toBe(true);
  });
  it("allows a move to a sibling branch or the top level", () => {
    expect(wouldCycle("d1", "cabB", parentOf)).toBe(false);
    expect(wouldCycle("box14", null, parentOf)).toBe(false);
    expect(wouldCycle("cabB", "box14", parentOf)).toBe(false);
  });
  it("answers true instead of spinning when the data already holds a loop", () => {
    const looped = new Map<string, string | null>([["a", "b"], ["b", "a"], ["c", null]]);
    expect(wouldCycle("c", "a", looped)).toBe(true);
  });
});

describe("buildTree", () => {
  const rows = [
    { id: "box14", parentId: "d1", name: "Box 14" }, { id: "cabB", parentId: "store", name: "Cabinet B" },
    { id: "d1", parentId: "cabA", name: "Drawer 1" }, { id: "cabA", parentId: "store", name: "Cabinet A" },
    { id: "store", parentId: null, name: "Store" }, { id: "lost", parentId: "archived-room", name: "Shelf 2" },
    { id: "d10", parentId: "cabA", name: "Drawer 10" }, { id: "d2", parentId: "cabA", name: "Drawer 2" },
  ];
  it("nests children under parents, names in natural order, orphans as roots, paths from the root", () => {
    const flat = flattenTree(buildTree(rows)).map((n) => `${"-".repeat(n.depth)}${n.name}|${n.path.join("/")}`);
    expect(flat).toEqual([
      "Shelf 2|Shelf 2",
      "Store|Store",
      "-Cabinet A|Store/Cabinet A",
      "--Drawer 1|Store/Cabinet A/Drawer 1",
      "---Box 14|Store/Cabinet A/Drawer 1/Box 14",
      "--Drawer 2|Store/Cabinet A/Drawer 2",
      "--Drawer 10|Store/Cabinet A/Drawer 10",
      "-Cabinet B|Store/Cabinet B",
    ]);
  });
});

describe("microclimateOf", () => {
  it("reads the issue's five microclimates from how the chamber holds its humidity, none for water or other", () => {
    expect([microclimateOf("desiccant"), microclimateOf("saturated-salt"), microclimateOf("open-shelf"), microclimateOf("inert-gas"), microclimateOf("vacuum")])
      .toEqual(["desiccant", "salt-buffered", "open", "inert-gas", "vacuum"]);
    expect([microclimateOf("water"), microclimateOf("other")]).toEqual([null, null]);
  });
});
