// Where sign-in may send the user afterwards: paths of this app only, as a phishing link would try otherwise.
import { describe, expect, it } from "vitest";
import { safeCallbackPath } from "@/lib/auth/callback-url";
import { ACCOUNT_THROTTLE, waitAfterFailure } from "@/lib/auth/throttle";

const app = "http://localhost:3000";

describe("safeCallbackPath", () => {
  it.each([
    ["//example.org", "/"],
    ["/\\example.org", "/"],
    ["\\\\example.org", "/"],
    ["https://example.org/sign-in", "/"],
    ["http://localhost:3001/", "/"],
    ["javascript:alert(1)", "/"],
    ["http://localhost:3000//example.org/x", "/example.org/x"],
    ["/%2F%2Fexample.org", "/%2F%2Fexample.org"],
    ["", "/"],
  ])("%s → %s (never another origin)", (raw, expected) => {
    expect(safeCallbackPath(raw, app)).toBe(expected);
    expect(new URL(safeCallbackPath(raw, app), app).origin).toBe(app);
  });

  it("keeps a path of this app with its query and fragment", () => {
    expect(safeCallbackPath("/trials?status=running#top", app)).toBe("/trials?status=running#top");
    expect(safeCallbackPath("http://localhost:3000/due", app)).toBe("/due");
  });
});

describe("waitAfterFailure", () => {
  it("is free for the first failures, then doubles from 15 s up to the cap (common practice, our own numbers)", () => {
    const waits = Array.from({ length: 12 }, (_, i) => waitAfterFailure(i + 1, ACCOUNT_THROTTLE));
    expect(waits).toEqual([0, 0, 0, 0, 0, 15, 30, 60, 120, 240, 300, 300]);
  });
});
