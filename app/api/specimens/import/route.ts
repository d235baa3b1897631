// POST /api/specimens/import — CSV body (text/csv), all or nothing: 201 {created} or 422 with
// every problem by line number and nothing written. The body is cut off at 1.5 MB (413) and only a
// few imports run at once per app process (503 beyond that).
import { NextResponse } from "next/server";
import { importSpecimens } from "@/db/queries/specimens";
import { IMPORT_BUSY_MESSAGE, largeImports, readBodyText } from "@/lib/auth/body";
import { labRoute } from "@/lib/auth/route";
import { MAX_IMPORT_BYTES } from "@/lib/validation/specimens";

export const POST = labRoute("specimens.write", async (ctx, req) => {
  const r = await largeImports.run(async () => {
    const csv = await readBodyText(req, MAX_IMPORT_BYTES, "The file is larger than 1.5 MB; split it.");
    return importSpecimens({ actor: ctx, csv });
  }, IMPORT_BUSY_MESSAGE);
  if (!r.ok) return NextResponse.json({ error: { code: "invalid", message: "Nothing was imported.", rows: r.errors } }, { status: 422 });
  return NextResponse.json({ created: r.created }, { status: 201 });
});
