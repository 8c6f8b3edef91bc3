import mysql from "mysql2/promise";
import type { Persona } from "../personas";

// Every page of the shop and owner areas × every kind of visitor. (Route handlers and server
// actions are covered, all of them, by access-generated.spec.ts.)
// "in" = the visitor gets the page; "sign-in" = sent to sign in; "403" = refused; "404" =
// answered as if it didn't exist (lib/server/access.ts: someone else's job, request or money
// isn't confirmed to exist; a shop is public knowledge, so a shop's pages refuse with 403).
export type Outcome = "in" | "sign-in" | "403" | "404";
export type Visitor = "anonymous" | Persona;

export const VISITORS: Visitor[] = [
  "anonymous",
  "owner",
  "writer",
  "technician",
  "otherShopOwner",
  "otherShopWriter",
  "otherShopTechnician",
  "deactivatedTechnician",
  "jobCustomer",
  "otherCustomer",
  "follower",
];

let customerJobPath = "";
let demoRequest = "";
let demoFinding = 0;
let demoCustomer = 0;
let demoMachine = 0;

let loaded = false;

/** Reads the demo ids the paths need from the test database (once per worker). */
export async function loadPageIds(): Promise<void> {
  if (loaded) return;
  // The owner-facing address of job J-0005 (the job customer's), read from the test database.
  const db = await mysql.createConnection(process.env.DATABASE_URL!);
  const [rows] = await db.query<mysql.RowDataPacket[]>(
    "SELECT j.public_id FROM jobs j JOIN shops s ON s.id = j.shop_id WHERE s.slug = 'copper-gulch' AND j.number = 5",
  );
  // The demo's open approval request on J-0005 (db/seeds/demo-approvals.ts) and its finding.
  const [requests] = await db.query<mysql.RowDataPacket[]>(
    "SELECT r.public_id, r.finding_id FROM approval_requests r JOIN jobs j ON j.id = r.job_id JOIN shops s ON s.id = j.shop_id WHERE s.slug = 'copper-gulch' AND j.number = 5 ORDER BY r.id LIMIT 1",
  );
  // J-0005's owner and machine, for the customer and machine pages (issue 16 §4).
  const [owners] = await db.query<mysql.RowDataPacket[]>(
    "SELECT j.customer_id, j.machine_id FROM jobs j JOIN shops s ON s.id = j.shop_id WHERE s.slug = 'copper-gulch' AND j.number = 5",
  );
  demoCustomer = Number(owners[0]!.customer_id);
  demoMachine = Number(owners[0]!.machine_id);
  await db.end();
  customerJobPath = `/my/jobs/${rows[0]!.public_id}`;
  demoRequest = String(requests[0]!.public_id);
  demoFinding = Number(requests[0]!.finding_id);
  loaded = true;
}

const all = (outcome: Outcome) => Object.fromEntries(VISITORS.map((v) => [v, outcome])) as Record<Visitor, Outcome>;
const signedIn = (outcome: Outcome) => ({ ...all(outcome), anonymous: "sign-in" as const });

/** Only the shop's own staff get in; every other signed-in visitor is refused (a deactivated technician too). */
const STAFF_OF_THE_SHOP: Record<Visitor, Outcome> = { ...signedIn("403"), owner: "in", writer: "in", technician: "in" };
/** J-0005 through the owner's area: anyone who may see the job (staff, its customer, its follower); to anyone else it doesn't exist. */
const READS_THE_JOB: Record<Visitor, Outcome> = { ...signedIn("404"), owner: "in", writer: "in", technician: "in", jobCustomer: "in", follower: "in" };
/** Its approval request: the same, but a follower never sees prices or decisions. */
const READS_THE_REQUEST: Record<Visitor, Outcome> = { ...READS_THE_JOB, follower: "404" };
const EVERYONE_IN = all("in");

export type PageTarget = { name: string; path: () => string; expect: Record<Visitor, Outcome> };

/** Every page; its path() may be called once loadPageIds() has run (in a beforeAll). */
export const TARGETS: PageTarget[] = [
  { name: "shop job board", path: () => "/shop/copper-gulch", expect: STAFF_OF_THE_SHOP },
  { name: "shop job page", path: () => "/shop/copper-gulch/jobs/5", expect: STAFF_OF_THE_SHOP },
  { name: "check-in page", path: () => "/shop/copper-gulch/jobs/new", expect: STAFF_OF_THE_SHOP },
  { name: "bench tools page", path: () => "/shop/copper-gulch/jobs/5/bench", expect: STAFF_OF_THE_SHOP },
  { name: "shop spec library page", path: () => "/shop/copper-gulch/specs", expect: STAFF_OF_THE_SHOP },
  // Parts on order across the shop (issue 19): every member of the shop's staff.
  { name: "parts on order page", path: () => "/shop/copper-gulch/parts", expect: STAFF_OF_THE_SHOP },
  // Customers and machines (issue 16 §4): every member of the shop's staff reads them.
  { name: "customer list page", path: () => "/shop/copper-gulch/customers", expect: STAFF_OF_THE_SHOP },
  { name: "customer page", path: () => `/shop/copper-gulch/customers/${demoCustomer}`, expect: STAFF_OF_THE_SHOP },
  { name: "machine history page", path: () => `/shop/copper-gulch/machines/${demoMachine}`, expect: STAFF_OF_THE_SHOP },
  // Shop settings (issue 16 §2): the shop owner only.
  { name: "shop settings page", path: () => "/shop/copper-gulch/settings", expect: { ...STAFF_OF_THE_SHOP, writer: "403", technician: "403" } },
  // The desk inbox and each person's e-mail settings for it: everyone on the shop's staff.
  { name: "shop inbox page", path: () => "/shop/copper-gulch/inbox", expect: STAFF_OF_THE_SHOP },
  { name: "inbox e-mail settings page", path: () => "/shop/copper-gulch/inbox/settings", expect: STAFF_OF_THE_SHOP },
  // Failed mail of the shop: the desk (owner, service writer) only.
  { name: "shop outbox page", path: () => "/shop/copper-gulch/outbox", expect: { ...STAFF_OF_THE_SHOP, technician: "403" } },
  // One job's sent log: the same people as the failed-mail page.
  { name: "job mail log page", path: () => "/shop/copper-gulch/jobs/5/mail", expect: { ...STAFF_OF_THE_SHOP, technician: "403" } },
  { name: "draft a finding page", path: () => "/shop/copper-gulch/jobs/5/findings/new", expect: STAFF_OF_THE_SHOP },
  { name: "finding page", path: () => `/shop/copper-gulch/jobs/5/findings/${demoFinding}`, expect: STAFF_OF_THE_SHOP },
  { name: "owner's approval request page", path: () => `${customerJobPath}/approvals/${demoRequest}`, expect: READS_THE_REQUEST },
  // Staff land on the finding's page, the machine's owner on the answer page.
  { name: "approval link from the timeline", path: () => `/my/approvals/${demoRequest}`, expect: READS_THE_REQUEST },
  { name: "owner's job page", path: () => customerJobPath, expect: READS_THE_JOB },
  // The drop-off authorisation (issue 16 §5): money, so like the owner's invoice page.
  { name: "owner's drop-off authorisation page", path: () => `${customerJobPath}/authorisation`, expect: { ...READS_THE_JOB, technician: "403", follower: "404" } },
  // Invoices (issue 9): the desk and the shop owner; the job's customer on their own page; technicians see no money.
  { name: "staff invoice page", path: () => "/shop/copper-gulch/jobs/5/invoice", expect: { ...STAFF_OF_THE_SHOP, technician: "403" } },
  // Staff without money rights are told no; anyone else isn't told the money exists.
  { name: "owner's invoice page", path: () => `${customerJobPath}/invoice`, expect: { ...READS_THE_JOB, technician: "403", follower: "404" } },
  // Any staff member, of any shop; a deactivated membership counts for nothing.
  { name: "staff home", path: () => "/shop", expect: { ...signedIn("403"), owner: "in", writer: "in", technician: "in", otherShopOwner: "in", otherShopWriter: "in", otherShopTechnician: "in" } },
  // Public portfolio (issue 8): the desk curates, the shop owner edits the profile, only the
  // machine's owner answers; the public pages and files are for everyone.
  { name: "shop portfolio page", path: () => "/shop/copper-gulch/portfolio", expect: { ...STAFF_OF_THE_SHOP, technician: "403" } },
  { name: "shop profile editor", path: () => "/shop/copper-gulch/portfolio/profile", expect: { ...STAFF_OF_THE_SHOP, writer: "403", technician: "403" } },
  // Those who may see the job but not answer for it are refused; to anyone else it doesn't exist.
  { name: "owner's portfolio consent page", path: () => `${customerJobPath}/portfolio`, expect: { ...READS_THE_JOB, owner: "403", writer: "403", technician: "403", follower: "403" } },
  // The owner's e-mail-or-texts page (issue 21): the machine's owner only, as the consent page.
  { name: "owner's texts page", path: () => `${customerJobPath}/texts`, expect: { ...READS_THE_JOB, owner: "403", writer: "403", technician: "403", follower: "403" } },
  // Staff accounts (issue 16 §3): the staff page is the shop owner's; "Your account" is every staff member's own;
  // the invitation and password pages are public (without a token they say the link isn't valid).
  { name: "shop staff page", path: () => "/shop/copper-gulch/staff", expect: { ...STAFF_OF_THE_SHOP, writer: "403", technician: "403" } },
  { name: "your account page", path: () => "/shop/copper-gulch/account", expect: STAFF_OF_THE_SHOP },
  { name: "join a shop page", path: () => "/join", expect: EVERYONE_IN },
  { name: "forgot password page", path: () => "/sign-in/forgot", expect: EVERYONE_IN },
  { name: "choose a new password page", path: () => "/sign-in/reset", expect: EVERYONE_IN },
  // A new shop (issue 16 §1): the sign-up pages are public (without a token, confirm says the link isn't valid).
  { name: "start your shop page", path: () => "/start", expect: EVERYONE_IN },
  { name: "start: check your e-mail page", path: () => "/start/check-email", expect: EVERYONE_IN },
  { name: "start: confirm page", path: () => "/start/confirm", expect: EVERYONE_IN },
  // A text's short sign-in link (issue 21): public; a token that isn't one says so and offers sign-in.
  { name: "text link page", path: () => `/t/${"A".repeat(43)}`, expect: EVERYONE_IN },
  { name: "shop's public page", path: () => "/s/copper-gulch", expect: EVERYONE_IN },
  { name: "sitemap", path: () => "/sitemap.xml", expect: EVERYONE_IN },
  { name: "robots.txt", path: () => "/robots.txt", expect: EVERYONE_IN },
];
