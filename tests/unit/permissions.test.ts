import { describe, expect, it } from "vitest";
import { ACTIONS, type Action, type Actor, PERMISSIONS, ROLES, type Resource, type Role, STAFF_ROLES, can, roleAllows, rolesFor } from "@/lib/permissions";

// Properties the permission table must keep whatever rows are added or changed, and how
// can() / rolesFor() turn a person and a resource into roles. The table itself is not copied
// here: each rule below is stated once, with the reason it matters.
// product rule (lib/permissions.ts), no published source

const holders = (action: Action): readonly Role[] => PERMISSIONS[action];
const rightsOf = (role: Role): Action[] => ACTIONS.filter((action) => roleAllows(role, action));
const area = (action: Action) => action.split(":")[0]!;
const verb = (action: Action) => action.split(":")[1]!;

describe("the permission table", () => {
  it("gives every action at least one role, only known roles, each once", () => {
    for (const action of ACTIONS) {
      expect(holders(action).length, action).toBeGreaterThan(0);
      for (const role of holders(action)) expect(ROLES, `${action}: ${role}`).toContain(role);
      expect(new Set(holders(action)).size, action).toBe(holders(action).length);
    }
  });

  it("gives every role something, and the job itself to everyone who holds any right on it", () => {
    // The resolvers check job:view before anything else, so a right without it could never be used.
    for (const role of ROLES) {
      expect(rightsOf(role).length, role).toBeGreaterThan(0);
      expect(roleAllows(role, "job:view"), role).toBe(true);
    }
  });

  it("lets followers only view and follow: no money, no decisions, no writing", () => {
    expect(rightsOf("follower").length).toBeGreaterThan(0);
    for (const action of rightsOf("follower")) {
      expect(["view", "follow"], action).toContain(verb(action));
      expect(["money", "invoice", "approvals"], action).not.toContain(area(action));
    }
  });

  it("shows technicians no money: no money:view and no invoice right at all", () => {
    expect(roleAllows("technician", "money:view")).toBe(false);
    for (const action of ACTIONS.filter((a) => area(a) === "invoice")) expect(roleAllows("technician", action), action).toBe(false);
  });

  it("lets nobody see invoices without seeing money, or money without invoices", () => {
    for (const role of ROLES) expect(roleAllows(role, "money:view"), role).toBe(roleAllows(role, "invoice:view"));
  });

  it("never gives customers or followers shop-wide rights (shop, customer records, outbox) or the shop's private notes", () => {
    const shopWide = ACTIONS.filter((a) => ["shop", "customer", "outbox"].includes(area(a)));
    expect(shopWide.length).toBeGreaterThan(0);
    for (const role of ["customer", "follower"] as const) {
      for (const action of [...shopWide, "journal:view-shop-only", "job:view-history"] as Action[]) expect(roleAllows(role, action), `${role} ${action}`).toBe(false);
    }
  });

  it("leaves the machine owner's own answers to the machine owner: no staff role answers, pays, consents or picks followers", () => {
    // The desk notes an answer given by phone with approvals:record-decision, as itself.
    for (const action of ["approvals:answer", "invoice:pay", "portfolio:consent", "job:follow-manage"] as const) {
      expect(holders(action), action).toContain("customer");
      for (const role of STAFF_ROLES) expect(roleAllows(role, action), `${role} ${action}`).toBe(false);
    }
  });

  it("ranks the shop's roles: the shop owner may do all the desk may, the desk all the bench may", () => {
    for (const action of rightsOf("service_writer")) expect(roleAllows("owner", action), action).toBe(true);
    for (const action of rightsOf("technician")) expect(roleAllows("service_writer", action), action).toBe(true);
  });

  it("keeps refunds and publishing to the shop owner alone", () => {
    for (const action of ["invoice:refund", "portfolio:publish"] as const) expect(holders(action), action).toEqual(["owner"]);
  });
});

describe("can() and rolesFor() scope each role to the resource", () => {
  const SHOP_A = 1;
  const SHOP_B = 2;
  const person = (userId: number, memberships: Actor["memberships"] = []): Actor => ({ userId, email: `p${userId}@mail.test`, name: `P${userId}`, memberships });
  const member = (shopId: number, role: (typeof STAFF_ROLES)[number]) => ({ shopId, shopSlug: `s${shopId}`, shopName: `S${shopId}`, role });
  /** Some job of shop A, whose customer record is linked to user 50 and which user 60 follows. */
  const jobOfA: Resource = { shopId: SHOP_A, customerUserId: 50, followerUserIds: [60] };

  it("staff act with their role inside their own shop and with nothing in another", () => {
    for (const role of STAFF_ROLES) {
      const staff = person(10, [member(SHOP_A, role)]);
      expect(rolesFor(staff, jobOfA)).toEqual([role]);
      expect(rolesFor(staff, { shopId: SHOP_B, customerUserId: 50 })).toEqual([]);
      for (const action of ACTIONS) {
        expect(can(staff, action, jobOfA), `${role} of A: ${action} in A`).toBe(roleAllows(role, action));
        expect(can(staff, action, { shopId: SHOP_B }), `${role} of A: ${action} in B`).toBe(false);
      }
    }
  });

  it("someone on staff in two shops has each shop's role only in that shop", () => {
    const both = person(11, [member(SHOP_A, "technician"), member(SHOP_B, "owner")]);
    expect(rolesFor(both, { shopId: SHOP_A })).toEqual(["technician"]);
    expect(rolesFor(both, { shopId: SHOP_B })).toEqual(["owner"]);
    for (const action of ACTIONS) expect(can(both, action, { shopId: SHOP_A }), action).toBe(roleAllows("technician", action));
  });

  it("the customer role comes only from the job's linked user", () => {
    const owner = person(50);
    expect(rolesFor(owner, jobOfA)).toEqual(["customer"]);
    for (const action of ACTIONS) {
      expect(can(owner, action, jobOfA), action).toBe(roleAllows("customer", action));
      expect(can(owner, action, { ...jobOfA, customerUserId: 51 }), `${action} on someone else's job`).toBe(false);
      expect(can(owner, action, { ...jobOfA, customerUserId: null }), `${action} on a job with no linked user`).toBe(false);
      expect(can(owner, action, { shopId: SHOP_A }), `${action} on the shop`).toBe(false);
    }
  });

  it("the follower role comes only from being listed on the job", () => {
    const follower = person(60);
    expect(rolesFor(follower, jobOfA)).toEqual(["follower"]);
    for (const action of ACTIONS) {
      expect(can(follower, action, jobOfA), action).toBe(roleAllows("follower", action));
      expect(can(follower, action, { ...jobOfA, followerUserIds: [61] }), `${action}, not listed`).toBe(false);
      expect(can(follower, action, { ...jobOfA, followerUserIds: null }), `${action}, followers not looked up`).toBe(false);
    }
  });

  it("roles from different sources add up, and a right held by any of them is granted", () => {
    // On staff of shop B and the customer of a job in shop A.
    const ownerOfB = person(50, [member(SHOP_B, "owner")]);
    expect(rolesFor(ownerOfB, jobOfA)).toEqual(["customer"]);
    expect(rolesFor(ownerOfB, { shopId: SHOP_B })).toEqual(["owner"]);
    // A technician of shop A whose own machine is in for work there.
    const techAndOwner = person(50, [member(SHOP_A, "technician")]);
    expect(rolesFor(techAndOwner, jobOfA)).toEqual(["technician", "customer"]);
    for (const action of ACTIONS) expect(can(techAndOwner, action, jobOfA), action).toBe(roleAllows("technician", action) || roleAllows("customer", action));
  });

  it("nobody signed in may do anything", () => {
    for (const action of ACTIONS) expect(can(null, action, jobOfA), action).toBe(false);
  });
});
