// Shared by the benches: percentiles (simple-statistics' quantileSorted) and an autocannon run that keeps
// every response time, since autocannon's own summary has no p95 (only p90 and p97.5).
import autocannon from "autocannon";
import { quantileSorted } from "simple-statistics";

export type Percentiles = { p50: number; p95: number; p99: number; max: number };

/** p50/p95/p99/max of the values (sorted here, in place). */
export function percentiles(values: number[]): Percentiles {
  if (!values.length) return { p50: NaN, p95: NaN, p99: NaN, max: NaN };
  values.sort((a, b) => a - b);
  return { p50: quantileSorted(values, 0.5), p95: quantileSorted(values, 0.95), p99: quantileSorted(values, 0.99), max: values[values.length - 1] };
}

type Instance = Promise<autocannon.Result> & { on(event: "response", fn: (client: unknown, status: number, bytes: number, ms: number) => void): void };

/** One autocannon run; the percentiles come from every response's time. */
export async function loadRun(opts: { url: string; connections: number; duration: number; headers?: Record<string, string> }) {
  const times: number[] = [];
  const instance = autocannon(opts) as unknown as Instance;
  instance.on("response", (_client, _status, _bytes, ms) => times.push(ms));
  const result = await instance;
  return { ...percentiles(times), requests: times.length, rps: Math.round(result.requests.average), errors: result.errors + result.timeouts, non2xx: result.non2xx };
}
