// The access test's own job at Copper Gulch, made through the app by its staff, so every
// resolver has something real to find: Ruth Calloway's (jobCustomer) machine checked in again,
// with a follower, a shared note, photos (shared; shop-only but quoted in a request; shop-only),
// a shared clip processed by the video fake, a finding sent as a request and approved, an issued
// invoice, a deposit, and a portfolio story. Removed afterwards with everything hanging off it,
// and the shop settings the allowed requests save are put back.
import fs from "node:fs";
import path from "node:path";
import { type APIRequestContext, expect } from "@playwright/test";
import type mysql from "mysql2/promise";
import type { MediaFacts } from "../../../lib/permissions";
import { CUSTOMERS } from "../personas";
import { type ActionRef, type Body, type Seen, callAction, callHandler, describeSeen } from "./client";

export type Fixture = {
  run: string;
  shop: string;
  shopId: number;
  jobId: number;
  /** Ruth Calloway's customer record (the customer resolver's id). */
  customer: number;
  job: string;
  number: number;
  entry: number;
  finding: number;
  request: string;
  invoice: string;
  deposit: string;
  story: number;
  storySlug: string;
  photos: Record<"shared" | "quoted" | "shopOnly", string>;
  clip: string;
  /** Saved again by the allowed requests, and put back afterwards. */
  profile: Record<string, string>;
};

/** The media rule's facts of each fixture photo and clip, as they were made. */
export const MEDIA: Record<"shared" | "quoted" | "shopOnly" | "clip", MediaFacts> = {
  shared: { shared: true, moneyEntry: false, quotedInRequest: false, inPublishedStory: false },
  quoted: { shared: false, moneyEntry: false, quotedInRequest: true, inPublishedStory: false },
  shopOnly: { shared: false, moneyEntry: false, quotedInRequest: false, inPublishedStory: false },
  clip: { shared: true, moneyEntry: false, quotedInRequest: false, inPublishedStory: false },
};

const FIXTURES = path.join(__dirname, "..", "..", "fixtures");
export const PHOTO_FILE = fs.readFileSync(path.join(FIXTURES, "photos", "gps.jpg"));
const CLIP_FILE = fs.readFileSync(path.join(FIXTURES, "clips", "bench-idle.mp4"));

export const note = (text: string) => ({ type: "doc", content: [{ type: "paragraph", content: [{ type: "text", text }] }] });

type Deps = {
  db: mysql.Connection;
  as: (who: "writer" | "technician" | "jobCustomer") => APIRequestContext;
  action: (key: string) => ActionRef;
  /** Told the job's id as soon as it exists, so a failure halfway can still remove it. */
  made: (jobId: number) => void;
};

async function one(db: mysql.Connection, query: string, params: unknown[]): Promise<mysql.RowDataPacket> {
  const [rows] = await db.query<mysql.RowDataPacket[]>(query, params);
  if (!rows[0]) throw new Error(`fixture: nothing for ${query} ${JSON.stringify(params)}`);
  return rows[0];
}

export async function makeFixture({ db, as, action, made }: Deps): Promise<Fixture> {
  const run = Date.now().toString(36);
  const shop = "copper-gulch";
  // Each step must succeed: a 2xx, and for an action `ok: true` or a redirect.
  const ok = async (what: string, seen: Promise<Seen>) => {
    const s = await seen;
    if (s.status >= 300 || (s.code !== undefined && s.code !== "ok")) throw new Error(`fixture: ${what} failed: ${describeSeen(s)}`);
    return s;
  };
  const post = (who: "writer" | "technician" | "jobCustomer", p: string, body: Body, method = "POST") => callHandler(as(who), { method, path: p, body });
  const act = (who: "writer" | "technician", key: string, page: string, fields: Record<string, string>) => callAction(as(who), { id: action(key).id, page, fields });

  const ruth = await one(db, "SELECT c.id, c.shop_id, m.id AS machine_id FROM customers c JOIN shops s ON s.id = c.shop_id JOIN machines m ON m.customer_id = c.id WHERE s.slug = ? AND c.email = ? ORDER BY m.id LIMIT 1", [shop, CUSTOMERS.jobCustomer.email]);
  const checkIn = await ok(
    "check-in",
    act("writer", "app/(staff)/shop/[shop]/jobs/new/actions.ts#checkInMachine", `/shop/${shop}/jobs/new`, {
      shop,
      customerMode: "existing",
      customerId: String(ruth.id),
      machineMode: "existing",
      machineId: String(ruth.machine_id),
      concern: `Access test ${run}: made and removed by tests/e2e/access-generated.spec.ts.`,
    }),
  );
  const number = Number(/\/jobs\/(\d+)/.exec(checkIn.redirect ?? "")?.[1]);
  const job = await one(db, "SELECT id, public_id FROM jobs WHERE shop_id = ? AND number = ?", [ruth.shop_id, number]);
  made(Number(job.id));
  const f = { run, shop, shopId: Number(ruth.shop_id), jobId: Number(job.id), customer: Number(ruth.id), job: String(job.public_id), number } as Fixture;

  // A follower of this job: the follower persona (signed in already, so its user exists).
  const follower = await one(db, "SELECT id FROM users WHERE email = ?", [CUSTOMERS.follower.email]);
  await db.query("INSERT INTO job_subscribers (shop_id, job_id, email, user_id, role) VALUES (?, ?, ?, ?, 'follower')", [f.shopId, f.jobId, CUSTOMERS.follower.email, follower.id]);

  const api = `/api/jobs/${f.job}`;
  await ok("shared note", post("technician", `${api}/entries`, { kind: "json", value: { kind: "note", note: note(`Access test ${run}`), visibility: "shared" } }));
  f.entry = Number((await one(db, "SELECT MAX(id) AS id FROM journal_entries WHERE job_id = ? AND kind = 'note'", [f.jobId])).id);

  for (let i = 0; i < 3; i++) await ok("photo upload", post("technician", `${api}/photos`, { kind: "multipart", fields: { photo: { name: "bench.jpg", mimeType: "image/jpeg", buffer: PHOTO_FILE } } }));
  const [photoRows] = await db.query<mysql.RowDataPacket[]>("SELECT public_id FROM photos WHERE job_id = ? ORDER BY id", [f.jobId]);
  const [shared, quoted, shopOnly] = photoRows.map((r) => String(r.public_id));
  f.photos = { shared: shared!, quoted: quoted!, shopOnly: shopOnly! };
  await ok("shared photo", post("technician", `${api}/entries`, { kind: "json", value: { kind: "photos", photoIds: [shared], visibility: "shared" } }));
  await ok("shop-only photos", post("technician", `${api}/entries`, { kind: "json", value: { kind: "photos", photoIds: [quoted, shopOnly], visibility: "shop" } }));

  const clip = await ok("clip", post("technician", `${api}/clips`, { kind: "json", value: { name: "bench-idle.mp4", size: CLIP_FILE.length, durationSeconds: 3, type: "video/mp4", visibility: "shared" } }));
  const { clipId, uploadUrl } = JSON.parse(clip.text) as { clipId: string; uploadUrl: string };
  f.clip = clipId;
  const put = await fetch(uploadUrl, { method: "PUT", headers: { "content-type": "video/mp4" }, body: new Uint8Array(CLIP_FILE) });
  if (!put.ok) throw new Error(`fixture: clip upload answered ${put.status}`);

  const finding = await ok(
    "finding",
    post("writer", `${api}/findings`, {
      kind: "json",
      value: {
        title: "Access test finding",
        found: "Made by the access test.",
        safety: "none",
        evidence: [{ kind: "photo", ref: quoted }],
        lines: [{ kind: "labour", description: "Access test labour", hours: "1", rate: "80.00", taxable: false }],
      },
    }),
  );
  const drafted = JSON.parse(finding.text) as { id: number; version: number };
  f.finding = drafted.id;
  const sent = await ok("send request", post("writer", `${api}/findings/${f.finding}/send`, { kind: "json", value: { findingVersion: drafted.version } }));
  f.request = (JSON.parse(sent.text) as { request: string }).request;
  // The owner approves every line as shown (the request's frozen snapshot), as invoice.spec.ts does.
  const shown = await one(db, "SELECT hash, snapshot FROM approval_requests WHERE public_id = ?", [f.request]);
  const snapshot = (typeof shown.snapshot === "string" ? JSON.parse(shown.snapshot) : shown.snapshot) as { lines: { no: number }[] };
  const lines = snapshot.lines.map((l) => ({ no: l.no, answer: "approved" }));
  await ok("owner approves", post("jobCustomer", `/api/approvals/${f.request}/decision`, { kind: "json", value: { shownHash: shown.hash, lines, signature: "Ruth Calloway", wantsPartsBack: false, confirmed: true } }));

  const invoicePage = `/shop/${shop}/jobs/${number}/invoice`;
  const invoiceActions = "app/(staff)/shop/[shop]/jobs/[number]/invoice/actions.ts";
  await ok("invoice", act("writer", `${invoiceActions}#createInvoiceAction`, invoicePage, { job: f.job }));
  const invoice = await one(db, "SELECT public_id, version FROM invoices WHERE job_id = ? AND voided_at IS NULL", [f.jobId]);
  f.invoice = String(invoice.public_id);
  await ok("issue", act("writer", `${invoiceActions}#issueInvoiceAction`, invoicePage, { invoice: f.invoice, version: String(invoice.version), confirmed: "yes" }));
  await ok("deposit", act("writer", `${invoiceActions}#requestDepositAction`, invoicePage, { job: f.job, amount: "20.00" }));
  f.deposit = String((await one(db, "SELECT public_id FROM deposit_requests WHERE job_id = ?", [f.jobId])).public_id);

  f.storySlug = `access-test-${run}`;
  const [story] = await db.query<mysql.ResultSetHeader>("INSERT INTO stories (shop_id, job_id, slug, title, status) VALUES (?, ?, ?, 'Access test story', 'proposed')", [f.shopId, f.jobId, f.storySlug]);
  f.story = story.insertId;

  const profile = await one(db, "SELECT display_name, about, location_text, takes_in, show_location, public_email, public_phone FROM shop_profiles WHERE shop_id = ?", [f.shopId]);
  f.profile = {
    displayName: profile.display_name ?? "",
    about: profile.about ?? "",
    locationText: profile.location_text ?? "",
    takesIn: profile.takes_in ?? "",
    publicEmail: profile.public_email ?? "",
    publicPhone: profile.public_phone ?? "",
    ...(profile.show_location ? { showLocation: "on" } : {}),
  };

  // The clip turns ready when the video fake has processed it and its webhook has come back.
  await expect.poll(async () => (await one(db, "SELECT status FROM clips WHERE public_id = ?", [f.clip])).status, { timeout: 60_000, message: "fixture clip ready" }).toBe("ready");
  return f;
}

type Saved = { rows: Record<string, mysql.RowDataPacket[]>; clipLimits: mysql.RowDataPacket };

/** What the allowed requests may save at shop level, to put back afterwards. */
export async function saveShopSettings(db: mysql.Connection, slug: string): Promise<Saved> {
  const shop = await one(db, "SELECT id, clip_max_seconds, clip_max_bytes, opening_hours, (SELECT COALESCE(MAX(id), 0) FROM shop_setting_changes WHERE shop_id = shops.id) AS last_change FROM shops WHERE slug = ?", [slug]);
  const rows: Saved["rows"] = {};
  for (const table of ["shop_profiles", "shop_bench_settings"]) [rows[table]] = await db.query<mysql.RowDataPacket[]>(`SELECT * FROM ${table} WHERE shop_id = ?`, [shop.id]);
  return { rows, clipLimits: shop };
}

export async function restoreShopSettings(db: mysql.Connection, saved: Saved): Promise<void> {
  const shopId = saved.clipLimits.id;
  await db.query("UPDATE shops SET clip_max_seconds = ?, clip_max_bytes = ? WHERE id = ?", [saved.clipLimits.clip_max_seconds, saved.clipLimits.clip_max_bytes, shopId]);
  // The settings page's opening hours, and the record of the changes the allowed requests made.
  const hours = saved.clipLimits.opening_hours;
  await db.query("UPDATE shops SET opening_hours = ? WHERE id = ?", [hours && typeof hours === "object" ? JSON.stringify(hours) : hours, shopId]);
  await db.query("DELETE FROM shop_setting_changes WHERE shop_id = ? AND id > ?", [shopId, saved.clipLimits.last_change]);
  for (const [table, rows] of Object.entries(saved.rows)) {
    await db.query(`DELETE FROM ${table} WHERE shop_id = ?`, [shopId]);
    for (const row of rows) {
      const values = Object.fromEntries(Object.entries(row).map(([k, v]) => [k, v && typeof v === "object" && !(v instanceof Date) && !Buffer.isBuffer(v) ? JSON.stringify(v) : v]));
      await db.query(`INSERT INTO ${table} SET ?`, [values]);
    }
  }
}

/** The job and everything on it (foreign keys cascade), and the shop-level rows the test added. */
export async function removeFixture(db: mysql.Connection, f: { run?: string; jobId: number }): Promise<void> {
  if (f.jobId) await db.query("DELETE FROM jobs WHERE id = ?", [f.jobId]);
  if (f.run) await db.query("DELETE FROM spec_entries WHERE make = ?", [`Access ${f.run}`]);
}
