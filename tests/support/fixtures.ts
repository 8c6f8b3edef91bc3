import crypto from "node:crypto";
import bcrypt from "bcryptjs";
import type { Knex } from "knex";
import type { JobStatus } from "../../lib/job-status";
import type { StaffRole } from "../../lib/permissions";
import { allocateJobNumber } from "../../db/queries/jobs";

const unique = () => crypto.randomBytes(4).toString("hex");

/** Inserts an invented shop with one staff member of each given role; returns ids and e-mails. */
export async function makeShop(db: Knex, opts: { label: string; roles?: StaffRole[]; password?: string }) {
  const tag = `${opts.label}-${unique()}`;
  const [shopId] = await db("shops").insert({ slug: tag, name: `Test shop ${tag}` });
  const hash = opts.password ? await bcrypt.hash(opts.password, 4) : null;
  const staff: Record<string, { id: number; email: string }> = {};
  for (const role of opts.roles ?? ["owner"]) {
    const email = `${role}.${tag}@shop.test`;
    const [userId] = await db("users").insert({ email, name: `${role} ${tag}`, password_hash: hash });
    await db("memberships").insert({ shop_id: shopId, user_id: userId, role });
    staff[role] = { id: Number(userId), email };
  }
  return { id: Number(shopId), slug: tag, staff };
}

/** A customer with one machine and one job per status given; job numbers count from 1 in each shop. */
export async function makeCustomerWithJobs(
  db: Knex,
  shopId: number,
  opts: { name: string; email?: string; userId?: number | null; serial?: string; statuses: JobStatus[] },
) {
  const [customerId] = await db("customers").insert({ shop_id: shopId, name: opts.name, email: opts.email ?? null, user_id: opts.userId ?? null });
  const [machineId] = await db("machines").insert({
    shop_id: shopId,
    customer_id: customerId,
    kind: "atv",
    make: "Testmake",
    model: `Model ${unique()}`,
    serial: opts.serial ?? `SER-${unique()}`,
  });
  const jobIds: number[] = [];
  for (const status of opts.statuses) {
    const number = await db.transaction((tx) => allocateJobNumber(tx, shopId));
    const [jobId] = await db("jobs").insert({
      shop_id: shopId,
      number,
      public_id: crypto.randomBytes(12).toString("base64url"),
      customer_id: customerId,
      machine_id: machineId,
      status,
      concern: `${opts.name}'s concern ${number}`,
    });
    jobIds.push(Number(jobId));
  }
  return { customerId: Number(customerId), machineId: Number(machineId), jobIds };
}
