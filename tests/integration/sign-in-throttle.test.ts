// Sign-in throttling, as an attacker would try it over HTTP against next-auth's credentials endpoint (the
// sign-in form's server action runs the same checkCredentials): a burst of parallel guesses at one account,
// guesses spread over many accounts from one address, probing whether an account exists, and trying to keep
// someone else out for good. Each attacker uses its own loopback address (127.0.0.x) as its client address.
import http from "node:http";
import { eq, sql } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeDb, db } from "@/db/client";
import * as s from "@/db/schema";
import { checkCredentials } from "@/lib/auth/credentials";
import { ACCOUNT_THROTTLE, accountKey, ADDRESS_THROTTLE, SIGN_IN_REFUSED } from "@/lib/auth/throttle";
import { createTestLab, TEST_PASSWORD, uniqueEmail, type TestLab } from "../support/db";
import { APP_URL } from "../support/http";

const port = Number(new URL(APP_URL).port);

function send(path: string, from: string, init: { method?: string; headers?: Record<string, string>; body?: string } = {}) {
  return new Promise<{ status: number; cookies: string[]; body: string }>((resolve, reject) => {
    const req = http.request({ host: "127.0.0.1", port, path, method: init.method ?? "GET", headers: init.headers, localAddress: from }, (res) => {
      let body = "";
      res.setEncoding("utf8");
      res.on("data", (c) => (body += c));
      res.on("end", () => resolve({ status: res.statusCode ?? 0, cookies: res.headers["set-cookie"] ?? [], body }));
    });
    req.on("error", reject);
    req.end(init.body);
  });
}

/** next-auth's credentials sign-in from address `from`: signed in, or the error it answered. */
async function attempt(email: string, password: string, from: string): Promise<{ signedIn: boolean; error: string | null }> {
  const csrf = await send("/api/auth/csrf", from);
  const cookie = csrf.cookies.map((c) => c.split(";")[0]).join("; ");
  const { csrfToken } = JSON.parse(csrf.body) as { csrfToken: string };
  const res = await send("/api/auth/callback/credentials", from, {
    method: "POST",
    headers: { "content-type": "application/x-www-form-urlencoded", cookie },
    body: new URLSearchParams({ csrfToken, email, password, json: "true" }).toString(),
  });
  const signedIn = res.cookies.some((c) => c.includes("session-token="));
  const url = (JSON.parse(res.body) as { url?: string }).url ?? "";
  return { signedIn, error: signedIn ? null : new URL(url, APP_URL).searchParams.get("error") };
}

/** Seconds between the key's last failure and the end of its wait (0 when it does not wait). */
async function currentWaitS(key: string): Promise<number> {
  const { rows } = await db.execute<{ waitS: number | null }>(sql`select extract(epoch from wait_until - last_failure_at)::float8 as "waitS" from sign_in_throttles where key = ${key}`);
  return Math.round(rows[0]?.waitS ?? 0);
}

async function throttleRow(key: string) {
  const [row] = await db.select().from(s.signInThrottles).where(eq(s.signInThrottles.key, key));
  return row;
}

let lab: TestLab;
beforeAll(async () => {
  lab = await createTestLab("Throttle");
});
afterAll(() => closeDb());

describe("sign-in throttling over HTTP", () => {
  it("30 parallel wrong passwords at one account: each is counted, only the free ones and one more are checked, and the right password right after waits", async () => {
    const victim = lab.users.technician.email;
    const answers = await Promise.all(Array.from({ length: 30 }, () => attempt(victim, "guess-0000-x", "127.0.0.31")));
    expect(answers.every((a) => !a.signedIn && a.error === SIGN_IN_REFUSED)).toBe(true);
    const row = await throttleRow(accountKey(victim));
    // Counted in one statement, so no failure is lost; past `free` the first wait (15 s) turns the rest away
    // unchecked, so the count stops at free + 1 (free + 2 only if the burst itself took longer than that wait).
    expect(row.failures).toBeGreaterThanOrEqual(ACCOUNT_THROTTLE.free + 1);
    expect(row.failures).toBeLessThanOrEqual(ACCOUNT_THROTTLE.free + 2);
    expect(row.waitUntil).not.toBeNull();
    expect(await attempt(victim, TEST_PASSWORD, "127.0.0.31")).toEqual({ signedIn: false, error: SIGN_IN_REFUSED });
    // The wait is the account's, not only the attacking address's.
    expect(await attempt(victim, TEST_PASSWORD, "127.0.0.32")).toEqual({ signedIn: false, error: SIGN_IN_REFUSED });
  });

  it("an unknown account, a wrong password and a waiting account get the same answer", async () => {
    const unknown = await attempt(uniqueEmail("nobody"), "guess-0000-x", "127.0.0.33");
    const wrong = await attempt(lab.users.observer.email, "guess-0000-x", "127.0.0.33");
    const waiting = await attempt(lab.users.technician.email, TEST_PASSWORD, "127.0.0.33");
    expect(unknown).toEqual(wrong);
    expect(waiting).toEqual(wrong);
    expect(wrong).toEqual({ signedIn: false, error: SIGN_IN_REFUSED });
    // Unknown addresses are counted like known ones.
    expect((await db.select().from(s.signInThrottles).where(sql`${s.signInThrottles.key} like 'account:nobody-%'`)).length).toBeGreaterThan(0);
  });

  it("guesses spread over many accounts from one address make that address wait, not everyone", async () => {
    for (let i = 0; i <= ADDRESS_THROTTLE.free; i++) {
      expect((await attempt(uniqueEmail("spray"), "Summer2026!", "127.0.0.34")).signedIn).toBe(false);
    }
    expect(await attempt(lab.users.researcher.email, TEST_PASSWORD, "127.0.0.34")).toEqual({ signedIn: false, error: SIGN_IN_REFUSED });
    expect((await attempt(lab.users.researcher.email, TEST_PASSWORD, "127.0.0.35")).signedIn).toBe(true);
  });
});

describe("no lasting lock on someone else's account", () => {
  it("after 40 failures the wait is still at most the cap, and the owner gets in once it has passed", async () => {
    const other = await createTestLab("Throttle owner");
    const victim = other.users.lead.email;
    let longestS = 0;
    for (let i = 0; i < 40; i++) {
      await checkCredentials(victim, "guess-0000-x", "198.51.100.7");
      longestS = Math.max(longestS, await currentWaitS(accountKey(victim)));
      // As if the attacker waited out each delay (time moved in the database, not by sleeping).
      await db.update(s.signInThrottles).set({ waitUntil: sql`now() - interval '1 second'` }).where(sql`${s.signInThrottles.key} in (${accountKey(victim)}, 'address:198.51.100.7')`);
    }
    expect(await throttleRow(accountKey(victim))).toMatchObject({ failures: 40 });
    expect(longestS).toBe(ACCOUNT_THROTTLE.maxWaitS); // 5 minutes, never a lock
    expect(await checkCredentials(victim, TEST_PASSWORD, "203.0.113.9")).toMatchObject({ ok: true });
    expect(await throttleRow(accountKey(victim))).toBeUndefined(); // the count starts again
  });

  it("the wait the database sets grows with each failure and stops at the cap", async () => {
    const email = uniqueEmail("growing");
    const waits: number[] = [];
    for (let n = 1; n <= ACCOUNT_THROTTLE.free + 8; n++) {
      await checkCredentials(email, "guess-0000-x");
      waits.push(await currentWaitS(accountKey(email)));
      await db.update(s.signInThrottles).set({ waitUntil: sql`now() - interval '1 second'` }).where(eq(s.signInThrottles.key, accountKey(email)));
    }
    // from lib/auth/throttle: 5 free, then 15 s doubling, capped at 300 s
    expect(waits).toEqual([0, 0, 0, 0, 0, 15, 30, 60, 120, 240, 300, 300, 300]);
  });
});
