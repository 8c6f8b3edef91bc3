import { beforeAll, describe, expect, it } from "vitest";
import { mailThumbToken, readMailThumbToken, readUnsubscribeToken, unsubscribeToken } from "@/lib/server/signed-token";

// Our own token format (lib/server/signed-token.ts), no published source: HMAC-SHA256 cut to 128 bits.
beforeAll(() => {
  process.env.AUTH_SECRET = "unit-test-secret";
});

describe("signed e-mail link tokens", () => {
  it("read back the subscriber they were made for, as opaque base64url", () => {
    const token = unsubscribeToken(4711);
    expect(token).toMatch(/^[A-Za-z0-9_-]{35}$/);
    expect(readUnsubscribeToken(token)).toBe(4711);
  });

  it("refuse any changed character, a spare character, another purpose and another secret", () => {
    const token = unsubscribeToken(12);
    for (let i = 0; i < token.length; i++) {
      const changed = token.slice(0, i) + (token[i] === "A" ? "B" : "A") + token.slice(i + 1);
      expect(readUnsubscribeToken(changed)).toBeNull();
    }
    expect(readUnsubscribeToken(`${token}A`)).toBeNull();
    expect(readUnsubscribeToken(mailThumbToken("A".repeat(22), new Date(Date.now() + 60_000)))).toBeNull();
    process.env.AUTH_SECRET = "another-secret";
    const forged = unsubscribeToken(12);
    process.env.AUTH_SECRET = "unit-test-secret";
    expect(readUnsubscribeToken(forged)).toBeNull();
    expect(readUnsubscribeToken("")).toBeNull();
  });

  it("thumbnail tokens name their photo until they expire", () => {
    const photo = "Zx9_k2LmQpR4sT6uV8wXy0";
    const token = mailThumbToken(photo, new Date("2030-01-01T00:00:00Z"));
    expect(readMailThumbToken(token, new Date("2029-12-31T23:59:00Z"))).toBe(photo);
    expect(readMailThumbToken(token, new Date("2030-01-01T00:00:01Z"))).toBeNull();
  });
});
