import type { PhotoView } from "@/db/queries/photos";
import { ExifDetails } from "./exif-details";
import { TimeCheckNote } from "./time-check-note";

/** A preview (or why there is none) with what was checked about the photo. */
export function PhotoThumb({ photo, alt, size = "thumb" }: { photo: PhotoView; alt: string; size?: "thumb" | "display" }) {
  const src = size === "display" ? photo.displayUrl : photo.thumbUrl;
  if (src) {
    // eslint-disable-next-line @next/next/no-img-element -- signed storage URLs, not optimisable by next/image
    return <img src={src} alt={alt} loading="lazy" className="w-full h-auto rounded bg-iron-900 aspect-[4/3] object-contain" />;
  }
  return (
    <div className="w-full aspect-[4/3] rounded border border-dashed border-[var(--line)] grid place-items-center p-2 text-center text-xs muted" role="img" aria-label={`${alt}: no preview`}>
      {photo.status === "pending" ? "Preview being made…" : photo.processingNote ?? "No preview"}
    </div>
  );
}

export function PhotoCard({ photo, title, alt, children }: { photo: PhotoView; title: string; alt: string; children?: React.ReactNode }) {
  return (
    <figure className="panel p-2 space-y-1" data-photo-id={photo.id} data-status={photo.status}>
      <PhotoThumb photo={photo} alt={alt} />
      <figcaption className="space-y-1">
        <p className="text-sm font-medium">{title}</p>
        <p className="text-xs muted break-all">{photo.filename}</p>
        <TimeCheckNote check={photo.check} ack={photo.checkAck} />
        <ExifDetails photo={photo} />
        {children}
      </figcaption>
    </figure>
  );
}
