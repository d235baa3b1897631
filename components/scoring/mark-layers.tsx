"use client";
// SVG layers over the photo, all in original-image coordinates. Spots are painted through a mask in
// mark order (spot = white, erase = black), so what shows is exactly what rustedAreaPercent measures.
import type { Mark, Point, SpotMark } from "@/lib/scoring/geometry";

const SPOT_FILL = "#ff7a1a";
const FACE_STROKE = "#3fe0c0";
const GHOST_STROKE = "#f7e463";

const pts = (points: readonly Point[]) => points.map((p) => `${p.x},${p.y}`).join(" ");

export function Shape({ shape, paint }: { shape: SpotMark; paint: string }) {
  switch (shape.kind) {
    case "circle":
      return <circle cx={shape.cx} cy={shape.cy} r={shape.r} fill={paint} />;
    case "outline":
    case "polygon":
      return <polygon points={pts(shape.points)} fill={paint} fillRule="evenodd" />;
    case "brush":
      return shape.points.length === 1 ? (
        <circle cx={shape.points[0].x} cy={shape.points[0].y} r={shape.radius} fill={paint} />
      ) : (
        <polyline points={pts(shape.points)} fill="none" stroke={paint} strokeWidth={shape.radius * 2} strokeLinecap="round" strokeLinejoin="round" />
      );
  }
}

export function SpotLayer({ id, marks, W, H, opacity = 0.55 }: { id: string; marks: readonly Mark[]; W: number; H: number; opacity?: number }) {
  if (marks.length === 0) return null;
  return (
    <g aria-hidden="true">
      <mask id={id} maskUnits="userSpaceOnUse" x={-W} y={-H} width={3 * W} height={3 * H}>
        <rect x={-W} y={-H} width={3 * W} height={3 * H} fill="black" />
        {marks.map((m, i) => (m.kind === "erase" ? <Shape key={i} shape={m.shape} paint="black" /> : <Shape key={i} shape={m} paint="white" />))}
      </mask>
      <rect x={-W} y={-H} width={3 * W} height={3 * H} fill={SPOT_FILL} fillOpacity={opacity} mask={`url(#${id})`} />
    </g>
  );
}

/** The face outline, with everything outside it dimmed so the measured region is obvious. */
export function FaceLayer({ face, W, H }: { face: readonly Point[] | null; W: number; H: number }) {
  if (!face || face.length < 3) return null;
  const path = `M${-W} ${-H}H${2 * W}V${2 * H}H${-W}Z M${face.map((p) => `${p.x} ${p.y}`).join(" L")}Z`;
  return (
    <g aria-hidden="true">
      <path d={path} fill="black" fillOpacity={0.35} fillRule="evenodd" />
      <polygon points={pts(face)} fill="none" stroke={FACE_STROKE} strokeWidth={2} vectorEffect="non-scaling-stroke" strokeDasharray="8 4" />
    </g>
  );
}

/** The previous inspection's marks as dashed outlines only, scaled if that photo had another size. */
export function GhostLayer({ face, marks, sx, sy }: { face: readonly Point[] | null; marks: readonly Mark[]; sx: number; sy: number }) {
  const outline = { fill: "none", stroke: GHOST_STROKE, strokeWidth: 1.5, vectorEffect: "non-scaling-stroke" as const, strokeDasharray: "4 3" };
  return (
    <g aria-hidden="true" transform={`scale(${sx} ${sy})`} opacity={0.9}>
      {face && <polygon points={pts(face)} {...outline} />}
      {marks.map((m, i) => {
        if (m.kind === "erase") return null;
        if (m.kind === "circle") return <circle key={i} cx={m.cx} cy={m.cy} r={m.r} {...outline} />;
        if (m.kind === "brush") {
          return m.points.length === 1
            ? <circle key={i} cx={m.points[0].x} cy={m.points[0].y} r={m.radius} {...outline} />
            : <polyline key={i} points={pts(m.points)} {...outline} strokeWidth={1.5} />;
        }
        return <polygon key={i} points={pts(m.points)} {...outline} />;
      })}
    </g>
  );
}

export type Draft =
  | { kind: "points"; target: "face" | "polygon"; points: Point[] }
  | { kind: "circle"; c: Point; r: number }
  | { kind: "stroke"; erase: boolean; points: Point[]; radius: number };

/** The shape being drawn; `unit` is one screen pixel in image units, for handle sizes. */
export function DraftLayer({ draft, unit, hover }: { draft: Draft | null; unit: number; hover: Point | null }) {
  if (!draft) return null;
  const line = { fill: "none", strokeWidth: 2, vectorEffect: "non-scaling-stroke" as const };
  if (draft.kind === "points") {
    const colour = draft.target === "face" ? FACE_STROKE : SPOT_FILL;
    const all = hover ? [...draft.points, hover] : draft.points;
    return (
      <g aria-hidden="true">
        <polyline points={pts(all)} stroke={colour} {...line} />
        {draft.points.map((p, i) => (
          <circle key={i} cx={p.x} cy={p.y} r={(i === 0 ? 6 : 3.5) * unit} fill={i === 0 ? colour : "white"} stroke={colour} strokeWidth={1} vectorEffect="non-scaling-stroke" />
        ))}
      </g>
    );
  }
  if (draft.kind === "circle") {
    return <circle cx={draft.c.x} cy={draft.c.y} r={Math.max(draft.r, unit)} stroke={SPOT_FILL} {...line} fill={SPOT_FILL} fillOpacity={0.4} />;
  }
  return (
    <polyline points={pts(draft.points)} fill="none" stroke={draft.erase ? "#ffffff" : SPOT_FILL} strokeOpacity={0.5}
      strokeWidth={draft.radius * 2} strokeLinecap="round" strokeLinejoin="round" />
  );
}
