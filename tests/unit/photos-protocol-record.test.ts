import { describe, expect, it } from "vitest";
import { effectivePxPerMm, missingProtocolPoints } from "@/lib/photos/protocol-record";
import { photoEvidenceSchema } from "@/lib/validation/photo-evidence";

const PROTOCOL = ["Scale bar in frame", "Colour card in frame", "Lighting as set up"];
const id = "0b6f3c2e-8a4d-4f1e-9c7b-2d5e6f7a8b9c";

describe("missing protocol points", () => {
  it("lists the trial's points a photo was not recorded with, in the protocol's order", () => {
    expect(missingProtocolPoints(PROTOCOL, [PROTOCOL[2], PROTOCOL[0]])).toEqual([PROTOCOL[1]]);
    expect(missingProtocolPoints(PROTOCOL, PROTOCOL)).toEqual([]);
  });
  it("a photo with no record misses every point; an empty protocol misses none", () => {
    expect(missingProtocolPoints(PROTOCOL, null)).toEqual(PROTOCOL);
    expect(missingProtocolPoints([], null)).toEqual([]);
  });
});

describe("which scale holds for a photo", () => {
  it("its own scale, else the series scale, else none", () => {
    expect(effectivePxPerMm(20, 25)).toEqual({ pxPerMm: 20, from: "photo" });
    expect(effectivePxPerMm(null, 25)).toEqual({ pxPerMm: 25, from: "series" });
    expect(effectivePxPerMm(null, null)).toBeNull();
  });
});

describe("the protocol and scale form", () => {
  it("turns two points 10 mm apart into px per mm (5-12-13 triangle: 130 px / 10 mm)", () => {
    const r = photoEvidenceSchema.parse({ photoId: id, "protocol[]": [PROTOCOL[0]], scaleMode: "points", x1: "10", y1: "20", x2: "60", y2: "140", lengthMm: "10" });
    expect(r.scale?.pxPerMm).toBe(13);
    expect(r.protocolConfirmed).toEqual([PROTOCOL[0]]);
  });
  it("accepts a decimal comma in typed px per mm", () => {
    expect(photoEvidenceSchema.parse({ photoId: id, scaleMode: "typed", pxPerMm: "24,5" }).scale?.pxPerMm).toBe(24.5);
  });
  it("refuses a blank px per mm at its field", () => {
    const r = photoEvidenceSchema.safeParse({ photoId: id, scaleMode: "typed", pxPerMm: " " });
    expect(r.success).toBe(false);
    expect(r.error?.issues[0].path).toEqual(["pxPerMm"]);
  });
  it("records no scale when none is given, and leaves the scale alone with keep", () => {
    expect(photoEvidenceSchema.parse({ photoId: id, scaleMode: "none" })).toMatchObject({ scale: null, mode: "none", protocolConfirmed: [] });
    expect(photoEvidenceSchema.parse({ photoId: id, scaleMode: "keep" })).toMatchObject({ scale: null, mode: "keep" });
  });
});
