// POST /api/specimens/import — CSV body (text/csv), all or nothing: 201 {created} or 422 with
// every problem by line number and nothing written.
import { NextResponse } from "next/server";
import { importSpecimens } from "@/db/queries/specimens";
import { AppError } from "@/lib/auth/errors";
import { labRoute } from "@/lib/auth/route";
import { MAX_IMPORT_BYTES } from "@/lib/validation/specimens";

export const POST = labRoute("specimens.write", async (ctx, req) => {
  const csv = await req.text();
  if (csv.length > MAX_IMPORT_BYTES) throw new AppError("too-large", "The file is larger than 1.5 MB; split it.");
  const r = await importSpecimens({ actor: ctx, csv });
  if (!r.ok) return NextResponse.json({ error: { code: "invalid", message: "Nothing was imported.", rows: r.errors } }, { status: 422 });
  return NextResponse.json({ created: r.created }, { status: 201 });
});
