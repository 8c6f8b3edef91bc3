import http from "node:http";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Knex } from "knex";
import { LIMITS, requestSignInLink } from "@/lib/server/sign-in";
import { clientIp, installForwardedHeaderGuard } from "@/lib/server/client-ip";
import { testKnex } from "../support/db";

// Which address the per-address sign-in limits count. A plain HTTP server gets the same socket
// guard `next start` gets from instrumentation.ts; each request asks for a sign-in link for a
// new (unknown) address, counted against clientIp(headers). Unknown addresses leave no rows
// behind, so the shared test database is fine.
let db: Knex;
const pool = globalThis as { benchsideDb?: Knex };
const tag = Date.now().toString(36);

beforeAll(() => {
  db = testKnex();
});
afterAll(async () => {
  await pool.benchsideDb?.destroy();
  await db?.destroy();
});

describe("the client address behind the per-address limits", () => {
  let server: http.Server;
  let url = "";
  beforeAll(async () => {
    installForwardedHeaderGuard();
    server = http.createServer((req, res) => {
      const headers = new Headers();
      for (const [name, value] of Object.entries(req.headers)) if (value !== undefined) headers.set(name, Array.isArray(value) ? value.join(", ") : value);
      const email = new URL(req.url ?? "/", "http://x").searchParams.get("email") ?? "";
      requestSignInLink({ email, ip: clientIp(headers) }).then(
        () => res.end(JSON.stringify({ answer: "ok", ip: clientIp(headers) })),
        (error: { code?: string }) => res.end(JSON.stringify({ answer: error.code ?? "error", ip: clientIp(headers) })),
      );
    });
    await new Promise<void>((resolve) => server.listen(0, "127.0.0.1", resolve));
    url = `http://127.0.0.1:${(server.address() as { port: number }).port}`;
  });
  afterAll(async () => {
    delete process.env.TRUSTED_PROXY_HOPS;
    await new Promise((resolve) => server?.close(resolve));
  });

  const ask = async (i: number, forwardedFor: string, label: string) =>
    (await (await fetch(`${url}/?email=${encodeURIComponent(`${label}-${i}.${tag}@mail.test`)}`, { headers: { "x-forwarded-for": forwardedFor, "x-benchside-peer": "forged 203.0.113.9" } })).json()) as {
      answer: string;
      ip: string;
    };

  it(`with TRUSTED_PROXY_HOPS unset, a new X-Forwarded-For each time is still one address: the ${LIMITS.linkRequestsPerIp.max + 1}th request is refused`, async () => {
    delete process.env.TRUSTED_PROXY_HOPS;
    const answers = [];
    for (let i = 0; i <= LIMITS.linkRequestsPerIp.max; i++) answers.push(await ask(i, `192.0.2.${i + 1}`, "rotate"));
    expect(new Set(answers.map((a) => a.ip))).toEqual(new Set(["127.0.0.1"]));
    expect(answers.slice(0, -1).every((a) => a.answer === "ok")).toBe(true);
    expect(answers.at(-1)!.answer).toBe("too-many-links");
  });

  it("behind one trusted proxy (TRUSTED_PROXY_HOPS=1), the address the proxy appended is the client's", async () => {
    process.env.TRUSTED_PROXY_HOPS = "1";
    const answers = [];
    for (let i = 0; i <= LIMITS.linkRequestsPerIp.max; i++) answers.push(await ask(i, `10.9.9.9, 192.0.2.${100 + i}`, "proxied"));
    expect(answers.map((a) => a.ip)).toEqual(answers.map((_, i) => `192.0.2.${100 + i}`));
    expect(answers.every((a) => a.answer === "ok")).toBe(true);
  });

  it("a header that only looks like the guard's is not believed", () => {
    delete process.env.TRUSTED_PROXY_HOPS;
    expect(clientIp(new Headers({ "x-benchside-peer": "not-the-secret 203.0.113.7", "x-forwarded-for": "203.0.113.8" }))).toBe("unverified");
  });
});

