import net from "node:net";
import { NextRequest } from "next/server";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { DATABASE_UNAVAILABLE_MESSAGE } from "@/lib/errors";
import { connectTestDatabase } from "../support/db";

// Pages and server-action posts while the database is away: the proxy answers a real 503 with
// Retry-After (a page's error boundary can't set the status), and lets requests through again
// within about a second of the database answering. The app's own pool (db/client.ts) reaches
// the test database through a TCP relay this file opens and closes, so the shared server never
// goes down under the other files.

const sleep = (ms: number) => new Promise((r) => setTimeout(r, ms));

function relay(targetPort: number) {
  const sockets = new Set<net.Socket>();
  const server = net.createServer((client) => {
    const upstream = net.connect(targetPort, "127.0.0.1");
    for (const s of [client, upstream]) {
      sockets.add(s);
      s.on("close", () => sockets.delete(s));
      s.on("error", () => s.destroy());
    }
    client.pipe(upstream).pipe(client);
  });
  return {
    listen: (port = 0) => new Promise<number>((resolve) => server.listen(port, "127.0.0.1", () => resolve((server.address() as net.AddressInfo).port))),
    /** Like a crashed server: refuses new connections and drops the open ones. */
    cut: () =>
      new Promise<void>((resolve) => {
        for (const s of sockets) s.destroy();
        server.close(() => resolve());
      }),
  };
}

const page = () => new NextRequest("http://localhost:3110/s/copper-gulch", { headers: { accept: "text/html" } });

describe("the proxy while the database is down", () => {
  let relayPort = 0;
  let dbPort = 0;
  let link: ReturnType<typeof relay>;
  let proxy: (request: NextRequest) => Promise<Response>;
  let report: () => void;

  beforeAll(async () => {
    const url = new URL(connectTestDatabase());
    dbPort = Number(url.port);
    link = relay(dbPort);
    relayPort = await link.listen();
    url.port = String(relayPort);
    process.env.DATABASE_URL = url.toString();
    // Pools of this file's own (the app's and the health check's), through the relay.
    (globalThis as { benchsideDb?: unknown }).benchsideDb = undefined;
    (globalThis as { benchsideHealthDb?: unknown }).benchsideHealthDb = undefined;
    ({ proxy } = await import("@/proxy"));
    ({ reportDatabaseUnavailable: report } = await import("@/lib/server/db-health"));
  });

  afterAll(async () => {
    await link.cut().catch(() => undefined);
    const pools = globalThis as { benchsideDb?: { destroy: () => Promise<void> }; benchsideHealthDb?: { destroy: () => Promise<void> } };
    await pools.benchsideDb?.destroy();
    await pools.benchsideHealthDb?.destroy();
  });

  it("passes pages through while the database answers", async () => {
    const res = await proxy(page());
    expect(res.status).not.toBe(503);
  });

  it("answers 503 with Retry-After once it's gone, and lets requests through within a second of its return", async () => {
    await link.cut();
    report(); // what a request that met the dead database does (lib/route.ts, instrumentation.ts)
    const down = await proxy(page());
    expect(down.status).toBe(503);
    expect(down.headers.get("retry-after")).toBe("5");
    expect(await down.text()).toContain(DATABASE_UNAVAILABLE_MESSAGE);

    const post = await proxy(new NextRequest("http://localhost:3110/shop/copper-gulch", { method: "POST", headers: { accept: "text/x-component" } }));
    expect(post.status).toBe(503);
    expect(await post.json()).toEqual({ error: { code: "unavailable", message: DATABASE_UNAVAILABLE_MESSAGE } });

    link = relay(dbPort);
    await link.listen(relayPort);
    const back = Date.now();
    let status = 503;
    while (status === 503 && Date.now() - back < 5000) {
      status = (await proxy(page())).status;
      if (status === 503) await sleep(25);
    }
    expect(status).not.toBe(503);
    // DESIGN.md §6: recovery within 1 s of the database's return (the proxy re-asks at most every 250 ms while it is down).
    expect(Date.now() - back).toBeLessThan(1000);
  });
});
