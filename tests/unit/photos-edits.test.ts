// The words the photo page and the server use for what deleting or moving a photo does to the work on it.
import { describe, expect, it } from "vitest";
import { describeDeletion, describeMoveRefusal, hasWork } from "@/lib/photos/photo-edits";

describe("what deleting a photo does", () => {
  it("says nothing when no score or mark was made on it", () => {
    expect(hasWork({ scores: 0, marks: 0 })).toBe(false);
    expect(describeDeletion({ scores: 0, marks: 0, specimenLabel: "M-1", dayNumber: 7 })).toBeNull();
    expect(describeMoveRefusal({ scores: 0, marks: 0, specimenLabel: "M-1", dayNumber: 7 })).toBeNull();
  });

  it("names the scores that stay, the marks that go, the specimen and the day, in singular and plural", () => {
    expect(describeDeletion({ scores: 1, marks: 1, specimenLabel: "M-1", dayNumber: 7 })).toBe(
      "1 score was made on this photo. It stays recorded for M-1 at day 7 with its area, grades and notes, but no longer points to a photo; the 1 mark drawn on it (face outline and spots) is deleted with the photo.");
    expect(describeDeletion({ scores: 2, marks: 5, specimenLabel: "M-2", dayNumber: 14 })).toBe(
      "2 scores were made on this photo. They stay recorded for M-2 at day 14 with their area, grades and notes, but no longer point to a photo; the 5 marks drawn on it (face outlines and spots) are deleted with the photo.");
    expect(describeDeletion({ scores: 0, marks: 3, specimenLabel: "M-3", dayNumber: null })).toBe("The 3 marks drawn on it (face outlines and spots) are deleted with the photo.");
  });

  it("refuses a move of a photo with work, naming what would land on the wrong specimen", () => {
    expect(describeMoveRefusal({ scores: 2, marks: 0, specimenLabel: "M-1", dayNumber: 0 })).toMatch(/^This photo cannot be moved: 2 scores made on it belong to M-1 at day 0,/);
  });
});
