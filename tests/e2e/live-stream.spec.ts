import { type ChildProcess, spawn } from "node:child_process";
import crypto from "node:crypto";
import fs from "node:fs";
import net from "node:net";
import path from "node:path";
import { type APIRequestContext, expect, request, test } from "@playwright/test";
import { sql } from "./db";
import { CUSTOMERS, type Persona, storageStatePath } from "./personas";

// The live stream under two app instances (issue 15 §2): a second `next start` of the same build,
// on the same database, beside the one `npm test` runs. An event caused through instance A reaches
// a client connected to instance B within 2 s (B's poller reads shop_events; nothing passes
// between the processes), a client resumes with Last-Event-ID on either instance, and B's board
// follows without a reload. The test's own job at Copper Gulch, for Ruth Calloway, is removed after.

const A = process.env.APP_URL ?? "http://localhost:3110";
const B_PORT = Number(process.env.LIVE_SECOND_APP_PORT ?? 3111);
const B = `http://localhost:${B_PORT}`;
const SHOP = "copper-gulch";
const tag = crypto.randomBytes(4).toString("hex");
const serial = `LIVE-${tag}`;

let second: ChildProcess | null = null;
let secondLog = "";
let jobId = 0;
let machineId = 0;
let job = "";
let staffAtA: APIRequestContext;

type Message = { id: string; event: string; data: string; at: number };

/** The persona's signed-in cookies (auth.setup.ts) as a Cookie header. */
function cookie(persona: Persona): string {
  const state = JSON.parse(fs.readFileSync(storageStatePath(persona), "utf8")) as { cookies: { name: string; value: string }[] };
  return state.cookies.map((c) => `${c.name}=${c.value}`).join("; ");
}

/** A Server-Sent Events client over fetch (EventSource isn't in Node), reading in the background. */
async function openStream(url: string, persona: Persona, headers: Record<string, string> = {}) {
  const abort = new AbortController();
  const res = await fetch(url, { headers: { accept: "text/event-stream", "accept-encoding": "gzip, br", cookie: cookie(persona), ...headers }, signal: abort.signal });
  const messages: Message[] = [];
  let buffer = "";
  const decoder = new TextDecoder();
  const pump = (async () => {
    const reader = res.body!.getReader();
    for (;;) {
      const { value, done } = await reader.read();
      if (done) return;
      buffer += decoder.decode(value, { stream: true });
      let end: number;
      while ((end = buffer.indexOf("\n\n")) >= 0) {
        const block = buffer.slice(0, end);
        buffer = buffer.slice(end + 2);
        const m: Message = { id: "", event: "message", data: "", at: Date.now() };
        for (const line of block.split("\n")) {
          const [field, ...rest] = line.split(":");
          const value = rest.join(":").replace(/^ /, "");
          if (field === "id") m.id = value;
          else if (field === "event") m.event = value;
          else if (field === "data") m.data = value;
        }
        if (m.data) messages.push(m);
      }
    }
  })().catch(() => undefined);
  const waitFor = async (what: string, found: (m: Message) => boolean, ms = 5000) => {
    const until = Date.now() + ms;
    for (;;) {
      const m = messages.find(found);
      if (m) return m;
      if (Date.now() > until) throw new Error(`no ${what} within ${ms} ms; got ${JSON.stringify(messages.map((x) => [x.id, x.event]))}`);
      await new Promise((r) => setTimeout(r, 20));
    }
  };
  const close = async () => {
    abort.abort();
    await pump;
  };
  return { res, messages, waitFor, close };
}

const note = (text: string) => ({ type: "doc", content: [{ type: "paragraph", content: [{ type: "text", text }] }] });

/** Posts a note through instance A, as the technician; answers when it is committed. */
async function postNoteAtA(text: string, visibility: "shop" | "shared"): Promise<{ eventId: number; doneAt: number }> {
  const res = await staffAtA.post(`/api/jobs/${job}/entries`, { data: { kind: "note", note: note(text), visibility } });
  expect(res.status(), await res.text()).toBe(200);
  const doneAt = Date.now();
  const [row] = await sql("SELECT MAX(id) AS id FROM shop_events WHERE job_id = ? AND kind = 'entry_added'", [jobId]);
  return { eventId: Number(row!.id), doneAt };
}

async function portFree(port: number): Promise<boolean> {
  return new Promise((resolve) => {
    const s = net.createServer().once("error", () => resolve(false));
    s.listen(port, () => s.close(() => resolve(true)));
  });
}

test.beforeAll(async () => {
  test.setTimeout(120_000);
  expect(await portFree(B_PORT), `port ${B_PORT} for the second instance (LIVE_SECOND_APP_PORT) is taken`).toBe(true);
  // The same build and environment as the app under test (scripts/test.mjs passes it to Playwright).
  second = spawn(process.execPath, [path.join(process.cwd(), "node_modules", "next", "dist", "bin", "next"), "start", "-p", String(B_PORT)], {
    env: process.env,
    stdio: ["ignore", "pipe", "pipe"],
    detached: true,
  });
  for (const s of [second.stdout!, second.stderr!]) s.on("data", (d: Buffer) => (secondLog = (secondLog + d.toString()).slice(-20_000)));
  const until = Date.now() + 90_000;
  for (;;) {
    const up = await fetch(`${B}/api/health`, { signal: AbortSignal.timeout(3000) }).then((r) => r.ok, () => false);
    if (up) break;
    if (Date.now() > until || second.exitCode !== null) throw new Error(`the second instance did not start:\n${secondLog}`);
    await new Promise((r) => setTimeout(r, 300));
  }

  // The test's own job: a new machine of Ruth Calloway's at Copper Gulch.
  const [customer] = await sql("SELECT c.id, c.shop_id FROM customers c JOIN shops s ON s.id = c.shop_id WHERE s.slug = ? AND c.email = ?", [SHOP, CUSTOMERS.jobCustomer.email]);
  const machine = await sql("INSERT INTO machines (shop_id, customer_id, kind, make, model, serial) VALUES (?, ?, 'atv', 'Tessaro', 'Ridgeline 450', ?)", [customer!.shop_id, customer!.id, serial]);
  machineId = Number((machine as unknown as { insertId: number }).insertId);
  job = crypto.randomBytes(12).toString("base64url");
  const [shop] = await sql("SELECT next_job_number FROM shops WHERE id = ?", [customer!.shop_id]);
  await sql("UPDATE shops SET next_job_number = next_job_number + 1 WHERE id = ?", [customer!.shop_id]);
  const inserted = await sql("INSERT INTO jobs (shop_id, number, public_id, customer_id, machine_id, status, concern) VALUES (?, ?, ?, ?, ?, 'in_progress', ?)", [
    customer!.shop_id,
    shop!.next_job_number,
    job,
    customer!.id,
    machineId,
    `Live stream test ${tag}: idles rough`,
  ]);
  jobId = Number((inserted as unknown as { insertId: number }).insertId);
  // Earlier specs delete jobs of their own, and those jobs' events with them, so the newest ids of
  // the sequence may be gone. A poller starts at the newest event there is and would take those
  // missing ids for a gap and wait it out (MAX_GAP_MS, 3 s, longer than these checks allow), as it
  // does after a rolled-back write. This job's own first event puts a row at the top again.
  await sql("INSERT INTO shop_events (shop_id, job_id, kind, payload) VALUES (?, ?, 'status_moved', '{}')", [customer!.shop_id, jobId]);
  staffAtA = await request.newContext({ baseURL: A, storageState: storageStatePath("technician") });
});

test.afterAll(async () => {
  await staffAtA?.dispose();
  if (jobId) await sql("DELETE FROM jobs WHERE id = ?", [jobId]);
  if (machineId) await sql("DELETE FROM machines WHERE id = ?", [machineId]);
  if (second?.pid && second.exitCode === null) {
    const exited = new Promise((r) => second!.once("exit", r));
    // The process group this test started (detached), by its id.
    process.kill(-second.pid, "SIGTERM");
    await Promise.race([exited, new Promise((r) => setTimeout(r, 5000))]);
    if (second.exitCode === null) process.kill(-second.pid, "SIGKILL");
  }
});

test("an event caused through instance A reaches clients of instance B within 2 s, each only what they may hear", async () => {
  const desk = await openStream(`${B}/api/shops/${SHOP}/events`, "writer");
  const owner = await openStream(`${B}/api/jobs/${job}/events`, "jobCustomer");
  try {
    for (const s of [desk, owner]) {
      expect(s.res.status).toBe(200);
      expect(s.res.headers.get("content-type")).toBe("text/event-stream; charset=utf-8");
      expect(s.res.headers.get("cache-control")).toBe("no-cache, no-transform");
      // Not compressed (compression would hold messages back until a buffer fills).
      expect(s.res.headers.get("content-encoding")).toBeNull();
      await s.waitFor("ready", (m) => m.event === "ready");
    }

    const shopOnly = await postNoteAtA(`Shop-only note ${tag}`, "shop");
    const seen = await desk.waitFor("the shop-only note's event at B", (m) => m.id === String(shopOnly.eventId), 2000);
    expect(seen.at - shopOnly.doneAt).toBeLessThanOrEqual(2000);
    expect(seen.event).toBe("entry_added");
    expect(JSON.parse(seen.data)).toEqual({ id: shopOnly.eventId, kind: "entry_added", job, at: expect.any(String) });

    const shared = await postNoteAtA(`Shared note ${tag}`, "shared");
    const ownerSaw = await owner.waitFor("the shared note's event at B", (m) => m.id === String(shared.eventId), 2000);
    expect(ownerSaw.at - shared.doneAt).toBeLessThanOrEqual(2000);
    await desk.waitFor("the shared note's event on the desk stream", (m) => m.id === String(shared.eventId), 2000);
    // The owner never heard of the shop-only note (it came first, so it would have arrived first).
    expect(owner.messages.filter((m) => m.event !== "ready").map((m) => Number(m.id))).toEqual([shared.eventId]);
    const ids = desk.messages.filter((m) => m.event !== "ready").map((m) => Number(m.id));
    expect(ids).toEqual([...ids].sort((a, b) => a - b));
    expect(new Set(ids).size).toBe(ids.length);
  } finally {
    await desk.close();
    await owner.close();
  }
});

test("a client resumes with Last-Event-ID, on either instance: what it missed, once, then live", async () => {
  const first = await openStream(`${B}/api/shops/${SHOP}/events`, "writer");
  await first.waitFor("ready", (m) => m.event === "ready");
  const before = await postNoteAtA(`Before the drop ${tag}`, "shop");
  await first.waitFor("the event before the drop", (m) => m.id === String(before.eventId), 2000);
  const lastId = first.messages.at(-1)!.id;
  await first.close();

  // Two events while the client is away.
  const missed = [await postNoteAtA(`Missed one ${tag}`, "shop"), await postNoteAtA(`Missed two ${tag}`, "shared")];

  // It comes back through the other instance, as EventSource does, with the header.
  const again = await openStream(`${A}/api/shops/${SHOP}/events`, "writer", { "last-event-id": lastId });
  try {
    const ready = await again.waitFor("ready", (m) => m.event === "ready");
    // The replay comes before the ready message, the live feed after it.
    const replayed = again.messages.slice(0, again.messages.indexOf(ready));
    const ours = replayed.filter((m) => JSON.parse(m.data).job === job).map((m) => Number(m.id));
    expect(ours).toEqual(missed.map((m) => m.eventId));
    expect(replayed.every((m) => Number(m.id) > Number(lastId))).toBe(true);
    const live = await postNoteAtA(`After the return ${tag}`, "shop");
    await again.waitFor("the live event after the return", (m) => m.id === String(live.eventId), 2000);
    const all = again.messages.filter((m) => m.event !== "ready").map((m) => Number(m.id));
    expect(new Set(all).size).toBe(all.length);
    expect(all).toEqual([...all].sort((a, b) => a - b));
  } finally {
    await again.close();
  }

  // The owner's first connect says where it stands in the query (EventSource can't send a header then).
  const owner = await openStream(`${B}/api/jobs/${job}/events?lastEventId=${before.eventId}`, "jobCustomer");
  try {
    await owner.waitFor("ready", (m) => m.event === "ready");
    // Of the three events since, only the shared note is the owner's to hear.
    expect(owner.messages.filter((m) => m.event !== "ready").map((m) => Number(m.id))).toEqual([missed[1]!.eventId]);
  } finally {
    await owner.close();
  }
});

test("the staff board served by instance B follows an event caused through A, without a reload", async ({ browser }) => {
  const context = await browser.newContext({ storageState: storageStatePath("writer"), viewport: { width: 1280, height: 900 } });
  const page = await context.newPage();
  try {
    const connected = page.waitForResponse((r) => r.url().startsWith(`${B}/api/shops/${SHOP}/events`) && r.status() === 200);
    await page.goto(`${B}/shop/${SHOP}?q=${serial}`);
    await connected;
    const row = page.getByTestId("job-row").filter({ hasText: serial });
    await expect(row).toContainText("idles rough");
    await page.evaluate(() => ((window as unknown as { __notReloaded?: boolean }).__notReloaded = true));

    // A change that records no event (straight in the database), then one that does, through A:
    // only the event can bring the new words to B's board.
    await sql("UPDATE jobs SET concern = ? WHERE id = ?", [`Live stream test ${tag}: stalls when hot`, jobId]);
    const posted = await postNoteAtA(`Board check ${tag}`, "shop");
    await expect(row).toContainText("stalls when hot", { timeout: 2000 });
    expect(Date.now() - posted.doneAt).toBeLessThanOrEqual(2500);
    expect(await page.evaluate(() => (window as unknown as { __notReloaded?: boolean }).__notReloaded)).toBe(true);
  } finally {
    await context.close();
  }
});
