import "server-only";
import { z } from "zod";
import { getRequestByPublicId } from "@/db/queries/approvals";
import { getClipAccess } from "@/db/queries/clips";
import { getCustomer } from "@/db/queries/customers";
import { followerUserIds } from "@/db/queries/following";
import { getInvoiceByPublicId } from "@/db/queries/invoices";
import { getJobById, type getJobByPublicId } from "@/db/queries/jobs";
import { getPhotoAccess } from "@/db/queries/journal";
import { getMachine } from "@/db/queries/machines";
import { getDepositByPublicId } from "@/db/queries/payments";
import { getStory } from "@/db/queries/portfolio";
import { INVOICE_PUBLIC_ID_PATTERN } from "@/lib/invoices";
import { JOB_PUBLIC_ID_PATTERN, PHOTO_ID_PATTERN, type TimelineAudience } from "@/lib/journal";
import { AppError } from "@/lib/errors";
import { type Action, type Actor, type MediaViewer, PERMISSIONS, type Resource, can, mayViewMedia, rolesFor } from "@/lib/permissions";
import { SHOP_SLUG_PATTERN, STORY_SLUG_PATTERN } from "@/lib/portfolio";
import { REQUEST_PUBLIC_ID_PATTERN } from "@/lib/schemas/approvals";
import { recordIdParam } from "@/lib/schemas/customers";
import { jobByNumber, jobByPublicId, shopBySlug } from "@/lib/server/request-cache";

// The one place that turns an id from a path or a form into a row and decides who may touch it.
// Route handlers and server actions name a resolver and a permission in their declaration
// (lib/route.ts, lib/action.ts); pages call `resolve` through lib/server/page-access.ts.
//
// The 404-versus-403 rule, once: an id that doesn't exist, and a resource this person has no
// part in (someone else's job, another shop's invoice, a request to a follower), answer the same
// 404, so ids can't be probed. Someone who may see the resource but not do this to it gets a 403.
// A shop is public knowledge (its portfolio), so a shop refuses with 403.

/** Ids as they appear in paths and forms: a malformed one is a 404 in a path, a 422 in a form. */
export const ids = {
  shop: z.string().regex(SHOP_SLUG_PATTERN, "No such shop."),
  story: z.string().max(80).regex(STORY_SLUG_PATTERN, "No such story."),
  job: z.string().regex(JOB_PUBLIC_ID_PATTERN, "No such job."),
  request: z.string().regex(REQUEST_PUBLIC_ID_PATTERN, "No such approval request."),
  invoice: z.string().regex(INVOICE_PUBLIC_ID_PATTERN, "No such invoice."),
  deposit: z.string().regex(INVOICE_PUBLIC_ID_PATTERN, "No such deposit."),
  media: z.string().regex(PHOTO_ID_PATTERN, "No such photo or clip."),
  /** A row number (entry, finding, step…): positive, at most 15 digits. */
  row: z.string().regex(/^[1-9]\d{0,14}$/, "No such item.").transform(Number),
  jobNumber: z.string().regex(/^[1-9]\d{0,8}$/, "No such job.").transform(Number),
  /** A customer or machine id (INT UNSIGNED): positive, at most 10 digits. */
  record: recordIdParam.transform(Number),
};

type Job = NonNullable<Awaited<ReturnType<typeof getJobByPublicId>>>;

/** The job as a permission resource. Followers are looked up only for someone who isn't staff or the owner. */
export async function jobResource(actor: Actor | null, job: { id: number; shopId: number; customerUserId: number | null }): Promise<Resource> {
  const base: Resource = { shopId: job.shopId, customerUserId: job.customerUserId };
  if (!actor || can(actor, "job:view", base)) return base;
  return { ...base, followerUserIds: await followerUserIds({ jobId: job.id }) };
}

/** Which timeline this person reads: the shop's, the owner's, or a follower's (no money, no decisions). */
export function audienceFor(actor: Actor, resource: Resource): TimelineAudience {
  if (can(actor, "journal:view-shop-only", resource)) return "shop";
  return rolesFor(actor, resource).includes("customer") ? "owner" : "follower";
}

const hidden = (what: string) => new AppError("not_found", `No such ${what}, or it isn't yours to see.`);
const refused = () => new AppError("forbidden", "You don't have access to this.");

export type JobAccess = {
  job: Job;
  resource: Resource;
  audience: TimelineAudience;
  mayModerate: boolean;
  /** Prices, estimates and amounts may be shown (the permission table's `money:view`). */
  mayViewMoney: boolean;
};

async function jobAccess(actor: Actor, job: Job | null): Promise<JobAccess> {
  const resource = job && (await jobResource(actor, job));
  if (!job || !resource || !can(actor, "job:view", resource)) throw hidden("job");
  return { job, resource, audience: audienceFor(actor, resource), mayModerate: can(actor, "journal:moderate", resource), mayViewMoney: can(actor, "money:view", resource) };
}

/** Money lives between the shop's desk and the machine's owner: staff without it are told no, others aren't told it exists. */
async function moneyAccess(actor: Actor, job: Job | null, what: string): Promise<JobAccess> {
  const access = await jobAccess(actor, job);
  if (!can(actor, "invoice:view", access.resource)) {
    if (access.audience === "shop") throw new AppError("forbidden", "Invoices and payments are for the service desk and the shop owner.");
    throw hidden(what);
  }
  return access;
}

/** A shop, for its own staff; anyone else is refused (a shop's existence is public). */
async function shopAccess(actor: Actor, slug: string) {
  // Read once per render: the staff layout and the page under it both come through here.
  const shop = SHOP_SLUG_PATTERN.test(slug) ? await shopBySlug(slug) : null;
  const membership = shop && actor.memberships.find((m) => m.shopId === shop.id);
  if (!shop || !membership) throw refused();
  const resource: Resource = { shopId: shop.id };
  return { shop, resource, role: membership.role };
}

type Resolver<T> = {
  /** The field of the path params (or, failing that, of the parsed form/body) that holds the id. */
  field: string;
  load: (actor: Actor, key: string, from: Record<string, unknown>) => Promise<T>;
};

const resolver = <T>(r: Resolver<T>) => r;

/**
 * Every kind of resource a handler or action can act on. Each `load` answers the row(s) and the
 * permission resource, or throws the 404/403 of the rule above; the permission itself is checked
 * by `resolve`.
 */
export const RESOLVERS = {
  shop: resolver({ field: "shop", load: (actor, slug) => shopAccess(actor, slug) }),
  job: resolver({
    field: "job",
    load: async (actor, publicId) => jobAccess(actor, JOB_PUBLIC_ID_PATTERN.test(publicId) ? await jobByPublicId(publicId) : null),
  }),
  /** A job found by its shop and number (the staff pages' addresses): staff of that shop only. */
  shopJob: resolver({
    field: "number",
    load: async (actor, number, from) => {
      const shop = await shopAccess(actor, String(from.shop ?? ""));
      const n = ids.jobNumber.safeParse(number);
      const job = n.success ? await jobByNumber(shop.shop.id, n.data) : null;
      if (!job) throw hidden("job");
      return { ...(await jobAccess(actor, { ...job, shopName: shop.shop.name, shopSlug: shop.shop.slug })), shop: shop.shop, role: shop.role };
    },
  }),
  /** A portfolio story of the shop named beside it (`shop` field), for that shop's staff. */
  story: resolver({
    field: "story",
    load: async (actor, storyId, from) => {
      const shop = await shopAccess(actor, String(from.shop ?? ""));
      const id = ids.row.safeParse(storyId).data;
      const story = id ? await getStory({ shopId: shop.shop.id, storyId: id }) : null;
      if (!story) throw hidden("story");
      return { ...shop, story };
    },
  }),
  /** A customer of the shop named beside it (`shop` field), for that shop's staff; another shop's id is a 404. */
  customer: resolver({
    field: "customer",
    load: async (actor, customerId, from) => {
      const shop = await shopAccess(actor, String(from.shop ?? ""));
      const id = ids.record.safeParse(customerId).data;
      const customer = id ? await getCustomer({ shopId: shop.shop.id, customerId: id }) : null;
      if (!customer) throw hidden("customer");
      return { ...shop, customer };
    },
  }),
  /** A machine of the shop named beside it (`shop` field), for that shop's staff; another shop's id is a 404. */
  machine: resolver({
    field: "machine",
    load: async (actor, machineId, from) => {
      const shop = await shopAccess(actor, String(from.shop ?? ""));
      const id = ids.record.safeParse(machineId).data;
      const machine = id ? await getMachine({ shopId: shop.shop.id, machineId: id }) : null;
      if (!machine) throw hidden("machine");
      return { ...shop, machine };
    },
  }),
  /** The job's money (invoice, deposits, payments). */
  jobMoney: resolver({
    field: "job",
    load: async (actor, publicId) => moneyAccess(actor, JOB_PUBLIC_ID_PATTERN.test(publicId) ? await jobByPublicId(publicId) : null, "invoice"),
  }),
  request: resolver({
    field: "request",
    load: async (actor, publicId) => {
      const request = REQUEST_PUBLIC_ID_PATTERN.test(publicId) ? await getRequestByPublicId({ publicId }) : null;
      if (!request) throw hidden("approval request");
      const access = await jobAccess(actor, await jobByPublicId(request.jobPublicId)).catch(() => {
        throw hidden("approval request");
      });
      // Prices and decisions are between the shop and the machine's owner: followers never see them.
      if (access.audience === "follower") throw hidden("approval request");
      return { ...access, request, audience: access.audience as "shop" | "owner" };
    },
  }),
  invoice: resolver({
    field: "invoice",
    load: async (actor, publicId) => {
      const invoice = INVOICE_PUBLIC_ID_PATTERN.test(publicId) ? await getInvoiceByPublicId({ publicId }) : null;
      if (!invoice) throw hidden("invoice");
      const access = await moneyAccess(actor, await getJobById({ id: invoice.jobId }), "invoice");
      // A draft is the desk's working copy: the owner sees an invoice once it is issued.
      if (invoice.status === "draft" && access.audience !== "shop") throw hidden("invoice");
      return { ...access, invoice };
    },
  }),
  deposit: resolver({
    field: "deposit",
    load: async (actor, publicId) => {
      const deposit = INVOICE_PUBLIC_ID_PATTERN.test(publicId) ? await getDepositByPublicId({ publicId }) : null;
      if (!deposit) throw hidden("deposit");
      return { ...(await moneyAccess(actor, await getJobById({ id: deposit.jobId }), "deposit")), deposit };
    },
  }),
  photo: resolver({
    field: "photo",
    load: async (actor, publicId) => {
      const photo = PHOTO_ID_PATTERN.test(publicId) ? await getPhotoAccess({ publicId }) : null;
      const seen = photo && (await mediaViewer(actor, photo));
      if (!photo || !seen || !mayViewMedia(seen.viewer, { ...photo, inPublishedStory: false })) throw hidden("photo");
      return { photo, resource: seen.resource };
    },
  }),
  clip: resolver({
    field: "clip",
    load: async (actor, publicId) => {
      const clip = PHOTO_ID_PATTERN.test(publicId) ? await getClipAccess({ publicId }) : null;
      const seen = clip && (await mediaViewer(actor, clip));
      if (!clip?.playbackId || !seen || !mayViewMedia(seen.viewer, { ...clip, inPublishedStory: false })) throw hidden("clip");
      return { clip: { ...clip, playbackId: clip.playbackId }, resource: seen.resource };
    },
  }),
} satisfies Record<string, Resolver<{ resource: Resource }>>;

async function mediaViewer(actor: Actor, media: { jobId: number; shopId: number; customerUserId: number | null }) {
  const resource = await jobResource(actor, { id: media.jobId, shopId: media.shopId, customerUserId: media.customerUserId });
  return can(actor, "job:view", resource) ? { viewer: audienceFor(actor, resource) as MediaViewer, resource } : null;
}

export type ResourceKind = keyof typeof RESOLVERS;
export type Resolved<K extends ResourceKind> = Awaited<ReturnType<(typeof RESOLVERS)[K]["load"]>>;

/**
 * Finds the resource named by `from[field]` and checks `permission` on it: the row(s), or the
 * 404/403 of the rule above.
 */
export async function resolve<K extends ResourceKind>(actor: Actor, kind: K, from: Record<string, unknown>, permission: Action): Promise<Resolved<K>> {
  const r = RESOLVERS[kind] as Resolver<Resolved<K>>;
  const raw = from[r.field];
  if (typeof raw !== "string" && typeof raw !== "number") throw hidden(kind === "shop" ? "shop" : "item");
  const found = await r.load(actor, String(raw), from);
  if (!can(actor, permission, found.resource)) throw refused();
  return found;
}

/** The same, for code that holds an id (a page, a test): `access(actor, "job", publicId, "journal:post")`. */
export function access<K extends ResourceKind>(actor: Actor, kind: K, key: string | number, permission: Action, extra: Record<string, unknown> = {}): Promise<Resolved<K>> {
  return resolve(actor, kind, { ...extra, [RESOLVERS[kind].field]: key }, permission);
}

/** What a handler or action declares it needs: a permission of the table, or anyone / anyone signed in. */
export type Permission = Action | "public" | "signed-in";

/**
 * Checked when a handler or action is defined (so a wrong one fails the build and every test):
 * a table permission needs a resolver to check it against, and "public" / "signed-in" have none.
 */
export function checkDeclaration(decl: { resource?: string; permission: Permission }): void {
  const special = decl.permission === "public" || decl.permission === "signed-in";
  if (!special && !(decl.permission in PERMISSIONS)) throw new Error(`Unknown permission "${decl.permission}".`);
  if (!special && !decl.resource) throw new Error(`Permission "${decl.permission}" needs a resource to check it on.`);
  if (special && decl.resource) throw new Error(`A "${decl.permission}" declaration takes no resource.`);
  if (decl.resource && !(decl.resource in RESOLVERS)) throw new Error(`Unknown resource "${decl.resource}".`);
}
