import { type APIRequestContext, expect, test } from "@playwright/test";
import mysql from "mysql2/promise";
import { type Persona, storageStatePath } from "./personas";

// Every page and route handler of the shop and owner areas × every kind of visitor.
// "in" = the visitor gets the thing; "sign-in" = sent to sign in; "403" = refused;
// "404" = answered as if it didn't exist (job and photo ids can't be probed).
type Outcome = "in" | "sign-in" | "403" | "404";
type Visitor = "anonymous" | Persona;

const VISITORS: Visitor[] = ["anonymous", "owner", "writer", "technician", "otherShopTechnician", "jobCustomer", "otherCustomer"];

let customerJobPath = "";
let demoRequest = "";
let demoFinding = 0;

test.beforeAll(async () => {
  // The owner-facing address of job J-0005 (the job customer's), read from the test database.
  const db = await mysql.createConnection(process.env.DATABASE_URL!);
  const [rows] = await db.query<mysql.RowDataPacket[]>(
    "SELECT j.public_id FROM jobs j JOIN shops s ON s.id = j.shop_id WHERE s.slug = 'copper-gulch' AND j.number = 5",
  );
  // The demo's open approval request on J-0005 (db/seeds/demo-approvals.ts) and its finding.
  const [requests] = await db.query<mysql.RowDataPacket[]>(
    "SELECT r.public_id, r.finding_id FROM approval_requests r JOIN jobs j ON j.id = r.job_id JOIN shops s ON s.id = j.shop_id WHERE s.slug = 'copper-gulch' AND j.number = 5 ORDER BY r.id LIMIT 1",
  );
  await db.end();
  customerJobPath = `/my/jobs/${rows[0]!.public_id}`;
  demoRequest = String(requests[0]!.public_id);
  demoFinding = Number(requests[0]!.finding_id);
});

/** Only the shop's own staff get in. */
const STAFF_OF_THE_SHOP: Record<Visitor, Outcome> = {
  anonymous: "sign-in",
  owner: "in",
  writer: "in",
  technician: "in",
  otherShopTechnician: "403",
  jobCustomer: "403",
  otherCustomer: "403",
};

const EVERYONE_IN = Object.fromEntries(VISITORS.map((v) => [v, "in"])) as Record<Visitor, Outcome>;
const EVERYONE_404 = Object.fromEntries(VISITORS.map((v) => [v, "404"])) as Record<Visitor, Outcome>;

const TARGETS: { name: string; kind: "page" | "api"; path: () => string; expect: Record<Visitor, Outcome> }[] = [
  {
    name: "shop job board",
    kind: "page",
    path: () => "/shop/copper-gulch",
    expect: STAFF_OF_THE_SHOP,
  },
  {
    name: "shop job page",
    kind: "page",
    path: () => "/shop/copper-gulch/jobs/5",
    expect: STAFF_OF_THE_SHOP,
  },
  {
    name: "job board API",
    kind: "api",
    path: () => "/api/shops/copper-gulch/jobs",
    expect: STAFF_OF_THE_SHOP,
  },
  { name: "check-in page", kind: "page", path: () => "/shop/copper-gulch/jobs/new", expect: STAFF_OF_THE_SHOP },
  { name: "bench tools page", kind: "page", path: () => "/shop/copper-gulch/jobs/5/bench", expect: STAFF_OF_THE_SHOP },
  { name: "shop spec library page", kind: "page", path: () => "/shop/copper-gulch/specs", expect: STAFF_OF_THE_SHOP },
  { name: "check-in owner search API", kind: "api", path: () => "/api/shops/copper-gulch/customers?q=Calloway", expect: STAFF_OF_THE_SHOP },
  {
    // Failed mail of the shop: the desk (owner, service writer) only.
    name: "shop outbox page",
    kind: "page",
    path: () => "/shop/copper-gulch/outbox",
    expect: { ...STAFF_OF_THE_SHOP, technician: "403" },
  },
  { name: "draft a finding page", kind: "page", path: () => "/shop/copper-gulch/jobs/5/findings/new", expect: STAFF_OF_THE_SHOP },
  { name: "finding page", kind: "page", path: () => `/shop/copper-gulch/jobs/5/findings/${demoFinding}`, expect: STAFF_OF_THE_SHOP },
  {
    name: "job approvals API",
    kind: "api",
    path: () => `/api/jobs/${customerJobPath.split("/").pop()}/approvals`,
    expect: { anonymous: "sign-in", owner: "in", writer: "in", technician: "in", otherShopTechnician: "404", jobCustomer: "403", otherCustomer: "404" },
  },
  {
    name: "owner's approval request page",
    kind: "page",
    path: () => `${customerJobPath}/approvals/${demoRequest}`,
    expect: { anonymous: "sign-in", owner: "in", writer: "in", technician: "in", otherShopTechnician: "403", jobCustomer: "in", otherCustomer: "403" },
  },
  {
    // Staff land on the finding's page, the machine's owner on the answer page.
    name: "approval link from the timeline",
    kind: "page",
    path: () => `/my/approvals/${demoRequest}`,
    expect: { anonymous: "sign-in", owner: "in", writer: "in", technician: "in", otherShopTechnician: "403", jobCustomer: "in", otherCustomer: "403" },
  },
  {
    name: "approval request API",
    kind: "api",
    path: () => `/api/approvals/${demoRequest}`,
    expect: { anonymous: "sign-in", owner: "in", writer: "in", technician: "in", otherShopTechnician: "404", jobCustomer: "in", otherCustomer: "404" },
  },
  {
    // A photo that isn't evidence of the request: the same 404 for everyone signed in.
    name: "approval evidence photo API",
    kind: "api",
    path: () => `/api/approvals/${demoRequest}/evidence/${"A".repeat(22)}/thumb`,
    expect: { anonymous: "sign-in", owner: "404", writer: "404", technician: "404", otherShopTechnician: "404", jobCustomer: "404", otherCustomer: "404" },
  },
  {
    name: "owner's job page",
    kind: "page",
    path: () => customerJobPath,
    expect: { anonymous: "sign-in", owner: "in", writer: "in", technician: "in", otherShopTechnician: "403", jobCustomer: "in", otherCustomer: "403" },
  },
  {
    name: "job timeline API",
    kind: "api",
    path: () => `/api/jobs/${customerJobPath.split("/").pop()}/timeline`,
    expect: { anonymous: "sign-in", owner: "in", writer: "in", technician: "in", otherShopTechnician: "404", jobCustomer: "in", otherCustomer: "404" },
  },
  // Invoices (issue 9): the desk and the shop owner; the job's customer on their own page; technicians see no money.
  { name: "staff invoice page", kind: "page", path: () => "/shop/copper-gulch/jobs/5/invoice", expect: { ...STAFF_OF_THE_SHOP, technician: "403" } },
  {
    name: "owner's invoice page",
    kind: "page",
    path: () => `${customerJobPath}/invoice`,
    expect: { anonymous: "sign-in", owner: "in", writer: "in", technician: "403", otherShopTechnician: "403", jobCustomer: "in", otherCustomer: "403" },
  },
  {
    name: "job invoice API",
    kind: "api",
    path: () => `/api/jobs/${customerJobPath.split("/").pop()}/invoice`,
    expect: { anonymous: "sign-in", owner: "in", writer: "in", technician: "403", otherShopTechnician: "404", jobCustomer: "in", otherCustomer: "404" },
  },
  {
    name: "staff home",
    kind: "page",
    path: () => "/shop",
    expect: { anonymous: "sign-in", owner: "in", writer: "in", technician: "in", otherShopTechnician: "in", jobCustomer: "403", otherCustomer: "403" },
  },
  // Public portfolio (issue 8): the desk curates, the shop owner edits the profile, only the
  // machine's owner answers; the public pages and files are for everyone.
  { name: "shop portfolio page", kind: "page", path: () => "/shop/copper-gulch/portfolio", expect: { ...STAFF_OF_THE_SHOP, technician: "403" } },
  { name: "shop profile editor", kind: "page", path: () => "/shop/copper-gulch/portfolio/profile", expect: { ...STAFF_OF_THE_SHOP, writer: "403", technician: "403" } },
  {
    name: "owner's portfolio consent page",
    kind: "page",
    path: () => `${customerJobPath}/portfolio`,
    expect: { anonymous: "sign-in", owner: "403", writer: "403", technician: "403", otherShopTechnician: "403", jobCustomer: "in", otherCustomer: "403" },
  },
  { name: "shop's public page", kind: "page", path: () => "/s/copper-gulch", expect: EVERYONE_IN },
  { name: "unknown public story API", kind: "api", path: () => "/api/public/stories/copper-gulch/no-such-story", expect: EVERYONE_404 },
  { name: "sitemap", kind: "api", path: () => "/sitemap.xml", expect: EVERYONE_IN },
  { name: "robots.txt", kind: "api", path: () => "/robots.txt", expect: EVERYONE_IN },
];

async function apiStatus(request: APIRequestContext, path: string) {
  return (await request.get(path, { maxRedirects: 0 })).status();
}

for (const visitor of VISITORS) {
  test.describe(`as ${visitor}`, () => {
    if (visitor !== "anonymous") test.use({ storageState: storageStatePath(visitor) });

    for (const target of TARGETS) {
      const outcome = target.expect[visitor];
      test(`${target.name}: ${outcome}`, async ({ page }) => {
        if (target.kind === "api") {
          const status = await apiStatus(page.request, target.path());
          expect(status).toBe({ in: 200, "403": 403, "404": 404, "sign-in": 401 }[outcome]);
          return;
        }
        const response = await page.goto(target.path());
        if (outcome === "sign-in") {
          await expect(page).toHaveURL(/\/sign-in\?next=/);
        } else if (outcome === "403") {
          expect(response?.status()).toBe(403);
          await expect(page.getByRole("heading", { name: /isn.t yours to open/i })).toBeVisible();
        } else {
          expect(response?.status()).toBe(200);
          await expect(page.getByRole("heading", { name: /isn.t yours to open/i })).toHaveCount(0);
          await expect(page).not.toHaveURL(/\/sign-in/);
        }
      });
    }
  });
}

test.describe("missing and malformed", () => {
  test.use({ storageState: storageStatePath("owner") });
  test("a malformed job-list query is a 422 naming each bad field", async ({ page }) => {
    const res = await page.request.get("/api/shops/copper-gulch/jobs?status=lost&pageSize=7&q=" + "x".repeat(200));
    expect(res.status()).toBe(422);
    const body = await res.json();
    expect(body.error.code).toBe("invalid");
    expect(Object.keys(body.error.fields).sort()).toEqual(["pageSize", "q", "status"]);
  });

  test("a job number the shop doesn't have is a real 404", async ({ page }) => {
    expect((await page.goto("/shop/copper-gulch/jobs/999"))?.status()).toBe(404);
    expect((await page.goto("/shop/copper-gulch/jobs/not-a-number"))?.status()).toBe(404);
  });
});

test.describe("same job number, other shop", () => {
  test.use({ storageState: storageStatePath("otherShopTechnician") });
  test("a technician's own shop's job 1 opens while another shop's job 1 is refused", async ({ page }) => {
    expect((await page.goto("/shop/copper-gulch/jobs/1"))?.status()).toBe(403);
    await expect(page.getByText("Yearly service")).toHaveCount(0);
    await page.goto("/shop/saltmarsh/jobs/1");
    await expect(page.getByRole("heading", { name: /J-0001 · 2016 Brumal Drift 600/ })).toBeVisible();
  });
});
