// The exposure choices as URL parameters again, for links and forms that carry them along.
import { DEFAULT_THRESHOLDS_RH_PERCENT } from "@/lib/climate/exposure";
import type { ExposureQuery } from "./params";

/** Only what differs from the defaults, so a plain comparison URL stays plain. */
export function exposureKeep(q: ExposureQuery): Record<string, string> {
  const out: Record<string, string> = {};
  const above = q.thresholdsRhPercent.join(",");
  if (above !== DEFAULT_THRESHOLDS_RH_PERCENT.join(",")) out.above = above;
  if (q.maxOutOfBandPercent != null) out.outOfBandMax = String(q.maxOutOfBandPercent);
  return out;
}
