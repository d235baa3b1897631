"use client";
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

export function UploadRow({ item, index, specimens, onSpecimen, onCancel, onRetry, onRemove }: Props) {
  const selectId = `upload-specimen-${index}`;
  const errId = `upload-error-${index}`;
  const editable = ["ready", "error", "cancelled"].includes(item.state) && !item.blocked;
  const busy = ["queued", "presigning", "uploading", "finalizing"].includes(item.state);
  const pct = Math.round(item.progress * 100);
  return (
    <li className="panel p-3 space-y-2" data-upload-state={item.state} data-filename={item.file.name}>
      <div className="flex flex-wrap items-baseline gap-x-3 gap-y-1">
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
