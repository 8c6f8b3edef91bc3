import { describe, expect, it } from "vitest";
import { ACTIONS, type Action, type Actor, ROLES, type Role, can, roleAllows, rolesFor } from "@/lib/permissions";

// Product policy from the brief (DESIGN.md §1 "who uses it"), written out a second time
// by hand so a change to lib/permissions.ts has to be made on purpose in both places.
// No published source: this is our own access rule.
const EXPECTED: Record<Action, Record<Exclude<Role, "follower">, boolean>> = {
  "shop:view-board": { owner: true, service_writer: true, technician: true, customer: false },
  "shop:manage-settings": { owner: true, service_writer: false, technician: false, customer: false },
  "shop:manage-staff": { owner: true, service_writer: false, technician: false, customer: false },
  "job:view": { owner: true, service_writer: true, technician: true, customer: true },
  "job:follow-manage": { owner: false, service_writer: false, technician: false, customer: true },
  "job:follow": { owner: false, service_writer: false, technician: false, customer: true },
  "job:view-followers": { owner: true, service_writer: true, technician: true, customer: true },
  "outbox:manage": { owner: true, service_writer: true, technician: false, customer: false },
  "job:view-history": { owner: true, service_writer: true, technician: true, customer: false },
  "job:check-in": { owner: true, service_writer: true, technician: true, customer: false },
  "job:change-status": { owner: true, service_writer: true, technician: true, customer: false },
  "job:assign": { owner: true, service_writer: true, technician: false, customer: false },
  "journal:view-shop-only": { owner: true, service_writer: true, technician: true, customer: false },
  "journal:post": { owner: true, service_writer: true, technician: true, customer: false },
  "journal:moderate": { owner: true, service_writer: false, technician: false, customer: false },
  "bench:record": { owner: true, service_writer: true, technician: true, customer: false },
  "parts:manage": { owner: true, service_writer: true, technician: true, customer: false },
  "specs:manage": { owner: true, service_writer: true, technician: false, customer: false },
  "approvals:draft": { owner: true, service_writer: true, technician: true, customer: false },
  "approvals:send": { owner: true, service_writer: true, technician: false, customer: false },
  "approvals:record-decision": { owner: true, service_writer: true, technician: false, customer: false },
  "approvals:answer": { owner: false, service_writer: false, technician: false, customer: true },
  "invoice:view": { owner: true, service_writer: true, technician: false, customer: true },
  "invoice:create": { owner: true, service_writer: true, technician: false, customer: false },
  "invoice:record-payment": { owner: true, service_writer: true, technician: false, customer: false },
  "invoice:refund": { owner: true, service_writer: false, technician: false, customer: false },
  "invoice:pay": { owner: false, service_writer: false, technician: false, customer: true },
  "customer:view": { owner: true, service_writer: true, technician: true, customer: false },
  "customer:edit": { owner: true, service_writer: true, technician: false, customer: false },
  "portfolio:propose": { owner: true, service_writer: true, technician: false, customer: false },
  "portfolio:curate": { owner: true, service_writer: true, technician: false, customer: false },
  "portfolio:publish": { owner: true, service_writer: false, technician: false, customer: false },
  "portfolio:consent": { owner: false, service_writer: false, technician: false, customer: true },
};
// A follower (DESIGN.md §1) watches progress: no prices, no decisions, nothing else.
const FOLLOWER_MAY: Action[] = ["job:view", "job:follow"];
const expected = (action: Action, role: Role) => (role === "follower" ? FOLLOWER_MAY.includes(action) : EXPECTED[action][role]);

describe("permission table", () => {
  it("lists exactly the actions this test knows", () => {
    expect([...ACTIONS].sort()).toEqual(Object.keys(EXPECTED).sort());
  });

  for (const action of Object.keys(EXPECTED) as Action[]) {
    for (const role of ROLES) {
      it(`${role} ${expected(action, role) ? "may" : "may not"} ${action}`, () => {
        expect(roleAllows(role, action)).toBe(expected(action, role));
      });
    }
  }
});

describe("can() scopes roles to the resource", () => {
  const shopA = 1;
  const shopB = 2;
  const technicianOfA: Actor = {
    userId: 10,
    email: "t@a.test",
    name: "T",
    memberships: [{ shopId: shopA, shopSlug: "a", shopName: "A", role: "technician" }],
  };
  const customer: Actor = { userId: 20, email: "c@x.test", name: "C", memberships: [] };
  const ownerOfBAndCustomerOfA: Actor = {
    userId: 30,
    email: "o@b.test",
    name: "O",
    memberships: [{ shopId: shopB, shopSlug: "b", shopName: "B", role: "owner" }],
  };

  it("staff act only inside their own shop", () => {
    expect(can(technicianOfA, "shop:view-board", { shopId: shopA })).toBe(true);
    expect(can(technicianOfA, "shop:view-board", { shopId: shopB })).toBe(false);
    expect(can(technicianOfA, "job:view", { shopId: shopB, customerUserId: 99 })).toBe(false);
  });

  it("a customer sees only jobs whose customer record is theirs", () => {
    expect(can(customer, "job:view", { shopId: shopA, customerUserId: 20 })).toBe(true);
    expect(can(customer, "job:view", { shopId: shopA, customerUserId: 21 })).toBe(false);
    expect(can(customer, "job:view", { shopId: shopA, customerUserId: null })).toBe(false);
    expect(can(customer, "job:view-history", { shopId: shopA, customerUserId: 20 })).toBe(false);
    expect(can(customer, "shop:view-board", { shopId: shopA })).toBe(false);
  });

  it("one person can be staff in one shop and a customer in another", () => {
    expect(rolesFor(ownerOfBAndCustomerOfA, { shopId: shopA, customerUserId: 30 })).toEqual(["customer"]);
    expect(rolesFor(ownerOfBAndCustomerOfA, { shopId: shopB })).toEqual(["owner"]);
    expect(can(ownerOfBAndCustomerOfA, "job:assign", { shopId: shopA, customerUserId: 30 })).toBe(false);
    expect(can(ownerOfBAndCustomerOfA, "job:assign", { shopId: shopB })).toBe(true);
  });

  it("a follower sees only the jobs they were invited to, and never as staff or owner", () => {
    const job = { shopId: shopA, customerUserId: 21, followerUserIds: [20] };
    expect(rolesFor(customer, job)).toEqual(["follower"]);
    expect(can(customer, "job:view", job)).toBe(true);
    expect(can(customer, "job:view", { ...job, followerUserIds: [22] })).toBe(false);
    expect(can(customer, "job:follow-manage", job)).toBe(false);
    expect(can(customer, "approvals:answer", job)).toBe(false);
    expect(can(customer, "journal:view-shop-only", job)).toBe(false);
  });

  it("nobody signed in may do anything", () => {
    for (const action of ACTIONS) expect(can(null, action, { shopId: shopA, customerUserId: 1 })).toBe(false);
  });
});
