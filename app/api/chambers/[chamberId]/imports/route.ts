// POST /api/chambers/[chamberId]/imports — import one logger CSV into the chamber, all or nothing.
// multipart/form-data: `file` (the CSV) and `options` (JSON: column mapping, zone, unit…). The answer
// streams NDJSON progress lines ({"type":"progress",…}) and ends with one {"type":"result",…} line;
// storing happens in a single transaction, so an error at any point leaves nothing behind. The body is
// cut off past 9.5 MB (413) and only a few imports run at once per app process (503 beyond that).
import { getChamber } from "@/db/queries/chambers";
import { importReadingsFromCsv, type ImportProgress } from "@/db/queries/readings";
import { IMPORT_BUSY_MESSAGE, largeImports, readBodyForm } from "@/lib/auth/body";
import type { LabContext } from "@/lib/auth/context";
import { AppError, toAppError } from "@/lib/auth/errors";
import { labRoute } from "@/lib/auth/route";
import { csvImportOptionsSchema } from "@/lib/validation/chambers";
import { z } from "zod";

// One logger file per import, at most 9.5 MB (a 100,000-row logger file is typically 3–6 MB); a larger
// file is refused with a message before anything is stored.
const MAX_IMPORT_FILE_BYTES = 9.5 * 1024 * 1024;
// The whole multipart body: the file plus the options field and the part headers.
const MAX_IMPORT_BODY_BYTES = MAX_IMPORT_FILE_BYTES + 64 * 1024;

export const POST = labRoute<{ chamberId: string }>("readings.write", async (ctx, req, { chamberId }) => {
  await getChamber({ labId: ctx.labId, chamberId });
  // The slot is held from reading the body until the import has finished storing.
  const release = largeImports.take(IMPORT_BUSY_MESSAGE);
  try {
    return await startImport(ctx, req, chamberId, release);
  } catch (err) {
    release();
    throw err;
  }
});

async function startImport(ctx: LabContext, req: Request, chamberId: string, release: () => void): Promise<Response> {
  const form = await readBodyForm(req, MAX_IMPORT_BODY_BYTES, "The file is larger than 9.5 MB; split it and import the parts.")
    .catch((err: unknown) => {
      if (err instanceof AppError && err.code === "invalid") throw new AppError("invalid", "Send the file as multipart/form-data with a 'file' and an 'options' field.");
      throw err;
    });
  const file = form.get("file");
  if (!(file instanceof File)) throw new AppError("invalid", "Choose a CSV file to import.");
  if (file.size > MAX_IMPORT_FILE_BYTES) throw new AppError("too-large", "The file is larger than 9.5 MB; split it and import the parts.");
  let rawOptions: unknown;
  try {
    rawOptions = JSON.parse(String(form.get("options") ?? "{}"));
  } catch {
    throw new AppError("invalid", "The import options are not valid JSON.");
  }
  const parsed = csvImportOptionsSchema.safeParse(rawOptions);
  if (!parsed.success) throw new AppError("invalid", "Check the import settings.", z.flattenError(parsed.error).fieldErrors as Record<string, string[]>);
  const text = await file.text();
  const filename = (file.name || "upload.csv").slice(0, 200);

  const encoder = new TextEncoder();
  const stream = new ReadableStream<Uint8Array>({
    async start(controller) {
      const send = (obj: unknown) => controller.enqueue(encoder.encode(`${JSON.stringify(obj)}\n`));
      try {
        const outcome = await importReadingsFromCsv({
          labId: ctx.labId, userId: ctx.userId, chamberId, filename, text, options: parsed.data,
          onProgress: (p: ImportProgress) => send({ type: "progress", ...p }),
        });
        send({ type: "result", ...outcome });
      } catch (err) {
        const e = toAppError(err);
        send({ type: "result", ok: false, errors: [{ line: 0, message: e.message }], totalErrors: 1 });
      } finally {
        release();
      }
      controller.close();
    },
  });
  return new Response(stream, { headers: { "Content-Type": "application/x-ndjson; charset=utf-8", "Cache-Control": "no-store, no-transform", "X-Accel-Buffering": "no" } });
}
