// The browser's SHA-256 of a file before upload (lib/photos/file-hash.ts), read in slices.
// Reference values: NIST FIPS 180-4 examples ("abc"; the empty message), and node:crypto.
import { createHash, randomBytes } from "node:crypto";
import { describe, expect, it } from "vitest";
import { sha256OfBlob } from "@/lib/photos/file-hash";

describe("sha256OfBlob", () => {
  it("matches the published SHA-256 test vectors", async () => {
    // NIST FIPS 180-4, SHA-256 example "abc"
    expect(await sha256OfBlob(new Blob(["abc"]))).toBe("ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad");
    // SHA-256 of the empty message (NIST CSRC examples)
    expect(await sha256OfBlob(new Blob([]))).toBe("e3b0c44298fc1c149afbf4c8996fb92427ae41e4649b934ca495991b7852b855");
  });

  it("gives the same digest read in slices of any size as node:crypto over the whole file", async () => {
    const bytes = randomBytes(100_003);
    const expected = createHash("sha256").update(bytes).digest("hex");
    for (const slice of [1_000, 4_096, 65_536, 1_000_000]) expect(await sha256OfBlob(new Blob([bytes]), slice)).toBe(expected);
  });
});
