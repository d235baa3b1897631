// GET /api/specimens/export — the lab's specimens as CSV (?q&materialClass keep the list's filter).
import { exportSpecimens } from "@/db/queries/specimens";
import { labRoute } from "@/lib/auth/route";
import { specimenListSchema, specimensToCsv } from "@/lib/validation/specimens";

export const GET = labRoute("export.read", async (ctx, req) => {
  const { q, materialClass } = specimenListSchema.parse(Object.fromEntries(new URL(req.url).searchParams));
  const rows = await exportSpecimens({ labId: ctx.labId, userId: ctx.userId, q, materialClass });
  const csv = specimensToCsv(rows.map((r) => ({ ...r, massG: r.massG ?? undefined })));
  return new Response(csv, {
    headers: {
      "content-type": "text/csv; charset=utf-8",
      "content-disposition": `attachment; filename="specimens-${new Date().toISOString().slice(0, 10)}.csv"`,
      "cache-control": "no-store",
    },
  });
});
