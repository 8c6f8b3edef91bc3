import { afterAll, beforeAll, describe, expect, it } from "vitest";
import bcrypt from "bcryptjs";
import { DEMO_PASSWORDS, seedIfEmpty } from "@/db/seeds/demo";
import { ownerPartWaits } from "@/db/queries/part-orders";
import { getMarkupRule } from "@/db/queries/parts-pricing";
import { clearedPartsQuery } from "@/db/queries/workflow";
import { JOB_STATUSES } from "@/lib/job-status";
import { partWaitLines } from "@/lib/part-orders";
import { authorisedWork } from "@/lib/server/authorised-work";
import { sha256Hex } from "@/lib/server/approval-hash";
import { freshDatabase } from "../support/db";

describe("demo seed", () => {
  let fresh: Awaited<ReturnType<typeof freshDatabase>>;
  beforeAll(async () => {
    fresh = await freshDatabase();
    await fresh.knex.migrate.latest();
  });
  afterAll(async () => fresh?.drop());

  it("fills an empty database once, and leaves a used one alone", async () => {
    expect(await seedIfEmpty(fresh.knex)).toBe(true);
    const jobs = await fresh.knex("jobs").count({ n: "*" }).first();
    expect(await seedIfEmpty(fresh.knex)).toBe(false);
    expect(await fresh.knex("jobs").count({ n: "*" }).first()).toEqual(jobs);
  });

  it("has an owner, a service writer and a technician who can sign in with the README passwords", async () => {
    const members = fresh.knex("memberships as m").join("users as u", "u.id", "m.user_id").join("shops as s", "s.id", "m.shop_id").where("s.slug", "copper-gulch");
    const staff = await members.clone().whereNull("m.deactivated_at").select("m.role", "u.password_hash");
    expect(staff.map((s) => s.role).sort()).toEqual(["owner", "service_writer", "technician"]);
    // And a technician who has left: kept for the history, no longer on the staff.
    const former = await members.clone().whereNotNull("m.deactivated_at").select("m.role", "u.email");
    expect(former).toEqual([{ role: "technician", email: "rafe@coppergulch.test" }]);
    const byRole = Object.fromEntries(staff.map((s) => [s.role, s.password_hash]));
    expect(await bcrypt.compare(DEMO_PASSWORDS.owner, byRole.owner)).toBe(true);
    expect(await bcrypt.compare(DEMO_PASSWORDS.service_writer, byRole.service_writer)).toBe(true);
    expect(await bcrypt.compare(DEMO_PASSWORDS.technician, byRole.technician)).toBe(true);
  });

  it("has three customers with machines and jobs in at least five different states, each with its history", async () => {
    const shop = await fresh.knex("shops").where({ slug: "copper-gulch" }).first();
    expect(await fresh.knex("customers").where({ shop_id: shop!.id }).count({ n: "*" }).first()).toEqual({ n: 3 });
    const jobs = await fresh.knex("jobs").where({ shop_id: shop!.id }).select("id", "status", "number");
    expect(new Set(jobs.map((j) => j.status)).size).toBeGreaterThanOrEqual(5);
    for (const status of new Set(jobs.map((j) => j.status))) expect(JOB_STATUSES).toContain(status);
    expect(Number(shop!.next_job_number)).toBe(jobs.length + 1);
    for (const job of jobs) {
      const last = await fresh.knex("job_status_changes").where({ job_id: job.id }).orderBy("changed_at", "desc").orderBy("id", "desc").first();
      expect(last!.to_status).toBe(job.status);
      expect(new Date(last!.changed_at).getTime()).toBeLessThanOrEqual(Date.now());
    }
  });

  it("has J-0002's parts on one supplier order: one back-ordered with a new date, one with a core charge (issue 19)", async () => {
    const shop = (await fresh.knex("shops").where({ slug: "copper-gulch" }).first())!;
    const job = (await fresh.knex("jobs").where({ shop_id: shop.id, number: 2 }).first("id", "status"))!;
    const parts = await fresh.knex("job_parts").where({ job_id: job.id }).orderBy("id");
    expect(parts.map((p) => [p.description, p.status, p.core_charge_minor == null ? null : Number(p.core_charge_minor)])).toEqual([
      ["Cam chain", "ordered", null],
      ["Cam chain tensioner", "back_ordered", null],
      ["Starter motor, rebuilt exchange", "ordered", 3500],
    ]);
    expect(new Set(parts.map((p) => p.order_id)).size).toBe(1);
    const order = (await fresh.knex("part_orders").where({ id: Number(parts[0]!.order_id) }).first())!;
    expect([order.shop_id, order.supplier, order.reference]).toEqual([shop.id, "Ridgeway Parts Supply", "RPS-20418"]);
    const backOrder = (await fresh.knex("job_part_events").where({ part_id: parts[1]!.id, to_status: "back_ordered" }).first())!;
    expect(backOrder.note).toBe(`Back-ordered, now expected ${parts[1]!.expected_on}`);
    expect(String(parts[1]!.expected_on) > String(order.expected_on)).toBe(true);
    // The demo's board counts (tests/e2e/staff.spec.ts) don't move: the job was already waiting on parts.
    expect(job.status).toBe("waiting_parts");
  });

  it("prices parts by a markup and has J-0002's parts on work its owner approved: they hold the job and his page shows the wait (issue 19)", async () => {
    const k = fresh.knex;
    const shop = (await k("shops").where({ slug: "copper-gulch" }).first("id"))!;
    // Markup on cost by bands: common trade practice, no published source.
    expect(await getMarkupRule({ shopId: shop.id }, k)).toEqual({
      kind: "bands",
      bands: [
        { upToMinor: 1000, percent: "100" },
        { upToMinor: 5000, percent: "60" },
        { upToMinor: null, percent: "35" },
      ],
    });
    const job = (await k("jobs").where({ shop_id: shop.id, number: 2 }).first("id", "status"))!;
    const key = { shopId: shop.id, jobId: job.id };
    // Each part is its approved line's part, at the markup's price: $48.50 + 60 % = $77.60;
    // $62.75 + 35 % = $84.7125 → $84.71 (half-up); $94.00 + 35 % = $126.90.
    const parts = await k("job_parts").where({ job_id: job.id }).orderBy("id");
    expect(parts.map((p) => [p.description, p.owner_answer, Number(p.sell_minor), p.finding_line_id !== null])).toEqual([
      ["Cam chain", "approved", 7760, true],
      ["Cam chain tensioner", "approved", 8471, true],
      ["Starter motor, rebuilt exchange", "approved", 12690, true],
    ]);
    const request = (await k("approval_requests").where({ job_id: job.id }).first())!;
    expect(request.status).toBe("answered");
    expect(request.hash).toBe(sha256Hex(request.canonical));
    const decision = (await k("approval_decisions").where({ request_id: request.id }).first())!;
    expect([decision.method, decision.person_name, decision.shown_hash]).toEqual(["phone", "Jonah Pike", request.hash]);
    expect(await k("approval_decision_lines").where({ decision_id: decision.id }).pluck("answer")).toEqual(["approved", "approved", "approved", "approved"]);

    // They hold the job in waiting on parts, and the owner's page says which and when.
    const holding = await clearedPartsQuery(k, key).count({ n: "*" }).first();
    expect(Number(holding!.n)).toBeGreaterThanOrEqual(1);
    expect(job.status).toBe("waiting_parts");
    const waits = partWaitLines(await ownerPartWaits(key, k));
    expect(waits).toContain(`Part on back-order: Cam chain tensioner, expected ${parts[1]!.expected_on}.`);
    expect(waits).toHaveLength(3);
    // Approved, not fitted yet: the invoice waits for them; the labour is authorised already.
    const work = await k.transaction((tx) => authorisedWork(key, tx));
    expect(work.partsNotFitted.map((p) => [p.description, p.status])).toEqual([
      ["Cam chain", "ordered"],
      ["Cam chain tensioner", "back_ordered"],
      ["Starter motor, rebuilt exchange", "ordered"],
    ]);
    expect(work.lines.map((l) => l.kind)).toEqual(["labour"]);
  });
});
