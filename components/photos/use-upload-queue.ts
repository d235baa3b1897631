"use client";
// The browser side of uploads: presign through our API, PUT straight to storage with
// XMLHttpRequest (for progress and cancel), then finalize. Three files at a time.
import { useCallback, useEffect, useRef, useState } from "react";
import type { CaptureCheck } from "@/lib/photos/capture-check";
import { contentTypeFor, formatBytes, type PhotoContentType } from "@/lib/photos/config";
import { sha256OfBlob } from "@/lib/photos/file-hash";
import { matchSpecimenLabel, type LabelCandidate } from "@/lib/photos/label-match";

export const PARALLEL_UPLOADS = 3;

export type ItemState = "ready" | "queued" | "presigning" | "uploading" | "finalizing" | "done" | "error" | "cancelled";
export type UploadItem = {
  id: string;
  file: File;
  contentType: PhotoContentType | null;
  specimenId: string;
  matchNote: string;
  state: ItemState;
  /** 0..1 of the bytes sent to storage. */
  progress: number;
  error?: string;
  /** The file can never be uploaded (wrong type, too large): only removal helps. */
  blocked?: boolean;
  result?: { photoId: string; specimenLabel: string; capturedAtRaw: string | null; capturedOffset: string | null; capturedAt: string | null; check: CaptureCheck; warnings: string[]; alreadyFinalized: boolean };
};

type Runtime = { xhr?: XMLHttpRequest; token?: string; uploaded?: boolean; sha256?: string };
const ACTIVE: ItemState[] = ["presigning", "uploading", "finalizing"];

async function postJson(url: string, body: unknown): Promise<{ ok: boolean; status: number; data: Record<string, unknown> }> {
  try {
    const res = await fetch(url, { method: "POST", headers: { "Content-Type": "application/json" }, body: JSON.stringify(body) });
    const data = (await res.json().catch(() => ({}))) as Record<string, unknown>;
    return { ok: res.ok, status: res.status, data };
  } catch {
    return { ok: false, status: 0, data: { error: { message: "The server could not be reached. Check the connection and retry." } } };
  }
}

function errorText(data: Record<string, unknown>): string {
  const e = data.error as { message?: string; fields?: Record<string, string[]> } | undefined;
  const fields = e?.fields ? Object.values(e.fields).flat().join(" ") : "";
  return [e?.message, fields].filter(Boolean).join(" ") || "Something went wrong.";
}

/** PUT the file to the presigned URL, reporting progress; resolves with the HTTP status (0 on network error). */
function putFile(item: UploadItem, url: string, headers: Record<string, string>, rt: Runtime, onProgress: (p: number) => void) {
  return new Promise<{ status: number; aborted: boolean; body: string }>((resolve) => {
    const xhr = new XMLHttpRequest();
    rt.xhr = xhr;
    xhr.open("PUT", url);
    for (const [k, v] of Object.entries(headers)) xhr.setRequestHeader(k, v);
    xhr.upload.onprogress = (e) => { if (e.lengthComputable) onProgress(e.loaded / e.total); };
    xhr.onload = () => resolve({ status: xhr.status, aborted: false, body: xhr.responseText });
    xhr.onerror = () => resolve({ status: 0, aborted: false, body: "" });
    xhr.onabort = () => resolve({ status: 0, aborted: true, body: "" });
    xhr.send(item.file);
  });
}

export function useUploadQueue({ inspectionId, specimens, maxBytes, onFinished, protocolTicks }: {
  inspectionId: string; specimens: LabelCandidate[]; maxBytes: number; onFinished: () => void;
  /** The protocol points ticked now, recorded with each photo as it is finalised; absent: none recorded. */
  protocolTicks?: () => string[];
}) {
  const ticksRef = useRef(protocolTicks);
  ticksRef.current = protocolTicks;
  const [items, setItems] = useState<UploadItem[]>([]);
  const runtime = useRef(new Map<string, Runtime>());
  const itemsRef = useRef(items);
  itemsRef.current = items;

  const patch = useCallback((id: string, p: Partial<UploadItem>) => setItems((all) => all.map((it) => (it.id === id ? { ...it, ...p } : it))), []);

  const addFiles = useCallback((files: FileList | File[]) => {
    const added: UploadItem[] = Array.from(files).map((file) => {
      const contentType = contentTypeFor(file.name, file.type);
      const m = matchSpecimenLabel(file.name, specimens);
      const base = { id: crypto.randomUUID(), file, contentType, progress: 0, state: "ready" as ItemState };
      const matchNote = m.kind === "match" ? `Matched ${m.label} from the file name` : m.kind === "ambiguous" ? `File name fits ${m.labels.join(" and ")}; choose one` : "No specimen label in the file name; choose one";
      const specimenId = m.kind === "match" ? m.id : "";
      if (!contentType) return { ...base, specimenId, matchNote, state: "error", blocked: true, error: "Not a JPEG, PNG, TIFF or HEIC file." };
      if (file.size === 0) return { ...base, specimenId, matchNote, state: "error", blocked: true, error: "The file is empty." };
      if (file.size > maxBytes) return { ...base, specimenId, matchNote, state: "error", blocked: true, error: `${formatBytes(file.size)} is over the ${formatBytes(maxBytes)} limit.` };
      return { ...base, specimenId, matchNote };
    });
    setItems((all) => [...all, ...added]);
  }, [specimens, maxBytes]);

  const run = useCallback(async (id: string) => {
    const item = itemsRef.current.find((i) => i.id === id);
    if (!item || !item.contentType) return;
    const rt = runtime.current.get(id) ?? {};
    runtime.current.set(id, rt);
    if (!rt.uploaded || !rt.token) {
      patch(id, { state: "presigning", progress: 0, error: undefined });
      // The upload URL is signed for these exact bytes (x-amz-checksum-sha256).
      try {
        rt.sha256 ??= await sha256OfBlob(item.file);
      } catch {
        return patch(id, { state: "error", error: "The file could not be read. Choose it again." });
      }
      const pre = await postJson("/api/photos/presign", { inspectionId, specimenId: item.specimenId, filename: item.file.name, contentType: item.contentType, sizeBytes: item.file.size, sha256: rt.sha256 });
      if (!pre.ok) return patch(id, { state: "error", error: errorText(pre.data), blocked: pre.status === 413 || pre.status === 423 });
      const { upload, token } = pre.data as { upload: { url: string; headers: Record<string, string> }; token: string };
      rt.token = token;
      patch(id, { state: "uploading" });
      const put = await putFile(item, upload.url, upload.headers, rt, (p) => patch(id, { progress: p }));
      rt.xhr = undefined;
      if (put.aborted) return patch(id, { state: "cancelled", progress: 0 });
      if (put.status < 200 || put.status >= 300) {
        const code = put.body.match(/<Code>([^<]+)<\/Code>/)?.[1];
        return patch(id, { state: "error", progress: 0, error: put.status === 0 ? "The upload to storage failed (network). Retry." : `Storage refused the upload (${put.status}${code ? ` ${code}` : ""}). Retry.` });
      }
      rt.uploaded = true;
      patch(id, { progress: 1 });
    }
    patch(id, { state: "finalizing" });
    const fin = await postJson("/api/photos/finalize", { token: rt.token, protocol: ticksRef.current?.() });
    if (!fin.ok) {
      // Only a server or network hiccup is worth re-finalising; anything else needs a fresh upload.
      if (fin.status !== 0 && fin.status < 500) runtime.current.set(id, {});
      return patch(id, { state: "error", error: errorText(fin.data) });
    }
    const r = fin.data as { photo: { id: string; specimenLabel: string; capturedAtRaw: string | null; capturedOffset: string | null; capturedAt: string | null }; check: CaptureCheck; warnings: string[]; alreadyFinalized: boolean };
    patch(id, { state: "done", result: { photoId: r.photo.id, specimenLabel: r.photo.specimenLabel, capturedAtRaw: r.photo.capturedAtRaw, capturedOffset: r.photo.capturedOffset, capturedAt: r.photo.capturedAt, check: r.check, warnings: r.warnings, alreadyFinalized: r.alreadyFinalized } });
    onFinished();
  }, [inspectionId, patch, onFinished]);

  // The scheduler: whenever the list changes, start queued files while fewer than three are busy.
  useEffect(() => {
    const busy = items.filter((i) => ACTIVE.includes(i.state)).length;
    const next = items.filter((i) => i.state === "queued").slice(0, Math.max(0, PARALLEL_UPLOADS - busy));
    for (const it of next) {
      patch(it.id, { state: "presigning" });
      void run(it.id);
    }
  }, [items, patch, run]);

  const startAll = useCallback(() => setItems((all) => all.map((it) => {
    if (it.state !== "ready") return it;
    if (!it.specimenId) return { ...it, error: "Choose the specimen this photo shows." };
    return { ...it, state: "queued", error: undefined };
  })), []);

  const cancel = useCallback((id: string) => {
    const it = itemsRef.current.find((i) => i.id === id);
    if (!it) return;
    if (it.state === "uploading") runtime.current.get(id)?.xhr?.abort();
    else if (it.state === "queued") patch(id, { state: "cancelled" });
  }, [patch]);

  const retry = useCallback((id: string) => {
    const it = itemsRef.current.find((i) => i.id === id);
    if (!it || it.blocked || !it.specimenId) return;
    patch(id, { state: "queued", error: undefined, progress: runtime.current.get(id)?.uploaded ? 1 : 0 });
  }, [patch]);

  const remove = useCallback((id: string) => {
    runtime.current.delete(id);
    setItems((all) => all.filter((i) => i.id !== id || ACTIVE.includes(i.state)));
  }, []);

  const setSpecimen = useCallback((id: string, specimenId: string) => {
    // A receipt is bound to its specimen; a new choice needs a new upload.
    runtime.current.set(id, {});
    patch(id, { specimenId, matchNote: "Chosen by hand", error: undefined });
  }, [patch]);

  const clearDone = useCallback(() => setItems((all) => all.filter((i) => i.state !== "done")), []);

  return { items, addFiles, startAll, cancel, retry, remove, setSpecimen, clearDone };
}
