// GET /api/collection/overview — the collection overview as CSV (?share= as on the page): one row per storage location, most in need first.
import { DEFAULT_OUT_OF_RULE_SHARE, listLocationStatuses } from "@/db/queries/location-status";
import { AppError } from "@/lib/auth/errors";
import { labRoute } from "@/lib/auth/route";
import { overviewToCsv } from "@/lib/collection/overview-csv";
import { overviewShare } from "@/lib/validation/collection";

export const GET = labRoute("export.read", async (ctx, req) => {
  const { share, problem } = overviewShare(new URL(req.url).searchParams.get("share") ?? undefined, DEFAULT_OUT_OF_RULE_SHARE);
  if (problem) throw new AppError("invalid", problem, { share: [problem] });
  const rows = await listLocationStatuses({ labId: ctx.labId, userId: ctx.userId, outOfRuleShare: share, trace: false });
  const csv = overviewToCsv(rows.map((r) => ({
    path: r.path, objects: r.objectCount, thresholdRhPercent: r.rule?.thresholdRhPercent ?? null,
    ruleSource: r.rule ? (r.rule.origin === "entered" ? `${r.rule.source} (${r.rule.sourceDate})` : `accepted from trial(s), version ${r.rule.version}`) : "",
    needs: r.needs, inRule7d: r.windows[0]?.fractionInRule ?? null, inRule30d: r.windows[1]?.fractionInRule ?? null, inRule365d: r.windows[2]?.fractionInRule ?? null,
    exceedances365d: r.windows[2]?.exceedanceCount ?? 0, lastReadingAt: r.lastReading?.takenAt ?? null, lastRhPercent: r.lastReading?.rhPercent ?? null,
    desiccantDueAt: r.desiccantDueAt, keeper: r.keeperName,
  })));
  return new Response(csv, {
    headers: {
      "content-type": "text/csv; charset=utf-8",
      "content-disposition": `attachment; filename="collection-overview-${new Date().toISOString().slice(0, 10)}.csv"`,
      "cache-control": "no-store",
    },
  });
});
