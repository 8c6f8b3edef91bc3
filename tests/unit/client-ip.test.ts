import { afterEach, describe, expect, it } from "vitest";
import { clientIp, trustedProxyHops } from "@/lib/server/client-ip";

// X-Forwarded-For: each proxy appends the address it received the request from
// (RFC 7239 §5.2 describes the same chain for the standard Forwarded header). Only entries
// appended by proxies we were told about (TRUSTED_PROXY_HOPS) can be believed. The socket's own
// address (the guard of instrumentation.ts) is covered by tests/integration/sign-in.test.ts.
describe("client address for sign-in limits", () => {
  afterEach(() => {
    delete process.env.TRUSTED_PROXY_HOPS;
  });

  it("with no trusted proxy (the default), ignores X-Forwarded-For entirely", () => {
    const a = clientIp(new Headers({ "x-forwarded-for": "6.6.6.6, 203.0.113.7" }));
    const b = clientIp(new Headers({ "x-forwarded-for": "198.51.100.1" }));
    // No verified socket address in a unit test: one shared bucket, whatever the header says.
    expect([a, b]).toEqual(["unverified", "unverified"]);
  });

  it("behind one trusted proxy, takes the entry it appended, not what the client wrote", () => {
    process.env.TRUSTED_PROXY_HOPS = "1";
    expect(clientIp(new Headers({ "x-forwarded-for": "6.6.6.6, 203.0.113.7" }))).toBe("203.0.113.7");
  });

  it("with two trusted proxies, takes the one the outer proxy appended", () => {
    process.env.TRUSTED_PROXY_HOPS = "2";
    expect(clientIp(new Headers({ "x-forwarded-for": "6.6.6.6, 203.0.113.7, 10.0.0.2" }))).toBe("203.0.113.7");
  });

  it("a chain shorter than the proxies declared (a request that bypassed them) isn't believed", () => {
    process.env.TRUSTED_PROXY_HOPS = "3";
    expect(clientIp(new Headers({ "x-forwarded-for": "203.0.113.9" }))).toBe("unverified");
    expect(clientIp(new Headers())).toBe("unverified");
  });

  it("reads TRUSTED_PROXY_HOPS as a whole number from 0 to 10, anything else as 0", () => {
    for (const [raw, hops] of [["1", 1], ["2", 2], ["0", 0], ["", 0], ["-1", 0], ["1.5", 0], ["eleven", 0], ["11", 0]] as const) {
      process.env.TRUSTED_PROXY_HOPS = raw;
      expect(trustedProxyHops(), raw).toBe(hops);
    }
  });
});
