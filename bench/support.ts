// Shared by the benches: percentiles (simple-statistics' quantileSorted) and an autocannon run that keeps
// every response time, since autocannon's own summary has no p95 (only p90 and p97.5).
import { existsSync, readFileSync } from "node:fs";
import os from "node:os";
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

/**
 * CPU time the whole machine spent busy so far, in ms (Linux /proc/stat: user, nice, system, irq,
 * softirq over all cores), or null elsewhere. Differences over a run cover the app, PostgreSQL and
 * the load generator together.
 */
export function machineBusyMs(): number | null {
  if (!existsSync("/proc/stat")) return null;
  const f = readFileSync("/proc/stat", "utf8").split("\n")[0].trim().split(/\s+/).slice(1).map(Number);
  return ((f[0] + f[1] + f[2] + f[5] + f[6]) * 1000) / 100; // USER_HZ is 100 on Linux
}

/**
 * One autocannon run; the percentiles come from every response's time. cpuMsPerRequest: the machine's
 * busy CPU time over the run divided by the responses — what one request costs, whatever the
 * concurrency; with C cores the machine answers at most about C × 1000 / cpuMsPerRequest per second.
 */
export async function loadRun({ nextPath, ...opts }: { url: string; connections: number; duration: number; headers?: Record<string, string>; nextPath?: () => string }) {
  const times: number[] = [];
  const busy0 = machineBusyMs();
  // nextPath: each request asks for the path it gives (on the url's origin) instead of the url's own path.
  const requests = nextPath ? [{ setupRequest: (req: Record<string, unknown>) => ({ ...req, path: nextPath() }) }] : undefined;
  const instance = autocannon({ ...opts, ...(requests ? { requests } : {}) } as autocannon.Options) as unknown as Instance;
  instance.on("response", (_client, _status, _bytes, ms) => times.push(ms));
  const result = await instance;
  const busy1 = machineBusyMs();
  const cpuMsPerRequest = busy0 === null || busy1 === null || !times.length ? null : (busy1 - busy0) / times.length;
  return {
    ...percentiles(times), requests: times.length, rps: Math.round(result.requests.average), errors: result.errors + result.timeouts, non2xx: result.non2xx,
    cpuMsPerRequest, cores: os.availableParallelism?.() ?? os.cpus().length,
  };
}
