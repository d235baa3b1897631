// GET /api/inspections — the lab's inspections (?trialId&status=open|done|overdue|all&before&page&pageSize).
// "open" = not done in a running trial, earliest first; each item carries its status (due/overdue/…).
// total stops at 1,000 (totalCapped: true beyond that).
import { NextResponse } from "next/server";
import { listInspections } from "@/db/queries/inspections";
import { OVERDUE_GRACE_HOURS } from "@/lib/schedule/status";
import { labRoute } from "@/lib/auth/route";
import { inspectionListSchema } from "@/lib/validation/trials";

export const GET = labRoute("lab.read", async (ctx, req) => {
  const p = inspectionListSchema.parse(Object.fromEntries(new URL(req.url).searchParams));
  const now = new Date();
  const { rows, total, totalCapped, page, pageSize } = await listInspections({ labId: ctx.labId, ...p, now });
  return NextResponse.json({ items: rows, page, pageSize, total, totalCapped, now: now.toISOString(), graceHours: OVERDUE_GRACE_HOURS }, { headers: { "cache-control": "no-store" } });
});
