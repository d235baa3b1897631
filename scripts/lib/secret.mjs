// The session secret (NEXTAUTH_SECRET): whoever knows it can make a session cookie for any user.
// Outside demo mode (DEMO_MODE other than "1", e.g. 0) it must come from the environment, be at least 32 characters and not
// the old development value that was published in this repository; starting and serving refuse otherwise.
// In demo mode an installation without one gets a random secret, made once and kept in .data/.
// Only Node built-ins here: npm start runs this before dependencies are installed.
import crypto from "node:crypto";
import fs from "node:fs";
import path from "node:path";

export const MIN_SECRET_LENGTH = 32;
// Published in this repository's history as the default; never accepted again.
export const PUBLISHED_SECRETS = ["rustline-local-development-secret-change-me"];
export const SECRET_FILE = "nextauth-secret";

/** Why `secret` may not sign sessions, or null when it may. */
export function secretProblem(secret) {
  if (secret === undefined || secret === null || secret === "") return "NEXTAUTH_SECRET is not set.";
  if (PUBLISHED_SECRETS.includes(secret)) return "NEXTAUTH_SECRET is the development value published in the repository.";
  if (secret.length < MIN_SECRET_LENGTH) return `NEXTAUTH_SECRET is shorter than ${MIN_SECRET_LENGTH} characters.`;
  return null;
}

export class SecretError extends Error {}

/** This installation's demo secret from `<dataDir>/nextauth-secret`, made on first use. */
export function demoSecret(dataDir) {
  const file = path.join(dataDir, SECRET_FILE);
  try {
    const kept = fs.readFileSync(file, "utf8").trim();
    if (!secretProblem(kept)) return kept;
  } catch (err) {
    if (err.code !== "ENOENT") throw err;
  }
  fs.mkdirSync(dataDir, { recursive: true });
  const fresh = crypto.randomBytes(32).toString("base64url");
  // "wx": two processes starting at once keep the first one's secret.
  try {
    fs.writeFileSync(file, `${fresh}\n`, { mode: 0o600, flag: "wx" });
    return fresh;
  } catch (err) {
    if (err.code !== "EEXIST") throw err;
    fs.writeFileSync(file, `${fresh}\n`, { mode: 0o600 }); // an unusable old file is replaced
    return fs.readFileSync(file, "utf8").trim();
  }
}

/**
 * The secret to run with. Not demo (DEMO_MODE other than "1"): the environment's, or a SecretError naming
 * NEXTAUTH_SECRET.
 * Demo mode: the environment's when set (never the published value), else the installation's own.
 */
export function resolveSecret(env, dataDir) {
  const given = env.NEXTAUTH_SECRET;
  if (env.DEMO_MODE !== "1") {
    const problem = secretProblem(given);
    if (problem) {
      throw new SecretError(`${problem} Outside demo mode (DEMO_MODE=${env.DEMO_MODE ?? ""}) set NEXTAUTH_SECRET to a random value of at least ${MIN_SECRET_LENGTH} characters, for example: openssl rand -base64 32`);
    }
    return given;
  }
  if (given && PUBLISHED_SECRETS.includes(given)) {
    throw new SecretError("NEXTAUTH_SECRET is the development value published in the repository; unset it (demo mode makes its own) or choose a random one.");
  }
  return given || demoSecret(dataDir);
}
