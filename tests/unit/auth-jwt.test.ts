// Our session token encode/decode must stay interchangeable with next-auth 4's own functions (the
// reference implementation from the registry): tokens made by either side open with the other.
import { describe, expect, it } from "vitest";
import { decode as nextAuthDecode, encode as nextAuthEncode } from "next-auth/jwt";
import { decode, derivedKey, encode } from "@/lib/auth/jwt";

const secret = "a test secret that is long enough to be realistic";
const token = { userId: "6f1d0c7e-2a52-4d7e-9b3c-1f0e8c2d9a10", labId: "0b6f3e1c-8a2d-4c55-a1b9-73e5d2c4f801", role: "lead", name: "Ada Example" };

describe("session token (next-auth 4 format with a cached key)", () => {
  it("opens tokens made by next-auth's encode", async () => {
    const jwe = await nextAuthEncode({ token, secret, maxAge: 3600 });
    expect(await decode({ token: jwe, secret })).toMatchObject(token);
  });

  it("makes tokens next-auth's decode opens, with iat, exp and jti set", async () => {
    const jwe = await encode({ token, secret, maxAge: 3600 });
    const payload = await nextAuthDecode({ token: jwe, secret });
    expect(payload).toMatchObject(token);
    expect(Number(payload!.exp) - Number(payload!.iat)).toBe(3600);
    expect(payload!.jti).toMatch(/^[0-9a-f-]{36}$/);
  });

  it("derives a different key per salt and refuses a token sealed with another secret", async () => {
    expect(Buffer.from(derivedKey(secret, "x")).equals(Buffer.from(derivedKey(secret)))).toBe(false);
    const jwe = await nextAuthEncode({ token, secret: "some other secret entirely", maxAge: 3600 });
    await expect(decode({ token: jwe, secret })).rejects.toThrow();
  });

  it("refuses an expired token (beyond next-auth's 15 s clock tolerance)", async () => {
    const jwe = await encode({ token, secret, maxAge: -60 });
    await expect(decode({ token: jwe, secret })).rejects.toThrow(/exp/);
  });

  it("treats a missing token as no session", async () => {
    expect(await decode({ token: undefined, secret })).toBeNull();
  });
});
