import type { PhotoView } from "@/db/queries/photos";
import { formatCaptureTime } from "@/lib/format";
import { formatBytes } from "@/lib/photos/config";

const ORIENTATION: Record<number, string> = {
  1: "upright", 2: "mirrored", 3: "upside down", 4: "mirrored, upside down",
  5: "mirrored, turned", 6: "turned 90° clockwise", 7: "mirrored, turned", 8: "turned 90° anticlockwise",
};

/** The photo's recorded EXIF and file facts; location only when the viewer may see it. */
export function ExifDetails({ photo }: { photo: PhotoView }) {
  const rows: [string, string][] = [
    ["Captured", formatCaptureTime(photo)],
    ["Camera", photo.camera ?? "not recorded"],
    ["Lens", photo.lens ?? "not recorded"],
    ["Exposure", photo.exposure ?? "not recorded"],
    ["Orientation", photo.orientation ? `${ORIENTATION[photo.orientation]} (applied to previews)` : "not recorded"],
    ["Size", `${photo.width && photo.height ? `${photo.width} × ${photo.height} px, ` : ""}${formatBytes(photo.sizeBytes)}`],
    ["SHA-256", photo.sha256 ?? "—"],
  ];
  return (
    <details className="text-xs">
      <summary className="cursor-pointer muted">File and camera details</summary>
      <dl className="mt-1 grid grid-cols-[auto_1fr] gap-x-3 gap-y-0.5">
        {rows.map(([k, v]) => (
          <div key={k} className="contents">
            <dt className="muted">{k}</dt>
            <dd className={k === "SHA-256" ? "font-mono break-all" : ""}>{v}</dd>
          </div>
        ))}
        <dt className="muted">Location</dt>
        <dd>
          {photo.gps ? `${photo.gps.lat.toFixed(5)}, ${photo.gps.lon.toFixed(5)} (kept in the original only; removed from previews)`
            : photo.gpsHidden ? "recorded; hidden for your role" : "not recorded"}
        </dd>
      </dl>
      {photo.originalUrl && <a className="link mt-1 inline-block" href={photo.originalUrl}>Download original</a>}
    </details>
  );
}
