// Sign-in throttling policy: failures are counted per account (the typed e-mail address, known or not)
// and per client address. The first `free` failures cost nothing; each one after that makes the next
// attempt wait, twice as long each time, up to `maxWaitS`. Nothing is ever locked for good: a user whose
// account someone else is guessing at waits at most `maxWaitS` between tries. Failures older than
// `forgetAfterS` start the count again. The counting itself is one atomic statement
// (db/queries/sign-in-throttle.ts), made before the password is checked, so parallel guesses cannot
// all slip through on a count read before any of them was written.
export type ThrottlePolicy = { free: number; firstWaitS: number; maxWaitS: number; forgetAfterS: number };

export const ACCOUNT_THROTTLE: ThrottlePolicy = { free: 5, firstWaitS: 15, maxWaitS: 5 * 60, forgetAfterS: 60 * 60 };
// An address may be an office behind one router: more free tries, but a longer cap against guessing at many accounts.
export const ADDRESS_THROTTLE: ThrottlePolicy = { free: 20, firstWaitS: 15, maxWaitS: 60 * 60, forgetAfterS: 60 * 60 };

/** Seconds the next attempt waits after the `failures`-th failure in a row. */
export function waitAfterFailure(failures: number, p: ThrottlePolicy): number {
  if (failures <= p.free) return 0;
  return Math.min(p.maxWaitS, p.firstWaitS * 2 ** (failures - p.free - 1));
}

/** One answer for a wrong password, an unknown account and a throttled attempt, so none can be told apart. */
export const SIGN_IN_REFUSED = "Wrong e-mail or password. After several failed tries sign-in makes you wait a little longer each time; if you are sure of the password, try again in a minute.";

export const accountKey = (email: string) => `account:${email.trim().toLowerCase()}`;
export const addressKey = (address: string) => `address:${address.replace(/^::ffff:/, "")}`;

/** Set by scripts/serve.mjs on every request from the connection's address (any incoming value is replaced). */
export const CLIENT_ADDRESS_HEADER = "x-rustline-client";
