import { type APIRequestContext, request as apiRequest, expect, test } from "@playwright/test";
import { newDemoJob, sql } from "./db";
import { storageStatePath, type Persona } from "./personas";

// The job pages are served again from the page cache while nothing they show has changed
// (lib/server/page-cache.ts, db/page-versions.ts): the same answer with a fresh CSP nonce each
// time, rendered again as soon as anything on the page changes, whoever wrote it, and never for
// another person or after a change of roles.

const BASE = process.env.APP_URL ?? "http://localhost:3110";
const STATE = "x-benchside-page";

let job: { number: number; publicId: string };
const ownerPage = () => `/my/jobs/${job.publicId}`;
const staffPage = () => `/shop/copper-gulch/jobs/${job.number}`;

async function as(persona: Persona): Promise<APIRequestContext> {
  return apiRequest.newContext({ baseURL: BASE, storageState: storageStatePath(persona), extraHTTPHeaders: { accept: "text/html" } });
}

async function load(api: APIRequestContext, path: string) {
  const res = await api.get(path, { maxRedirects: 0 });
  const body = await res.text();
  const nonce = /'nonce-([^']+)'/.exec(res.headers()["content-security-policy"] ?? "")?.[1] ?? null;
  return { status: res.status(), state: res.headers()[STATE] ?? null, nonce, body, location: res.headers()["location"] ?? null };
}

/** A note the shop shares with the owner, written straight to the database (the triggers see every writer). */
async function shareNote(text: string) {
  const body = JSON.stringify({ type: "doc", content: [{ type: "paragraph", content: [{ type: "text", text }] }] });
  await sql(
    "INSERT INTO journal_entries (shop_id, job_id, kind, visibility, body, shared_at) SELECT j.shop_id, j.id, 'note', 'shared', ?, NOW(3) FROM jobs j JOIN shops s ON s.id = j.shop_id WHERE s.slug = 'copper-gulch' AND j.number = ?",
    [body, job.number],
  );
}

test.beforeAll(async () => {
  // The demo owner's (jobCustomer's) machine, so they may see it; removed again afterwards.
  job = await newDemoJob("PGCACHE", "Idles rough once warm; owner wants it checked before a trip.");
});
test.afterAll(async () => {
  await sql("DELETE FROM jobs WHERE public_id LIKE 'PGCACHE%'");
});

test("a job page loaded again is the same page with a new nonce, and a change shows at once", async () => {
  const owner = await as("jobCustomer");
  const first = await load(owner, ownerPage());
  expect(first.status).toBe(200);
  expect(first.state).toBe("rendered");
  const second = await load(owner, ownerPage());
  expect(second.state).toBe("cached");
  expect(second.nonce).toBeTruthy();
  expect(second.nonce).not.toBe(first.nonce);
  // Every script the cached answer carries has this answer's nonce, and the page is otherwise the same.
  const tags = second.body.match(/<script\b[^>]*>/g) ?? [];
  expect(tags.length).toBeGreaterThan(0);
  expect(tags.filter((t) => !/type="application\/(ld\+)?json"/.test(t) && !t.includes(`nonce="${second.nonce}"`))).toEqual([]);
  expect(second.body.split(second.nonce!).join("N")).toBe(first.body.split(first.nonce!).join("N"));

  await shareNote("Carburettor pilot jet was varnished shut; cleaned and reset.");
  const third = await load(owner, ownerPage());
  expect(third.state).toBe("rendered");
  expect(third.body).toContain("Carburettor pilot jet was varnished shut");

  // A change of status, through a table the page reads, moves it too.
  expect((await load(owner, ownerPage())).state).toBe("cached");
  await sql("UPDATE jobs j JOIN shops s ON s.id = j.shop_id SET j.promised_on = CURDATE() + INTERVAL 9 DAY WHERE s.slug = 'copper-gulch' AND j.number = ?", [job.number]);
  expect((await load(owner, ownerPage())).state).toBe("rendered");
  await owner.dispose();
});

test("one person's cached page is never another's, and a hard reload renders afresh", async () => {
  const tech = await as("technician");
  const writer = await as("writer");
  const a = await load(tech, staffPage());
  expect(a.status).toBe(200);
  expect((await load(tech, staffPage())).state).toBe("cached");
  // Another person of the same shop, same job, nothing changed: their own render.
  const b = await load(writer, staffPage());
  expect(b.status).toBe(200);
  expect(b.state).toBe("rendered");
  expect(b.body).toContain("priya@coppergulch.test");
  expect(b.body).not.toContain("mateo@coppergulch.test");
  // Cache-Control: no-cache (a hard reload) goes past the cache.
  const hard = await tech.get(staffPage(), { headers: { "cache-control": "no-cache" }, maxRedirects: 0 });
  expect(hard.status()).toBe(200);
  expect(hard.headers()[STATE]).toBeUndefined();
  // Someone outside the job: refused as the page refuses them, never a cached copy.
  const other = await as("otherCustomer");
  const refused = await load(other, ownerPage());
  expect(refused.state).toBeNull();
  expect(refused.body).not.toContain("Idles rough once warm");
  await Promise.all([tech.dispose(), writer.dispose(), other.dispose()]);
});

test("a role taken away stops the cached page at once", async () => {
  const tech = await as("technician");
  expect((await load(tech, staffPage())).status).toBe(200);
  expect((await load(tech, staffPage())).state).toBe("cached");
  await sql("UPDATE memberships m JOIN users u ON u.id = m.user_id SET m.deactivated_at = NOW() WHERE u.email = 'mateo@coppergulch.test'");
  try {
    const after = await load(tech, staffPage());
    expect(after.state).toBeNull();
    expect(after.body).not.toContain("Idles rough once warm");
  } finally {
    await sql("UPDATE memberships m JOIN users u ON u.id = m.user_id SET m.deactivated_at = NULL WHERE u.email = 'mateo@coppergulch.test'");
    await tech.dispose();
  }
});
