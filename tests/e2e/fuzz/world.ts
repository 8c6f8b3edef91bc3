// What the fuzz test aims at: every route handler method and every server action, read from the
// source (tests/support/declarations.ts, schema-fields.ts) and the build's action manifest; and
// the ids it fills in — real rows of the demo shop that a "stranger" persona has no part in, or
// ids in the right format that no row has (checked against every id in the database).
import type mysql from "mysql2/promise";
import { type ActionDeclaration, type DeclarationScan, type HandlerDeclaration, declarationId } from "../../support/declarations";
import { schemaFields } from "../../support/schema-fields";
import { type ActionRef, pagePath } from "../access/client";
import { STAFF } from "../personas";
import type { Rng } from "./values";

export type HandlerTarget = { kind: "handler"; id: string; decl: HandlerDeclaration; fields: string[]; queryFields: string[] };
export type ActionTarget = { kind: "action"; id: string; decl: ActionDeclaration; fields: string[]; actionId: string; page: string; resourceFields: string[] };
export type Target = HandlerTarget | ActionTarget;

/** Where each resolver of lib/server/access.ts reads its id(s) from a form (its `field`, and `shop` beside a story). */
const RESOLVER_FIELDS: Record<string, string[]> = {
  shop: ["shop"],
  job: ["job"],
  shopJob: ["shop", "number"],
  story: ["shop", "story"],
  jobMoney: ["job"],
  request: ["request"],
  invoice: ["invoice"],
  deposit: ["deposit"],
  photo: ["photo"],
  clip: ["clip"],
  customer: ["shop", "customer"],
  machine: ["shop", "machine"],
};

/** The kind of id a path param or form field holds, by its name. */
export type IdKind = "publicId" | "media" | "row" | "shop" | "storySlug" | "number" | "token" | "size" | "file";
export function idKind(name: string, where: "path" | "form"): IdKind | null {
  if (["job", "request", "invoice", "deposit"].includes(name)) return "publicId";
  if (name === "photo" || name === "clip") return "media";
  if (name === "shop") return "shop";
  if (name === "story") return where === "path" ? "storySlug" : "row";
  if (name === "number") return "number";
  if (["entry", "finding", "step", "part", "line", "payment", "spec", "id", "subscriber", "customerId", "machineId", "technicianId", "customer", "machine", "duplicate"].includes(name)) return "row";
  if (name === "token") return "token";
  if (name === "size") return "size";
  if (name === "file") return "file";
  return null;
}

export type World = {
  /** Real values of the demo shop, none of which the stranger persona has any part in. */
  real: Record<string, string[]>;
  /** Every public id and slug in the database: a made-up one is checked against these. */
  taken: Set<string>;
};

/** The persona with no role anywhere near the demo shop's rows (staff of the other shop). */
export const STRANGER = "otherShopOwner" as const;
export const DEMO_SHOP = "copper-gulch";

async function column(db: mysql.Connection, query: string, params: unknown[] = []): Promise<string[]> {
  const [rows] = await db.query<mysql.RowDataPacket[]>(query, params);
  return rows.map((r) => String(Object.values(r)[0]));
}

export async function loadWorld(db: mysql.Connection): Promise<World> {
  const [[shop]] = await db.query<mysql.RowDataPacket[]>("SELECT id FROM shops WHERE slug = ?", [DEMO_SHOP]);
  const [[stranger]] = await db.query<mysql.RowDataPacket[]>("SELECT id FROM users WHERE email = ?", [STAFF[STRANGER].email]);
  if (!shop || !stranger) throw new Error("fuzz: the demo shop or the stranger persona is missing from the seed");
  // Jobs of the demo shop the stranger is neither the owner of nor following, nor on the staff of.
  const [[member]] = await db.query<mysql.RowDataPacket[]>("SELECT COUNT(*) AS n FROM memberships WHERE shop_id = ? AND user_id = ?", [shop.id, stranger.id]);
  if (Number(member!.n) > 0) throw new Error("fuzz: the stranger persona is on the demo shop's staff");
  const jobs = `SELECT j.id FROM jobs j JOIN customers c ON c.id = j.customer_id WHERE j.shop_id = ${Number(shop.id)} AND (c.user_id IS NULL OR c.user_id <> ${Number(stranger.id)})
    AND j.id NOT IN (SELECT job_id FROM job_subscribers WHERE user_id = ${Number(stranger.id)} OR email = ${JSON.stringify(STAFF[STRANGER].email)})`;
  const of = (table: string, col: string) => column(db, `SELECT ${col} FROM ${table} WHERE job_id IN (${jobs}) ORDER BY id LIMIT 40`);
  const real: Record<string, string[]> = {
    job: await column(db, `SELECT public_id FROM jobs WHERE id IN (${jobs}) ORDER BY id LIMIT 40`),
    number: await column(db, `SELECT number FROM jobs WHERE id IN (${jobs}) ORDER BY id LIMIT 40`),
    request: await of("approval_requests", "public_id"),
    invoice: await of("invoices", "public_id"),
    deposit: await of("deposit_requests", "public_id"),
    photo: await of("photos", "public_id"),
    clip: await of("clips", "public_id"),
    entry: await of("journal_entries", "id"),
    finding: await of("findings", "id"),
    story: await of("stories", "id"),
    storySlug: await of("stories", "slug"),
    shop: [DEMO_SHOP],
    // The demo shop's customers (their page bundles the customer actions); a stranger is refused by the shop.
    customer: await column(db, `SELECT id FROM customers WHERE shop_id = ${Number(shop.id)} ORDER BY id LIMIT 40`),
  };
  const taken = new Set<string>();
  for (const [table, col] of [["jobs", "public_id"], ["approval_requests", "public_id"], ["invoices", "public_id"], ["deposit_requests", "public_id"], ["photos", "public_id"], ["clips", "public_id"], ["shops", "slug"], ["stories", "slug"]]) {
    for (const v of await column(db, `SELECT ${col} FROM ${table}`)) taken.add(v);
  }
  return { real, taken };
}

const LOWER = "abcdefghijklmnopqrstuvwxyz0123456789";

/** An id in the right format that no row has. */
export function madeUpId(rng: Rng, kind: IdKind, world: World): string {
  for (;;) {
    const v = {
      publicId: () => rng.string(16),
      media: () => rng.string(22),
      row: () => rng.pick([String(900_000_000 + rng.int(99_999_999)), "999999999999999", "2147483647", "4294967296"]),
      shop: () => `fuzz-nowhere-${rng.string(8, LOWER)}`,
      storySlug: () => `no-such-story-${rng.string(8, LOWER)}`,
      number: () => String(90_000_000 + rng.int(9_999_999)),
      token: () => rng.string(rng.pick([10, 43, 64, 120])),
      size: () => rng.pick(["thumb", "display"]),
      file: () => rng.pick(["video.mp4", "poster.jpg"]),
    }[kind]();
    if (!world.taken.has(v)) return v;
  }
}

/** A real value for a param or field of the demo shop, or null when there is none of that kind. */
export function realValue(rng: Rng, name: string, where: "path" | "form", world: World): string | null {
  const key = name === "story" && where === "path" ? "storySlug" : name;
  const values = world.real[key];
  if (values?.length) return rng.pick(values);
  const kind = idKind(name, where);
  return kind === "size" || kind === "file" || kind === "token" ? madeUpId(rng, kind, world) : null;
}

/** Every declaration as something to aim at; throws on what the test can't aim at (a new resolver, an action no page bundles). */
export function targetsOf(scan: DeclarationScan, manifest: Map<string, ActionRef>, world: World): Target[] {
  const targets: Target[] = [];
  for (const decl of scan.handlers) {
    targets.push({ kind: "handler", id: declarationId(decl), decl, fields: decl.body === "json" ? (schemaFields(decl) ?? []) : [], queryFields: decl.query ? (schemaFields(decl, "query") ?? []) : [] });
  }
  const pageValues: Record<string, string> = { shop: DEMO_SHOP, number: world.real.number![0]!, job: world.real.job![0]!, request: world.real.request?.[0] ?? "x", story: world.real.story?.[0] ?? "1", customer: world.real.customer?.[0] ?? "1", token: "fuzz" };
  for (const decl of scan.actions) {
    const ref = manifest.get(`${decl.file}#${decl.name}`);
    if (!ref) throw new Error(`fuzz: ${declarationId(decl)} is not in the build's server-reference manifest`);
    const page = ref.workers.map((w) => pagePath(w, pageValues)).find((p) => p !== null);
    if (!page) throw new Error(`fuzz: no page of ${declarationId(decl)} has an address the test can fill (${ref.workers.join(", ")})`);
    if (decl.resource && !RESOLVER_FIELDS[decl.resource]) throw new Error(`fuzz: unknown resolver "${decl.resource}": say in tests/e2e/fuzz/world.ts which fields it reads`);
    const fields = schemaFields(decl);
    if (!fields) throw new Error(`fuzz: can't read the input schema of ${declarationId(decl)}`);
    targets.push({ kind: "action", id: declarationId(decl), decl, fields, actionId: ref.id, page, resourceFields: decl.resource ? RESOLVER_FIELDS[decl.resource]! : [] });
  }
  return targets;
}
