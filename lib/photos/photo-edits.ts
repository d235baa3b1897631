// Words for what deleting or moving a recorded photo does to the work done on it. Pure, so the page
// (before asking) and the server (when refusing) say exactly the same thing.

export type PhotoWork = {
  /** Scores whose scorer said they were made on this photo. */
  scores: number;
  /** Face outlines and spot marks drawn on this photo, by every scorer. */
  marks: number;
  specimenLabel: string;
  dayNumber: number | null;
};

const plural = (n: number, one: string, many: string) => `${n} ${n === 1 ? one : many}`;

export function hasWork(w: Pick<PhotoWork, "scores" | "marks">): boolean {
  return w.scores > 0 || w.marks > 0;
}

/** What deleting the photo does to its scores and marks; null when nothing was done on it. */
export function describeDeletion(w: PhotoWork): string | null {
  if (!hasWork(w)) return null;
  const day = w.dayNumber == null ? "" : ` at day ${w.dayNumber}`;
  const parts: string[] = [];
  if (w.scores > 0) {
    parts.push(`${plural(w.scores, "score was", "scores were")} made on this photo. ${w.scores === 1 ? "It stays" : "They stay"} recorded for ${w.specimenLabel}${day} with ${w.scores === 1 ? "its" : "their"} area, grades and notes, but no longer ${w.scores === 1 ? "points" : "point"} to a photo`);
  }
  if (w.marks > 0) {
    parts.push(`the ${plural(w.marks, "mark", "marks")} drawn on it (face outline${w.marks === 1 ? "" : "s"} and spots) ${w.marks === 1 ? "is" : "are"} deleted with the photo`);
  }
  const text = parts.join("; ");
  return `${text.charAt(0).toUpperCase()}${text.slice(1)}.`;
}

/** Why a photo with work on it cannot move: the scores would then describe another specimen or day. */
export function describeMoveRefusal(w: PhotoWork): string | null {
  if (!hasWork(w)) return null;
  const day = w.dayNumber == null ? "" : ` at day ${w.dayNumber}`;
  const what = [w.scores > 0 ? plural(w.scores, "score", "scores") : null, w.marks > 0 ? plural(w.marks, "mark", "marks") : null].filter(Boolean).join(" and ");
  return `This photo cannot be moved: ${what} made on it belong to ${w.specimenLabel}${day}, and moving it would attach them to the wrong specimen or day. Delete the photo (its scores stay recorded) and upload it again where it belongs.`;
}
