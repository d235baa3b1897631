import "server-only";
import { eq, sql } from "drizzle-orm";
import type { ThrottlePolicy } from "@/lib/auth/throttle";
import { db } from "../client";
import { signInThrottles } from "../schema";

/**
 * Count one attempt for `key` before the password is checked, in one statement, unless the key is waiting:
 * true = go on and check the password; false = refuse without checking. The count and the next wait
 * (lib/auth/throttle: free failures, then doubling waits up to a cap) are written together, so 30 parallel
 * attempts count 30 (or stop at the first wait), never one.
 */
export async function reserveSignInAttempt(key: string, p: ThrottlePolicy): Promise<boolean> {
  const free = sql`${p.free}::int`;
  const first = sql`${p.firstWaitS}::double precision`;
  const max = sql`${p.maxWaitS}::double precision`;
  const next = sql`(CASE WHEN t.last_failure_at < now() - make_interval(secs => ${p.forgetAfterS}::double precision) THEN 1 ELSE t.failures + 1 END)`;
  const waitFor = (n: ReturnType<typeof sql>) =>
    sql`CASE WHEN ${n} > ${free} THEN now() + make_interval(secs => least(${max}, ${first} * power(2, ${n} - ${free} - 1))) END`;
  const result = await db.execute(sql`
    INSERT INTO sign_in_throttles AS t (key, failures, last_failure_at, wait_until)
    VALUES (${key}, 1, now(), ${waitFor(sql`1`)})
    ON CONFLICT (key) DO UPDATE SET failures = ${next}, last_failure_at = now(), wait_until = ${waitFor(next)}
    WHERE t.wait_until IS NULL OR t.wait_until <= now()
    RETURNING failures`);
  return result.rows.length === 1;
}

/** The right password for the account: its count starts again. */
export async function clearSignInFailures(key: string) {
  await db.delete(signInThrottles).where(eq(signInThrottles.key, key));
}

/** A sign-in that succeeded from an address does not count against it (its attempt was counted up front). */
export async function forgiveSignInAttempt(key: string) {
  await db.update(signInThrottles).set({ failures: sql`greatest(${signInThrottles.failures} - 1, 0)` }).where(eq(signInThrottles.key, key));
}
