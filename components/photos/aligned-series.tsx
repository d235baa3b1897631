// The specimen's photos of one trial lined up with its first photo: each photo drawn through its
// fitted transform into the first photo's frame, with the rust that is new since the previous
// inspection painted over it. The overlay is SVG masks in paint order, the same region
// lib/photos/new-since measures: (current spots ∩ face) minus the previous photo's spots.
import Link from "next/link";
import type { AlignedEntry } from "@/db/queries/photo-align";
import { cssMatrix, determinant, type Affine } from "@/lib/photos/align";
import { polygonArea, type Mark, type Point } from "@/lib/scoring/geometry";
import { Shape } from "@/components/scoring/mark-layers";

const NEW_FILL = "#ff3b30";

export type SeriesItem = {
  entry: AlignedEntry;
  dayLabel: string;
  alt: string;
  src: string | null;
  width: number | null;
  height: number | null;
};

function MarkPaint({ marks, t, spot, erase }: { marks: readonly Mark[]; t: Affine; spot: string; erase: string }) {
  return (
    <g transform={cssMatrix(t)}>
      {marks.map((m, i) => (m.kind === "erase" ? <Shape key={i} shape={m.shape} paint={erase} /> : <Shape key={i} shape={m} paint={spot} />))}
    </g>
  );
}

function NewRust({ id, W, H, current, previous, face }: {
  id: string; W: number; H: number; current: { marks: Mark[]; t: Affine }; previous: { marks: Mark[]; t: Affine } | null; face: Point[] | null;
}) {
  const box = { x: -W, y: -H, width: 3 * W, height: 3 * H };
  return (
    <g aria-hidden="true">
      <defs>
        <mask id={`cur-${id}`} maskUnits="userSpaceOnUse" {...box}>
          <rect {...box} fill="black" />
          <MarkPaint marks={current.marks} t={current.t} spot="white" erase="black" />
          {face && <path d={`M${box.x} ${box.y}H${2 * W}V${2 * H}H${box.x}Z M${face.map((p) => `${p.x} ${p.y}`).join(" L")}Z`} transform={cssMatrix(current.t)} fill="black" fillRule="evenodd" />}
        </mask>
        <mask id={`prev-${id}`} maskUnits="userSpaceOnUse" {...box}>
          <rect {...box} fill="white" />
          {previous && <MarkPaint marks={previous.marks} t={previous.t} spot="black" erase="white" />}
        </mask>
      </defs>
      <g mask={`url(#prev-${id})`}>
        <rect {...box} fill={NEW_FILL} fillOpacity={0.7} mask={`url(#cur-${id})`} />
      </g>
    </g>
  );
}

function newText(item: SeriesItem, previousDay: string | null): string | null {
  const n = item.entry.newSince;
  if (!n) return null;
  const faceRef = item.entry.face && item.entry.state.transform ? polygonArea(item.entry.face) * Math.abs(determinant(item.entry.state.transform)) : 0;
  const share = faceRef > 0 ? ` (${((100 * n.newAreaPx2) / faceRef).toFixed(2)} % of the face)` : "";
  const since = previousDay ? `since ${previousDay}` : "at the first inspection";
  const mm2 = n.newAreaMm2 !== null ? ` = ${n.newAreaMm2.toFixed(2)} mm² at the first photo's scale` : "";
  return `New ${since}: ${Math.round(n.newAreaPx2).toLocaleString("en-GB")} px² in the first photo's frame${mm2}${share}, ±${Math.round(n.errorBoundPx2).toLocaleString("en-GB")} px².`;
}

export function AlignedSeries({ items, reference, alignHref, canAlign }: {
  items: SeriesItem[]; reference: { width: number | null; height: number | null } | null; alignHref: (photoId: string) => string; canAlign: boolean;
}) {
  if (!reference?.width || !reference.height || items.length === 0) {
    return <p className="text-sm muted">No processed photo of this specimen in this trial yet, so there is nothing to line up.</p>;
  }
  const W = reference.width;
  const H = reference.height;
  return (
    <ol className="grid gap-3 grid-cols-[repeat(auto-fill,minmax(16rem,1fr))]" aria-label="Photos lined up with the first photo">
      {items.map((item, k) => {
        const { entry } = item;
        const t = entry.state.transform;
        const prev = k > 0 ? items[k - 1] : null;
        const text = newText(item, prev?.dayLabel ?? null);
        return (
          <li key={entry.photoId} className="space-y-1" data-align-status={entry.state.status}>
            <p className="text-sm font-medium">{item.dayLabel}</p>
            {t && item.src && item.width && item.height ? (
              <svg viewBox={`0 0 ${W} ${H}`} role="img" aria-label={`${item.alt}, lined up with the first photo`} className="w-full h-auto rounded-md bg-black">
                <image href={item.src} width={item.width} height={item.height} preserveAspectRatio="none" transform={cssMatrix(t)} />
                {entry.marks && entry.newSince && (
                  <NewRust id={entry.photoId} W={W} H={H} current={{ marks: entry.marks, t }} face={entry.face}
                    previous={prev?.entry.marks && prev.entry.state.transform ? { marks: prev.entry.marks, t: prev.entry.state.transform } : null} />
                )}
              </svg>
            ) : (
              <p className="text-sm muted">{entry.state.status === "not-aligned" || entry.state.status === "stale" ? entry.state.reason : "No preview yet."}</p>
            )}
            {text && <p className="text-xs">{text}</p>}
            {canAlign && <Link className="link text-xs" href={alignHref(entry.photoId)}>{entry.state.status === "reference" ? "Control points of the first photo" : "Place control points"}</Link>}
          </li>
        );
      })}
    </ol>
  );
}
