// Where to go after signing in: only a path of this app. The value is parsed with URL against the app's
// origin, so "//example.org", "/\example.org" and "https://example.org" (another origin) all give "/".
export function safeCallbackPath(raw: string | null | undefined, appOrigin: string): string {
  if (!raw) return "/";
  const origin = new URL(appOrigin).origin;
  let url: URL;
  try {
    url = new URL(raw, origin);
  } catch {
    return "/";
  }
  if (url.origin !== origin) return "/";
  // "http://app//example.org" keeps the origin but its path "//example.org" would leave it again as a Location.
  const path = url.pathname.replace(/^\/{2,}/, "/");
  return `${path}${url.search}${url.hash}`;
}

/** The app's public origin (APP_URL, else NEXTAUTH_URL). */
export function appOrigin(): string {
  return new URL(process.env.APP_URL ?? process.env.NEXTAUTH_URL ?? "http://localhost:3000").origin;
}
