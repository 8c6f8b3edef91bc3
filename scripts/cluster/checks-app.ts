// The checks that drive the product through HAProxy: a session and a photo crossing instances,
// a live update crossing instances, concurrent check-ins, and an app instance killed under load.
import { execFileSync } from "node:child_process";
import { ListObjectsV2Command, S3Client } from "@aws-sdk/client-s3";
import type { Knex } from "knex";
import sharp from "sharp";
import { type Answer, action, call, callOn, openStream, signInStaff, sleep, type Stream } from "./http";

export type Check = { name: string; pass: boolean; detail: string };
export type Ctx = { k: Knex; shop: { id: number; slug: string }; staff: { cookie: string; instance: string } };

export const STAFF = { email: "dana@coppergulch.test", password: "gulch-owner-demo" };
const CHECK_IN = "app/(staff)/shop/[shop]/jobs/new/actions.ts#checkInMachine";

export async function openContext(k: Knex): Promise<Ctx> {
  const shop = await k("shops").where({ slug: "copper-gulch" }).first("id", "slug");
  if (!shop) throw new Error("the demo shop copper-gulch is missing (seed)");
  return { k, shop: { id: Number(shop.id), slug: String(shop.slug) }, staff: await signInStaff(STAFF.email, STAFF.password) };
}

export async function sessionCrossesInstances(ctx: Ctx): Promise<Check> {
  const board = await callOn({ not: ctx.staff.instance }, `/api/shops/${ctx.shop.slug}/jobs`, { cookie: ctx.staff.cookie });
  const jobs = board.status === 200 ? (JSON.parse(board.text) as { total?: number }).total : undefined;
  return {
    name: "session made on one instance works on the other",
    pass: board.status === 200,
    detail: `signed in through instance ${ctx.staff.instance}; the board through instance ${board.instance}: HTTP ${board.status}${jobs === undefined ? "" : `, ${jobs} jobs`}`,
  };
}

/** One check-in of a machine on file; the job number from the redirect, or null when refused. */
export async function checkIn(ctx: Ctx, machine: { customerId: number; machineId: number }, concern: string) {
  const answer = await action(CHECK_IN, `/shop/${ctx.shop.slug}/jobs/new`, { shop: ctx.shop.slug, customerMode: "existing", customerId: String(machine.customerId), machineMode: "existing", machineId: String(machine.machineId), concern }, ctx.staff.cookie);
  const number = /\/jobs\/(\d+)/.exec(answer.redirect ?? "")?.[1];
  return { answer, number: number ? Number(number) : null };
}

export async function someMachine(ctx: Ctx) {
  const m = await ctx.k("machines").where({ shop_id: ctx.shop.id }).orderBy("id").first("id", "customer_id");
  if (!m) throw new Error("the demo shop has no machine on file");
  return { customerId: Number(m.customer_id), machineId: Number(m.id) };
}

/** Opens streams until one is served by each instance (round robin: two or three tries). */
async function streamsOnBoth(ctx: Ctx): Promise<Map<string, Stream>> {
  const streams = new Map<string, Stream>();
  for (let i = 0; i < 10 && streams.size < 2; i++) {
    const s = await openStream(`/api/shops/${ctx.shop.slug}/events`, ctx.staff.cookie);
    if (streams.has(s.instance)) s.close();
    else streams.set(s.instance, s);
  }
  return streams;
}

export async function liveUpdateCrossesInstances(ctx: Ctx): Promise<Check> {
  const name = "an event caused through one instance reaches a live stream on the other";
  const streams = await streamsOnBoth(ctx);
  try {
    if (streams.size < 2) return { name, pass: false, detail: `could only open streams on ${[...streams.keys()].join(", ")}` };
    await sleep(1000); // both pollers running
    const started = Date.now();
    const { answer, number } = await checkIn(ctx, await someMachine(ctx), "Cluster check: live update");
    if (number == null) return { name, pass: false, detail: `the check-in was refused: HTTP ${answer.status} ${answer.message ?? ""}` };
    const job = await ctx.k("jobs").where({ shop_id: ctx.shop.id, number }).first("public_id");
    const other = [...streams.values()].find((s) => s.instance !== answer.instance)!;
    while (Date.now() - started < 8000 && !other.events.some((e) => e.job === job?.public_id)) await sleep(100);
    const seen = other.events.find((e) => e.job === job?.public_id);
    return {
      name,
      pass: Boolean(seen),
      detail: seen
        ? `job ${number} checked in through instance ${answer.instance}; its ${seen.kind} event (id ${seen.id}) reached the stream on instance ${other.instance} within ${Date.now() - started} ms of sending the check-in`
        : `job ${number} checked in through instance ${answer.instance}; nothing about it reached the stream on instance ${other.instance} in 8 s`,
    };
  } finally {
    for (const s of streams.values()) s.close();
  }
}

async function objectCount(prefix: string): Promise<number> {
  const s3 = new S3Client({ region: process.env.S3_REGION!, endpoint: process.env.S3_ENDPOINT!, forcePathStyle: true, credentials: { accessKeyId: process.env.S3_ACCESS_KEY_ID!, secretAccessKey: process.env.S3_SECRET_ACCESS_KEY! } });
  let count = 0;
  let token: string | undefined;
  do {
    const page = await s3.send(new ListObjectsV2Command({ Bucket: process.env.S3_BUCKET!, Prefix: prefix, ContinuationToken: token }));
    count += page.KeyCount ?? 0;
    token = page.NextContinuationToken;
  } while (token);
  return count;
}

export async function photoCrossesInstances(ctx: Ctx): Promise<Check> {
  const name = "photo posted through one instance is served through the other, from S3";
  const job = await ctx.k("jobs").where({ shop_id: ctx.shop.id }).orderBy("id", "desc").first("public_id");
  const jpeg = await sharp({ create: { width: 800, height: 600, channels: 3, background: { r: 120, g: 90, b: 40 } } }).jpeg().toBuffer();
  const before = await objectCount(`shops/${ctx.shop.id}/`);
  const form = new FormData();
  form.append("photo", new Blob([new Uint8Array(jpeg)], { type: "image/jpeg" }), "cluster-check.jpg");
  const posted = await call(`/api/jobs/${job!.public_id}/photos`, { method: "POST", body: form, cookie: ctx.staff.cookie, headers: { origin: process.env.APP_URL! } });
  if (posted.status !== 200) return { name, pass: false, detail: `the upload through instance ${posted.instance} answered HTTP ${posted.status}: ${posted.text.slice(0, 200)}` };
  const photo = (JSON.parse(posted.text) as { photo: { id: string } }).photo;
  const after = await objectCount(`shops/${ctx.shop.id}/`);
  const served = await callOn({ not: posted.instance }, `/api/photos/${photo.id}/display`, { cookie: ctx.staff.cookie });
  const type = served.headers.get("content-type");
  const pass = served.status === 200 && type === "image/jpeg" && after > before;
  return { name, pass, detail: `uploaded through instance ${posted.instance} (${after - before} new objects in the S3 bucket); display rendition through instance ${served.instance}: HTTP ${served.status} ${type}, ${served.bytes} bytes` };
}

export async function concurrentCheckIns(ctx: Ctx, count = 50): Promise<Check> {
  const name = `${count} concurrent check-ins give unique, gapless job numbers`;
  const machine = await someMachine(ctx);
  const first = Number((await ctx.k("shops").where({ id: ctx.shop.id }).first("next_job_number"))!.next_job_number);
  const results = await Promise.all(Array.from({ length: count }, (_, i) => checkIn(ctx, machine, `Cluster check: concurrent check-in ${i + 1}`)));
  const numbers = results.map((r) => r.number).filter((n): n is number => n != null).sort((a, b) => a - b);
  const rows = await ctx.k("jobs").where({ shop_id: ctx.shop.id }).where("number", ">=", first).orderBy("number").pluck("number");
  const expected = Array.from({ length: count }, (_, i) => first + i);
  const byInstance = results.reduce<Record<string, number>>((m, r) => ({ ...m, [r.answer.instance]: (m[r.answer.instance] ?? 0) + 1 }), {});
  const refused = results.filter((r) => r.number == null).map((r) => `HTTP ${r.answer.status} ${r.answer.message ?? ""}`.trim());
  const pass = refused.length === 0 && JSON.stringify(numbers) === JSON.stringify(expected) && JSON.stringify(rows.map(Number)) === JSON.stringify(expected);
  return {
    name,
    pass,
    detail: `${numbers.length}/${count} accepted (by instance: ${JSON.stringify(byInstance)}); numbers ${numbers[0]}–${numbers.at(-1)}, ${new Set(numbers).size} distinct, ${rows.length} rows from ${first}${refused.length ? `; refused: ${[...new Set(refused)].join(" | ")}` : ""}`,
  };
}

/** The process listening on a loopback port (ss), so an instance is stopped by its own id. */
function listenerPid(port: number): number {
  const out = execFileSync("ss", ["-ltnpH", `sport = :${port}`], { encoding: "utf8" });
  const pid = /pid=(\d+)/.exec(out)?.[1];
  if (!pid) throw new Error(`nothing listens on port ${port}`);
  return Number(pid);
}

type Timed = Answer & { started: number; failed?: string };

const describeFailure = (error: unknown) => {
  const cause = (error as { cause?: { code?: string; message?: string } }).cause;
  return `${(error as Error).message}${cause ? ` (${cause.code ?? cause.message})` : ""}`;
};

/** Readers on the board for `seconds`, through HAProxy; an app instance is SIGKILLed after `killAfter`. */
export async function appInstanceKilled(ctx: Ctx, port: number, { seconds = 12, killAfter = 3, readers = 8 } = {}): Promise<Check> {
  const name = "one app instance killed: no 5xx beyond the requests in flight";
  const until = Date.now() + seconds * 1000;
  const seen: Timed[] = [];
  let killedAt = Infinity;
  const reader = async () => {
    while (Date.now() < until) {
      const started = Date.now();
      try {
        seen.push({ ...(await call(`/api/shops/${ctx.shop.slug}/jobs`, { cookie: ctx.staff.cookie })), started });
      } catch (error) {
        seen.push({ status: 0, instance: "?", text: "", bytes: 0, headers: new Headers(), ms: Date.now() - started, started, failed: describeFailure(error) });
      }
    }
  };
  const killer = (async () => {
    await sleep(killAfter * 1000);
    process.kill(listenerPid(port), "SIGKILL");
    killedAt = Date.now();
  })();
  await Promise.all([killer, ...Array.from({ length: readers }, reader)]);
  const bad = seen.filter((r) => r.status >= 500 || r.status === 0);
  const late = bad.filter((r) => r.started > killedAt);
  const after = seen.filter((r) => r.started > killedAt);
  const served = after.reduce<Record<string, number>>((m, r) => ({ ...m, [r.instance]: (m[r.instance] ?? 0) + 1 }), {});
  return {
    name,
    pass: late.length === 0 && after.some((r) => r.status === 200),
    detail: `${seen.length} requests by ${readers} readers; the instance on port ${port} killed after ${killAfter} s; ${bad.length} failed (${bad.map((r) => `${r.status || r.failed} sent ${r.started - killedAt} ms after the kill`).join(", ") || "none"}), ${late.length} of them sent after the kill; after it: ${JSON.stringify(served)}`,
  };
}
