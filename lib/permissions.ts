// Who may do what: the one table every route handler, server action and page load
// checks through `can()`, via the resolvers of lib/server/access.ts. Pure, no I/O.

export const STAFF_ROLES = ["owner", "service_writer", "technician"] as const;
export type StaffRole = (typeof STAFF_ROLES)[number];
/**
 * "customer" is the machine's owner on their own jobs; "follower" is someone they invited to
 * follow one job. Neither is ever stored as a membership: both come from the resource.
 */
export type Role = StaffRole | "customer" | "follower";
export const ROLES: readonly Role[] = [...STAFF_ROLES, "customer", "follower"];

export const ROLE_LABEL: Record<Role, string> = {
  owner: "Shop owner",
  service_writer: "Service writer",
  technician: "Technician",
  customer: "Machine owner",
  follower: "Follower",
};

export const PERMISSIONS = {
  "shop:view-board": ["owner", "service_writer", "technician"],
  "shop:manage-settings": ["owner"],
  "shop:manage-staff": ["owner"],
  "job:view": ["owner", "service_writer", "technician", "customer", "follower"],
  // Following: the owner invites and removes followers; each subscriber sets their own e-mail.
  "job:follow-manage": ["customer"],
  "job:follow": ["customer", "follower"],
  "job:view-followers": ["owner", "service_writer", "technician", "customer"],
  // Mail that failed to send: the desk looks at it and sends it again.
  "outbox:manage": ["owner", "service_writer"],
  "job:view-history": ["owner", "service_writer", "technician"],
  "job:check-in": ["owner", "service_writer", "technician"],
  "job:change-status": ["owner", "service_writer", "technician"],
  "job:assign": ["owner", "service_writer"],
  "journal:view-shop-only": ["owner", "service_writer", "technician"],
  "journal:post": ["owner", "service_writer", "technician"],
  // Edit, share or delete someone else's entry (authors always may change their own).
  "journal:moderate": ["owner"],
  // Bench tools: torque records, readings, teardown log and reassembly ticks.
  "bench:record": ["owner", "service_writer", "technician"],
  // In a small shop whoever takes the delivery marks the part in, so every staff role may.
  "parts:manage": ["owner", "service_writer", "technician"],
  // The shop's spec library: everyone on staff reads it; the desk keeps it.
  "specs:manage": ["owner", "service_writer"],
  // Approval requests: the bench drafts findings; the desk prices, sends, withdraws and notes
  // answers given by phone or in person; only the machine's owner answers online.
  "approvals:draft": ["owner", "service_writer", "technician"],
  "approvals:send": ["owner", "service_writer"],
  "approvals:record-decision": ["owner", "service_writer"],
  "approvals:answer": ["customer"],
  // The authorisation signed at drop-off: the desk writes any terms (approvals:send); anyone at the
  // counter, a technician checking a machine in included, may put the shop's standard terms in
  // front of the owner and witness the typed signature (the owner reads the amounts on screen).
  "dropoff:standard": ["owner", "service_writer", "technician"],
  // Invoices and payments: the desk invoices authorised work, asks for deposits and records
  // counter payments; technicians see no money; only the shop owner refunds; the machine's owner pays.
  "invoice:view": ["owner", "service_writer", "customer"],
  // Prices, estimates, authorised and invoiced amounts in any response: the same people as
  // invoices. Technicians see what was approved, not what it costs; followers never see money.
  "money:view": ["owner", "service_writer", "customer"],
  "invoice:create": ["owner", "service_writer"],
  "invoice:record-payment": ["owner", "service_writer"],
  "invoice:refund": ["owner"],
  "invoice:pay": ["customer"],
  // The shop's customers and machines: every staff role reads them; whoever may check a machine in
  // (and so types an owner's contact details) may correct them; the desk merges duplicates.
  "customer:view": ["owner", "service_writer", "technician"],
  "customer:edit": ["owner", "service_writer", "technician"],
  "customer:merge": ["owner", "service_writer"],
  // Public portfolio: the desk proposes collected jobs and curates stories; only the shop owner
  // publishes; only the machine's owner consents (or refuses, or withdraws).
  "portfolio:propose": ["owner", "service_writer"],
  "portfolio:curate": ["owner", "service_writer"],
  "portfolio:publish": ["owner"],
  "portfolio:consent": ["customer"],
  // Questions on a job (issue 21): the machine's owner asks (followers don't: a question may be
  // about prices); the desk answers; the thread shows to every staff role and the owner.
  "questions:ask": ["customer"],
  "questions:answer": ["owner", "service_writer"],
  // The owner's own choice of e-mail or text, and their consent to texts (issue 21).
  "texts:choose": ["customer"],
} as const satisfies Record<string, readonly Role[]>;

export type Action = keyof typeof PERMISSIONS;
export const ACTIONS = Object.keys(PERMISSIONS) as Action[];

export type Actor = {
  userId: number;
  email: string;
  name: string;
  memberships: { shopId: number; shopSlug: string; shopName: string; role: StaffRole }[];
};

/** What is being acted on: always the shop it lives in; for a job, the signed-in user linked to its customer. */
export type Resource = { shopId: number; customerUserId?: number | null; followerUserIds?: readonly number[] | null };

export function roleAllows(role: Role, action: Action): boolean {
  return (PERMISSIONS[action] as readonly Role[]).includes(role);
}

/** The roles this actor holds towards this resource (staff of its shop, and/or its customer). */
export function rolesFor(actor: Actor, resource: Resource): Role[] {
  const roles: Role[] = actor.memberships.filter((m) => m.shopId === resource.shopId).map((m) => m.role);
  if (resource.customerUserId != null && resource.customerUserId === actor.userId) roles.push("customer");
  if (resource.followerUserIds?.includes(actor.userId)) roles.push("follower");
  return roles;
}

export function can(actor: Actor | null, action: Action, resource: Resource): boolean {
  if (!actor) return false;
  return rolesFor(actor, resource).some((role) => roleAllows(role, action));
}

export function isStaff(actor: Actor | null): boolean {
  return !!actor && actor.memberships.length > 0;
}

/** Who is looking at a photo or clip: the shop, the job's owner, a follower, or the public (a published story). */
export type MediaViewer = "shop" | "owner" | "follower" | "public";

export type MediaFacts = {
  /** Its entry is shared with the owner and not deleted. */
  shared: boolean;
  /** Its entry is about money or a decision (followers never see those). */
  moneyEntry: boolean;
  /** Quoted as evidence in an approval request sent to the owner. */
  quotedInRequest: boolean;
  /** Shown by a story that is published right now (cover, item, or a set the story shows). */
  inPublishedStory: boolean;
};

/**
 * The one rule for photos and clips of a job: the shop sees all of them; the owner sees shared
 * ones and those quoted in a request put to them; a follower sees shared ones that aren't about
 * money; the public sees only what a published story shows.
 */
export function mayViewMedia(viewer: MediaViewer | null, media: MediaFacts): boolean {
  switch (viewer) {
    case "shop":
      return true;
    case "owner":
      return media.shared || media.quotedInRequest;
    case "follower":
      return media.shared && !media.moneyEntry;
    case "public":
      return media.inPublishedStory;
    default:
      return false;
  }
}
