import { afterEach, describe, expect, it } from "vitest";
import { clientIp } from "@/lib/server/client-ip";

// X-Forwarded-For: each proxy appends the address it received the request from
// (RFC 7239 §5.2 describes the same chain for the standard Forwarded header).
describe("client address for sign-in limits", () => {
  afterEach(() => {
    delete process.env.TRUSTED_PROXY_HOPS;
  });

  it("takes the entry appended by the nearest proxy, not what the client wrote", () => {
    const headers = new Headers({ "x-forwarded-for": "6.6.6.6, 203.0.113.7" });
    expect(clientIp(headers)).toBe("203.0.113.7");
  });

  it("with two trusted proxies, takes the one the outer proxy appended", () => {
    process.env.TRUSTED_PROXY_HOPS = "2";
    const headers = new Headers({ "x-forwarded-for": "6.6.6.6, 203.0.113.7, 10.0.0.2" });
    expect(clientIp(headers)).toBe("203.0.113.7");
  });

  it("falls back sensibly when the chain is short or missing", () => {
    process.env.TRUSTED_PROXY_HOPS = "3";
    expect(clientIp(new Headers({ "x-forwarded-for": "203.0.113.9" }))).toBe("203.0.113.9");
    expect(clientIp(new Headers())).toBe("unknown");
  });
});
