"use client";
import { useRouter } from "next/navigation";
import { useCallback, useRef, useState } from "react";
import { formatBytes } from "@/lib/photos/config";
import { useProtocolTicks } from "./protocol-ticks";
import { UploadRow } from "./upload-row";
import { PARALLEL_UPLOADS, useUploadQueue } from "./use-upload-queue";

type Props = { inspectionId: string; specimens: { id: string; label: string }[]; maxBytes: number; toleranceH: number };

const ACCEPT = "image/jpeg,image/png,image/tiff,image/heic,image/heif,.jpg,.jpeg,.png,.tif,.tiff,.heic,.heif";

export function PhotoUploader({ inspectionId, specimens, maxBytes, toleranceH }: Props) {
  const router = useRouter();
  const refreshTimer = useRef<ReturnType<typeof setTimeout> | null>(null);
  // Re-read the recorded list once a burst of finished uploads settles.
  const onFinished = useCallback(() => {
    if (refreshTimer.current) clearTimeout(refreshTimer.current);
    refreshTimer.current = setTimeout(() => router.refresh(), 800);
  }, [router]);
  const ticks = useProtocolTicks();
  const q = useUploadQueue({ inspectionId, specimens, maxBytes, onFinished, protocolTicks: ticks && ticks.steps.length > 0 ? ticks.current : undefined });
  const [dragging, setDragging] = useState(false);
  const inputRef = useRef<HTMLInputElement>(null);

  const ready = q.items.filter((i) => i.state === "ready");
  const unassigned = ready.filter((i) => !i.specimenId).length;
  const done = q.items.filter((i) => i.state === "done").length;
  const active = q.items.filter((i) => ["queued", "presigning", "uploading", "finalizing"].includes(i.state)).length;
  const failed = q.items.filter((i) => i.state === "error").length;

  if (specimens.length === 0) {
    return <p className="text-sm rounded-md border border-dashed border-[var(--line)] p-4 muted">No specimens were placed in this trial at this inspection, so there is nothing to photograph. Check the trial&apos;s allocation.</p>;
  }
  return (
    <section className="space-y-3" aria-labelledby="upload-h">
      <h2 id="upload-h" className="font-semibold">Upload photos</h2>
      <div
        className={`rounded-md border-2 border-dashed p-4 space-y-2 ${dragging ? "border-verdigris-500 bg-verdigris-50 dark:bg-verdigris-900/30" : "border-[var(--line)]"}`}
        onDragOver={(e) => { e.preventDefault(); setDragging(true); }}
        onDragLeave={() => setDragging(false)}
        onDrop={(e) => { e.preventDefault(); setDragging(false); if (e.dataTransfer.files.length) q.addFiles(e.dataTransfer.files); }}
      >
        <p className="text-sm">Drop photos here, or</p>
        <label htmlFor="photo-files" className="block text-sm font-medium">Choose photos</label>
        <input id="photo-files" ref={inputRef} type="file" multiple accept={ACCEPT} className="text-sm" aria-describedby="photo-files-hint"
          onChange={(e) => { if (e.target.files?.length) q.addFiles(e.target.files); e.target.value = ""; }} />
        <p id="photo-files-hint" className="text-xs muted">
          JPEG, PNG, TIFF or HEIC, up to {formatBytes(maxBytes)} each. A specimen label in the file name (e.g. &quot;{specimens[0].label}_day14.jpg&quot;) assigns the photo automatically.
          Files go straight to storage, {PARALLEL_UPLOADS} at a time; the capture time is checked against the inspection (±{toleranceH} h). HEIC files are kept but get no preview.
        </p>
      </div>
      {q.items.length > 0 && (
        <>
          <div className="flex flex-wrap gap-2 items-center">
            <button type="button" className="btn" onClick={q.startAll} disabled={ready.length === 0}>
              Upload {ready.length === 0 ? "" : `${ready.length} `}photo{ready.length === 1 ? "" : "s"}
            </button>
            {done > 0 && <button type="button" className="btn-quiet" onClick={q.clearDone}>Clear recorded</button>}
            <p className="text-sm muted" role="status" aria-live="polite">
              {done} recorded · {active} in progress · {failed} not uploaded{unassigned ? ` · ${unassigned} need a specimen` : ""}
            </p>
          </div>
          <ul className="space-y-2" aria-label="Files to upload">
            {q.items.map((it, i) => (
              <UploadRow key={it.id} item={it} index={i} specimens={specimens}
                onSpecimen={(s) => q.setSpecimen(it.id, s)} onCancel={() => q.cancel(it.id)} onRetry={() => q.retry(it.id)} onRemove={() => q.remove(it.id)} />
            ))}
          </ul>
        </>
      )}
    </section>
  );
}
