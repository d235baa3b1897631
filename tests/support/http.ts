// A signed-in HTTP client for the running app (APP_URL): next-auth's credentials flow with cookies.
export const APP_URL = process.env.APP_URL ?? "http://localhost:3210";

export type Client = {
  fetch: (path: string, init?: RequestInit) => Promise<Response>;
  cookie: string;
};

function collectCookies(res: Response, jar: Map<string, string>) {
  for (const c of res.headers.getSetCookie()) {
    const [pair] = c.split(";");
    const i = pair.indexOf("=");
    jar.set(pair.slice(0, i), pair.slice(i + 1));
  }
}

export async function signedInClient(email: string, password: string, base = APP_URL): Promise<Client> {
  const jar = new Map<string, string>();
  const cookie = () => [...jar].map(([k, v]) => `${k}=${v}`).join("; ");
  const csrfRes = await fetch(`${base}/api/auth/csrf`);
  collectCookies(csrfRes, jar);
  const { csrfToken } = (await csrfRes.json()) as { csrfToken: string };
  const res = await fetch(`${base}/api/auth/callback/credentials`, {
    method: "POST",
    redirect: "manual",
    headers: { "content-type": "application/x-www-form-urlencoded", cookie: cookie() },
    body: new URLSearchParams({ csrfToken, email, password, json: "true" }),
  });
  collectCookies(res, jar);
  if (![...jar.keys()].some((k) => k.includes("session-token"))) throw new Error(`sign-in failed for ${email} (${res.status})`);
  return {
    cookie: cookie(),
    fetch: (path, init = {}) => fetch(`${base}${path}`, { redirect: "manual", ...init, headers: { cookie: cookie(), ...(init.headers ?? {}) } }),
  };
}

export const anonymous: Client = { cookie: "", fetch: (path, init = {}) => fetch(`${APP_URL}${path}`, { redirect: "manual", ...init }) };
