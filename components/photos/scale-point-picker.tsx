"use client";
// Click the two ends of the scale bar on the photo instead of typing their pixel coordinates: each
// click fills the next pair of fields (End 1, then End 2) in original-photo pixels, whatever size the
// preview is shown at. The fields stay editable, so a click can be corrected by hand.
import { useState } from "react";
import { photoPointAt } from "@/lib/photos/click-point";
import type { Point } from "@/lib/scoring/geometry";

export function ScalePointPicker({ fieldId, src, width, height }: { fieldId: string; src: string; width: number; height: number }) {
  const [points, setPoints] = useState<Point[]>([]);
  const set = (name: string, v: number) => {
    const el = document.getElementById(`${fieldId}-${name}`) as HTMLInputElement | null;
    if (el) el.value = String(v);
  };
  return (
    <div className="space-y-1">
      <p className="text-xs muted" id={`${fieldId}-picker-hint`}>
        Or click the bar&apos;s two ends on the photo ({points.length === 0 ? "end 1 next" : points.length === 1 ? "end 2 next" : "both set; click again to start over"}).
      </p>
      <div className="relative">
        {/* eslint-disable-next-line @next/next/no-img-element -- signed storage URL */}
        <img src={src} alt="The photo: click the ends of the scale bar" aria-describedby={`${fieldId}-picker-hint`} className="w-full h-auto rounded cursor-crosshair"
          onClick={(e) => {
            const p = photoPointAt(e, e.currentTarget.getBoundingClientRect(), { width, height });
            const next = points.length >= 2 ? [p] : [...points, p];
            setPoints(next);
            const n = next.length;
            set(`x${n}`, p.x);
            set(`y${n}`, p.y);
          }} />
        {points.map((p, i) => (
          <span key={i} aria-hidden className="absolute size-2.5 -ml-[5px] -mt-[5px] rounded-full bg-rust-500 ring-2 ring-white"
            style={{ left: `${(p.x / width) * 100}%`, top: `${(p.y / height) * 100}%` }} />
        ))}
      </div>
    </div>
  );
}
