// Security headers, session cookie flags, CSRF refusal for cross-site writes, and unguessable upload keys.
import { describe, expect, it } from "vitest";
import { photoKey } from "@/storage/keys";
import { APP_URL, signedInClient } from "../support/http";

describe("HTTP security", () => {
  it("sends a Content-Security-Policy with frame-ancestors, a referrer policy and no framing", async () => {
    const res = await fetch(`${APP_URL}/sign-in`);
    const csp = res.headers.get("content-security-policy") ?? "";
    expect(csp).toMatch(/default-src 'self'/);
    expect(csp).toMatch(/frame-ancestors 'none'/);
    expect(csp).toMatch(/object-src 'none'/);
    expect(res.headers.get("referrer-policy")).toBe("strict-origin-when-cross-origin");
    expect(res.headers.get("x-frame-options")).toBe("DENY");
    expect(res.headers.get("x-content-type-options")).toBe("nosniff");
    expect(res.headers.get("x-powered-by")).toBeNull();
  });

  it("marks the session cookie httpOnly and sameSite (secure is added behind TLS by next-auth)", async () => {
    const csrf = await fetch(`${APP_URL}/api/auth/csrf`);
    const cookie = csrf.headers.getSetCookie().map((c) => c.split(";")[0]).join("; ");
    const { csrfToken } = (await csrf.json()) as { csrfToken: string };
    const res = await fetch(`${APP_URL}/api/auth/callback/credentials`, {
      method: "POST",
      redirect: "manual",
      headers: { "content-type": "application/x-www-form-urlencoded", cookie },
      body: new URLSearchParams({ csrfToken, email: "observer@tarrow.example", password: "rustline-demo-1", json: "true" }),
    });
    const session = res.headers.getSetCookie().find((c) => c.includes("session-token"));
    expect(session).toBeTruthy();
    expect(session).toMatch(/HttpOnly/i);
    expect(session).toMatch(/SameSite=Lax/i);
  });

  it("next-auth's own sign-in endpoint does not send a phishing link's callbackUrl off-site", async () => {
    for (const evil of ["//example.org", "/\\example.org", "https://example.org/x"]) {
      const csrf = await fetch(`${APP_URL}/api/auth/csrf`);
      const cookie = csrf.headers.getSetCookie().map((c) => c.split(";")[0]).join("; ");
      const { csrfToken } = (await csrf.json()) as { csrfToken: string };
      const res = await fetch(`${APP_URL}/api/auth/callback/credentials`, {
        method: "POST",
        redirect: "manual",
        headers: { "content-type": "application/x-www-form-urlencoded", cookie },
        body: new URLSearchParams({ csrfToken, email: "observer@tarrow.example", password: "rustline-demo-1", callbackUrl: evil, json: "true" }),
      });
      const { url } = (await res.json()) as { url: string };
      expect({ evil, origin: new URL(url).origin }).toEqual({ evil, origin: new URL(APP_URL).origin });
    }
  });

  it("refuses a state-changing API request from another site's origin", async () => {
    const lead = await signedInClient("lead@tarrow.example", "rustline-demo-1");
    const res = await lead.fetch("/api/treatments", {
      method: "POST",
      headers: { "content-type": "application/json", origin: "https://evil.example" },
      body: JSON.stringify({ name: "Cross-site", kind: "coating" }),
    });
    expect(res.status).toBe(403);
    expect(((await res.json()) as { error: { message: string } }).error.message).toMatch(/Cross-site/);
  });

  it("names uploaded objects with 128 random bits under the lab's prefix", () => {
    const labId = "7c0e8f7e-0000-4000-8000-000000000001";
    const a = photoKey({ labId, photoId: "p1", ext: "jpg" });
    const b = photoKey({ labId, photoId: "p1", ext: "jpg" });
    expect(a).not.toBe(b);
    expect(a).toMatch(new RegExp(`^labs/${labId}/photos/[0-9a-f]{32}/p1\\.jpg$`));
  });
});
