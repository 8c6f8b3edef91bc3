// What the permission table (lib/permissions.ts) and the resolvers' 404-versus-403 rule
// (lib/server/access.ts, its opening comment) say each persona gets from each declaration,
// worked out here from the table itself: the roles a persona holds toward the fixture job
// and shop, then the rule. Nothing in here looks at an answer.
import { type Action, type MediaFacts, type MediaViewer, PERMISSIONS, type Role, type StaffRole, mayViewMedia } from "../../../lib/permissions";
import type { Persona } from "../personas";

export type PersonaName = "anonymous" | Persona;
/** "allowed": the wrapper let the request through to the handler, whatever the handler then said. */
export type Outcome = "allowed" | "401" | "403" | "404";

type Facts = {
  signedIn: boolean;
  /** Active role on the staff of the fixture's shop (Copper Gulch). */
  staff: StaffRole | null;
  /** The fixture job's customer (its machine's owner). */
  customer: boolean;
  /** Invited to follow the fixture job. */
  follower: boolean;
};

const none = { signedIn: true, staff: null, customer: false, follower: false } as const;

/** Who each persona is toward the fixture job (tests/e2e/access/fixture.ts) and its shop. */
export const PERSONAS: Record<PersonaName, Facts> = {
  anonymous: { ...none, signedIn: false },
  owner: { ...none, staff: "owner" },
  writer: { ...none, staff: "service_writer" },
  technician: { ...none, staff: "technician" },
  // Staff of another shop, and a technician whose membership here is deactivated: nothing here.
  otherShopOwner: none,
  otherShopWriter: none,
  otherShopTechnician: none,
  deactivatedTechnician: none,
  jobCustomer: { ...none, customer: true },
  otherCustomer: none,
  follower: { ...none, follower: true },
};

export const PERSONA_NAMES = Object.keys(PERSONAS) as PersonaName[];

/** What one call acts on: the declaration's resource and permission, and facts of the media it names. */
export type Target = { resource: string | null; permission: string; media?: MediaFacts; invoiceIsDraft?: boolean };

function rolesOf(p: Facts): Role[] {
  return [...(p.staff ? [p.staff] : []), ...(p.customer ? (["customer"] as const) : []), ...(p.follower ? (["follower"] as const) : [])];
}

export function expectedOutcome(persona: PersonaName, target: Target): Outcome {
  const p = PERSONAS[persona];
  if (target.permission === "public") return "allowed";
  if (!p.signedIn) return "401";
  if (target.permission === "signed-in") return "allowed";
  if (!(target.permission in PERMISSIONS)) throw new Error(`"${target.permission}" is not in PERMISSIONS`);
  const roles = rolesOf(p);
  const may = (action: Action) => roles.some((role) => (PERMISSIONS[action] as readonly Role[]).includes(role));
  const permitted: Outcome = may(target.permission as Action) ? "allowed" : "403";
  // audienceFor(): the shop's timeline, the owner's, or a follower's.
  const audience: MediaViewer = may("journal:view-shop-only") ? "shop" : p.customer ? "owner" : "follower";
  const staffHere = p.staff !== null;
  // A shop's existence is public: anyone not on its staff is refused, not told it doesn't exist.
  // A customer or machine is found through its shop (lib/server/access.ts): the shop refuses first.
  if (target.resource === "shop" || target.resource === "story" || target.resource === "customer" || target.resource === "machine") return staffHere ? permitted : "403";
  if (target.resource === "shopJob" && !staffHere) return "403";
  // Someone else's job is answered like one that doesn't exist.
  if (!may("job:view")) return "404";
  switch (target.resource) {
    case "job":
    case "shopJob":
      return permitted;
    case "request":
      // Prices and decisions are between the shop and the machine's owner.
      return audience === "follower" ? "404" : permitted;
    case "jobMoney":
    case "invoice":
    case "deposit":
      // Staff without money rights are told no; anyone else isn't told the money exists.
      if (!may("invoice:view")) return audience === "shop" ? "403" : "404";
      if (target.resource === "invoice" && target.invoiceIsDraft && audience !== "shop") return "404";
      return permitted;
    case "photo":
    case "clip":
      if (!target.media) throw new Error(`a ${target.resource} target needs its media facts`);
      return mayViewMedia(audience, target.media) ? permitted : "404";
    default:
      throw new Error(`The access test doesn't know the resolver "${target.resource}": add its rule to tests/e2e/access/expected.ts`);
  }
}

/**
 * Declared "public" but checked inside the handler, with the reason. The test expects what the
 * inside check says (it calls these without the token that makes them public).
 */
export const CHECKED_INSIDE: Record<string, { resource: string; permission: string; why: string }> = {
  "GET /api/approvals/[request]/evidence/[photo]/[size]": {
    resource: "request",
    permission: "job:view",
    why: "public for the request e-mail's token (?t=); without one, evidencePhoto applies the request resolver with job:view",
  },
};
