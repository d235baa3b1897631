"use client";
import { useEffect, useState } from "react";
import { formatCaptureTime } from "@/lib/format";
import { formatBytes } from "@/lib/photos/config";
import { TimeCheckNote } from "./time-check-note";
import type { UploadItem } from "./use-upload-queue";

const STATE_TEXT: Record<UploadItem["state"], string> = {
  ready: "Ready", queued: "Waiting", presigning: "Preparing", uploading: "Uploading", finalizing: "Checking the file",
  done: "Recorded", error: "Not uploaded", cancelled: "Cancelled",
};

type Props = {
  item: UploadItem;
  index: number;
  specimens: { id: string; label: string }[];
  onSpecimen: (specimenId: string) => void;
  onCancel: () => void;
  onRetry: () => void;
  onRemove: () => void;
};

// Browsers draw JPEG and PNG (and WebP) themselves; TIFF and HEIC get a placeholder here and a preview
// from the server once uploaded (TIFF) or none (HEIC).
const BROWSER_DRAWS = /^image\/(jpeg|png|webp)$/;

/** A thumbnail of the chosen file before anything is sent: an object URL, revoked when the row goes. */
function LocalPreview({ file }: { file: File }) {
  const [url, setUrl] = useState<string | null>(null);
  const drawable = BROWSER_DRAWS.test(file.type) || /\.(jpe?g|png)$/i.test(file.name);
  useEffect(() => {
    if (!drawable) return;
    const u = URL.createObjectURL(file);
    setUrl(u);
    return () => URL.revokeObjectURL(u);
  }, [file, drawable]);
  if (!drawable) {
    return <div className="w-20 h-16 shrink-0 rounded border border-dashed border-[var(--line)] grid place-items-center text-[10px] text-center muted p-1" role="img" aria-label={`${file.name}: no preview before upload`}>no preview before upload</div>;
  }
  // eslint-disable-next-line @next/next/no-img-element -- a local object URL, not a served image
  return url ? <img src={url} alt={`Preview of ${file.name}`} className="w-20 h-16 shrink-0 rounded object-cover bg-iron-900" data-testid="local-preview" /> : <div className="w-20 h-16 shrink-0" />;
}

export function UploadRow({ item, index, specimens, onSpecimen, onCancel, onRetry, onRemove }: Props) {
  const selectId = `upload-specimen-${index}`;
  const errId = `upload-error-${index}`;
  const editable = ["ready", "error", "cancelled"].includes(item.state) && !item.blocked;
  const busy = ["queued", "presigning", "uploading", "finalizing"].includes(item.state);
  const pct = Math.round(item.progress * 100);
  return (
    <li className="panel p-3 space-y-2" data-upload-state={item.state} data-filename={item.file.name}>
      <div className="flex flex-wrap items-center gap-x-3 gap-y-1">
        <LocalPreview file={item.file} />
        <span className="font-medium break-all">{item.file.name}</span>
        <span className="text-xs muted">{formatBytes(item.file.size)}</span>
        <span className={`ml-auto text-xs rounded-full px-2 py-0.5 border ${item.state === "done" ? "border-verdigris-500 text-verdigris-700 dark:text-verdigris-300" : item.state === "error" ? "border-rust-500 text-rust-700 dark:text-rust-300" : "border-[var(--line)]"}`}>
          {STATE_TEXT[item.state]}
        </span>
      </div>
      <div className="grid gap-2 sm:grid-cols-[minmax(10rem,16rem)_1fr] items-end">
        <div>
          <label htmlFor={selectId} className="block text-xs font-medium">Specimen</label>
          <select id={selectId} className="field py-1" value={item.specimenId} disabled={!editable}
            onChange={(e) => onSpecimen(e.target.value)} aria-describedby={item.error ? errId : undefined}
            aria-invalid={item.error && !item.specimenId ? true : undefined}>
            <option value="">— choose specimen —</option>
            {specimens.map((s) => <option key={s.id} value={s.id}>{s.label}</option>)}
          </select>
          <p className="text-xs muted mt-0.5">{item.matchNote}</p>
        </div>
        <div className="space-y-1">
          <progress className="w-full h-2" max={100} value={pct} aria-label={`Upload progress of ${item.file.name}`} />
          <div className="flex flex-wrap gap-2 items-center">
            <span className="text-xs muted tabular-nums">{pct} %</span>
            {(item.state === "uploading" || item.state === "queued") && (
              <button type="button" className="btn-quiet text-xs py-0.5" onClick={onCancel} aria-label={`Cancel upload of ${item.file.name}`}>Cancel</button>
            )}
            {(item.state === "error" || item.state === "cancelled") && !item.blocked && (
              <button type="button" className="btn-quiet text-xs py-0.5" onClick={onRetry} disabled={!item.specimenId} aria-label={`Retry upload of ${item.file.name}`}>Retry</button>
            )}
            {!busy && item.state !== "done" && (
              <button type="button" className="btn-quiet text-xs py-0.5" onClick={onRemove} aria-label={`Remove ${item.file.name} from the list`}>Remove</button>
            )}
          </div>
        </div>
      </div>
      {item.error && <p id={errId} role="alert" className="text-sm text-rust-700 dark:text-rust-300">{item.error}</p>}
      {item.result && (
        <div className="space-y-1 text-sm" role="status">
          <p>
            {item.result.alreadyFinalized ? "Already recorded" : "Recorded"} for {item.result.specimenLabel}
            {item.result.capturedAtRaw ? ` · taken ${formatCaptureTime(item.result)}` : ""}.
          </p>
          <TimeCheckNote check={item.result.check} />
          {item.result.warnings.filter((w) => w !== item.result?.check.message).map((w) => (
            <p key={w} className="text-xs rounded px-2 py-1 bg-rust-50 text-rust-800 dark:bg-rust-900/40 dark:text-rust-100"><span aria-hidden="true">⚠ </span>{w}</p>
          ))}
        </div>
      )}
    </li>
  );
}
