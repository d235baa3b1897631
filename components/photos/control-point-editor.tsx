"use client";
// Placing two or three control points on a photo: click the photo to add the next point, drag is
// not needed (remove the last point and click again). The first photo's points are shown beside it,
// numbered, so the same features are found in the same order. Coordinates are original-image pixels.
import { useActionState, useState } from "react";
import { saveControlPointsAction } from "@/app/_actions/photo-align";
import { FormMessage, SubmitButton } from "@/components/ui/form";
import { photoPointAt } from "@/lib/photos/click-point";
import type { Point } from "@/lib/scoring/geometry";

type PhotoSide = { id: string; src: string | null; width: number; height: number };

const MARK = "#3fe0c0";

function Markers({ points, W }: { points: readonly Point[]; W: number }) {
  const r = W / 90;
  return (
    <g aria-hidden="true">
      {points.map((p, i) => (
        <g key={i}>
          <circle cx={p.x} cy={p.y} r={r} fill="none" stroke={MARK} strokeWidth={r / 3} />
          <line x1={p.x - r * 1.6} y1={p.y} x2={p.x + r * 1.6} y2={p.y} stroke={MARK} strokeWidth={r / 5} />
          <line x1={p.x} y1={p.y - r * 1.6} x2={p.x} y2={p.y + r * 1.6} stroke={MARK} strokeWidth={r / 5} />
          <text x={p.x + r * 1.4} y={p.y - r * 1.4} fill={MARK} fontSize={r * 2.4} fontWeight={700}>{i + 1}</text>
        </g>
      ))}
    </g>
  );
}

export function PhotoWithPoints({ photo, points, label, onPlace }: { photo: PhotoSide; points: readonly Point[]; label: string; onPlace?: (p: Point) => void }) {
  const click = (e: React.MouseEvent<SVGSVGElement>) => {
    if (!onPlace) return;
    onPlace(photoPointAt(e, e.currentTarget.getBoundingClientRect(), photo, 1));
  };
  return (
    <svg viewBox={`0 0 ${photo.width} ${photo.height}`} role="img" aria-label={label} onClick={click}
      className={`w-full h-auto rounded-md bg-black ${onPlace ? "cursor-crosshair" : ""}`}>
      {photo.src && <image href={photo.src} width={photo.width} height={photo.height} preserveAspectRatio="none" />}
      <Markers points={points} W={photo.width} />
    </svg>
  );
}

export function ControlPointEditor({ trialId, photo, initial, needed, label }: {
  trialId: string; photo: PhotoSide; initial: Point[]; needed: number | null; label: string;
}) {
  const [points, setPoints] = useState<Point[]>(initial);
  const [state, action] = useActionState(saveControlPointsAction, undefined);
  const err = state?.errors?.points;
  const max = needed ?? 3;
  return (
    <form action={action} className="space-y-3" aria-label={`Control points on ${label}`}>
      <input type="hidden" name="trialId" value={trialId} />
      <input type="hidden" name="photoId" value={photo.id} />
      <input type="hidden" name="points" value={JSON.stringify(points)} />
      <PhotoWithPoints photo={photo} points={points} label={`${label}: click to place point ${points.length + 1}`} onPlace={(p) => setPoints((ps) => (ps.length < max ? [...ps, p] : ps))} />
      <ol className="text-sm space-y-1" aria-describedby={err ? "points-err" : undefined}>
        {points.map((p, i) => <li key={i}>Point {i + 1}: {p.x}, {p.y} px</li>)}
      </ol>
      <p className="text-xs muted">
        {needed ? `Place ${needed} points on the same features as on the first photo, in the same order.` : "Place two points (position, scale, rotation) or three (also tilt) on features you can find on every photo: corners, scratches, reference marks."}
      </p>
      {err && <p id="points-err" role="alert" className="text-sm text-rust-600">{err.join(" ")}</p>}
      <div className="flex flex-wrap gap-2">
        <button type="button" className="btn-quiet" onClick={() => setPoints((ps) => ps.slice(0, -1))} disabled={points.length === 0}>Remove last point</button>
        <button type="button" className="btn-quiet" onClick={() => setPoints([])} disabled={points.length === 0}>Clear</button>
        <SubmitButton>Save points</SubmitButton>
      </div>
      <FormMessage state={state} />
    </form>
  );
}
