import http from "node:http";
import type { AddressInfo } from "node:net";
import { expect, test } from "@playwright/test";
import { publicIdOf, sql } from "./db";
import { storageStatePath } from "./personas";

// An attacker's page on another port of the same host is same-*site* with the app, so the
// signed-in technician's SameSite=Lax session cookie rides along on its requests. It tries the
// two writes a "simple" cross-origin request can attempt: a note POSTed as
// `text/plain;charset=application/json` (no preflight needed), and sharing a shop-only entry
// with a PATCH. Both must be refused by the app itself (lib/route.ts: exact origin, exact media
// type), and nothing may be written.

const BASE = process.env.APP_URL ?? "http://localhost:3110";

test.use({ storageState: storageStatePath("technician") });

let attacker: http.Server;
let attackerUrl = "";

test.beforeAll(async () => {
  attacker = http.createServer((_req, res) => {
    res.writeHead(200, { "content-type": "text/html; charset=utf-8" });
    res.end("<!doctype html><title>Free parts coupons</title><h1>Win a free chain</h1>");
  });
  await new Promise<void>((resolve) => attacker.listen(0, "127.0.0.1", resolve));
  // "localhost" like the app, so the browser treats the two as the same site.
  attackerUrl = `http://localhost:${(attacker.address() as AddressInfo).port}/`;
});

test.afterAll(async () => {
  await new Promise<void>((resolve) => attacker.close(() => resolve()));
});

async function entryCount(jobPublicId: string): Promise<number> {
  const [row] = await sql("SELECT COUNT(*) AS n FROM journal_entries e JOIN jobs j ON j.id = e.job_id WHERE j.public_id = ?", [jobPublicId]);
  return Number(row!.n);
}

test("a same-site page can't post a note or share an entry with the technician's cookie", async ({ page, context }) => {
  const job = await publicIdOf(2);
  const [hidden] = await sql(
    "SELECT e.id, e.version FROM journal_entries e JOIN jobs j ON j.id = e.job_id WHERE j.public_id = ? AND e.visibility = 'shop' AND e.deleted_at IS NULL AND e.kind = 'note' ORDER BY e.id LIMIT 1",
    [job],
  );
  expect(hidden, "the demo job 2 has a shop-only note").toBeTruthy();
  // The session is there: the same request from the app's own origin would be let through.
  const own = await context.request.get(`${BASE}/api/jobs/${job}/timeline`);
  expect(own.status()).toBe(200);

  const before = await entryCount(job);
  await page.goto(attackerUrl);
  const outcome = await page.evaluate(
    async ({ base, job, entry }) => {
      const note = { type: "doc", content: [{ type: "paragraph", content: [{ type: "text", text: "Injected from another page" }] }] };
      const results: string[] = [];
      // A simple request: the browser sends it (and the cookie) without asking first; the answer is opaque.
      await fetch(`${base}/api/jobs/${job}/entries`, {
        method: "POST",
        mode: "no-cors",
        credentials: "include",
        headers: { "content-type": "text/plain;charset=application/json" },
        body: JSON.stringify({ kind: "note", note, visibility: "shared" }),
      }).then(
        () => results.push("post sent"),
        () => results.push("post blocked"),
      );
      await fetch(`${base}/api/jobs/${job}/entries/${entry.id}`, {
        method: "PATCH",
        credentials: "include",
        headers: { "content-type": "text/plain;charset=application/json" },
        body: JSON.stringify({ version: entry.version, visibility: "shared" }),
      }).then(
        (r) => results.push(`patch ${r.status}`),
        () => results.push("patch blocked"),
      );
      return results;
    },
    { base: BASE, job, entry: { id: Number(hidden!.id), version: Number(hidden!.version) } },
  );
  expect(outcome[0]).toBe("post sent");

  expect(await entryCount(job)).toBe(before);
  const [after] = await sql("SELECT visibility, version FROM journal_entries WHERE id = ?", [hidden!.id]);
  expect(after).toMatchObject({ visibility: "shop", version: hidden!.version });

  // What the app answers such a request, seen without the browser's opacity: the same headers by hand.
  const masked = await context.request.post(`${BASE}/api/jobs/${job}/entries`, {
    headers: { "content-type": "text/plain;charset=application/json", origin: attackerUrl.replace(/\/$/, ""), "sec-fetch-site": "same-site" },
    data: JSON.stringify({ kind: "note", note: { type: "doc", content: [] }, visibility: "shared" }),
  });
  expect(masked.status()).toBe(403);
  expect((await masked.json()).error.code).toBe("forbidden");
  const sameOriginMasked = await context.request.post(`${BASE}/api/jobs/${job}/entries`, {
    headers: { "content-type": "text/plain;charset=application/json", origin: BASE },
    data: JSON.stringify({ kind: "note", note: { type: "doc", content: [] }, visibility: "shared" }),
  });
  expect(sameOriginMasked.status()).toBe(415);
  expect(await entryCount(job)).toBe(before);
});
