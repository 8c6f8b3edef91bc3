import "server-only";
import type { Knex } from "knex";
import { db } from "@/db/client";
import { transaction } from "@/db/transaction";
import { AppError } from "@/lib/errors";
import { shopToday } from "@/lib/jobs-view";
import type { MachineKind } from "@/lib/machine";
import { type CheckInInput, type CustomerSearchResult, type NewCustomer, type NewMachine, promisedOnProblem } from "@/lib/schemas/check-in";
import { allocateJobNumber, newPublicId } from "./jobs";
import { subscribeOwner } from "./following";
import { recordTextConsent } from "@/lib/server/texts";
import { insertEntry } from "./entries";

/** A refusal shown beside one field of the check-in form. */
function refuse(code: "not_found" | "conflict" | "invalid", field: string, message: string): never {
  throw new AppError(code, message, { [field]: [message] });
}

function isDuplicateKey(error: unknown): boolean {
  return (error as { code?: string } | null)?.code === "ER_DUP_ENTRY";
}

/** The users row with this e-mail, so the owner sees the job as soon as they sign in. */
async function userIdForEmail(tx: Knex.Transaction, email: string | null): Promise<number | null> {
  if (!email) return null;
  const user = await tx("users").where({ email }).first("id");
  return user ? Number(user.id) : null;
}

async function chooseCustomer(tx: Knex.Transaction, shopId: number, customer: CheckInInput["customer"]): Promise<number> {
  if (customer.mode === "existing") {
    const row = await tx("customers").where({ shop_id: shopId, id: customer.id }).first("id", "email", "user_id");
    if (!row) refuse("not_found", "customerId", "That owner isn't on this shop's books. Search again and pick from the list.");
    if (row.user_id == null) {
      const userId = await userIdForEmail(tx, row.email as string | null);
      if (userId) await tx("customers").where({ shop_id: shopId, id: row.id }).update({ user_id: userId });
    }
    return Number(row.id);
  }
  return insertCustomer(tx, shopId, customer);
}

/**
 * A new owner. An e-mail already on file in this shop is refused rather than reused: the
 * writer picks the owner on file instead, so two records never split one person's jobs and
 * a typo can't quietly attach a machine to someone else.
 */
async function insertCustomer(tx: Knex.Transaction, shopId: number, c: NewCustomer): Promise<number> {
  const sameEmail = "An owner with that e-mail is already on file here. Choose “Owner on file” and search for them.";
  if (c.email && (await tx("customers").where({ shop_id: shopId, email: c.email }).first("id"))) refuse("conflict", "customerEmail", sameEmail);
  try {
    const [id] = await tx("customers").insert({ shop_id: shopId, name: c.name, email: c.email, phone: c.phone, user_id: await userIdForEmail(tx, c.email) });
    return Number(id);
  } catch (error) {
    if (isDuplicateKey(error)) refuse("conflict", "customerEmail", sameEmail);
    throw error;
  }
}

async function chooseMachine(tx: Knex.Transaction, shopId: number, customerId: number, machine: CheckInInput["machine"]): Promise<number> {
  if (machine.mode === "existing") {
    const row = await tx("machines").where({ shop_id: shopId, id: machine.id }).first("id", "customer_id");
    if (!row) refuse("not_found", "machineId", "That machine isn't on this shop's books. Pick one from the owner's list.");
    if (Number(row.customer_id) !== customerId) refuse("invalid", "machineId", "That machine belongs to a different owner. Pick one of this owner's machines.");
    return Number(row.id);
  }
  return insertMachine(tx, shopId, customerId, machine);
}

async function insertMachine(tx: Knex.Transaction, shopId: number, customerId: number, m: NewMachine): Promise<number> {
  const [id] = await tx("machines").insert({
    shop_id: shopId,
    customer_id: customerId,
    kind: m.kind,
    year: m.year,
    make: m.make,
    model: m.model,
    engine_cc: m.engineCc,
    serial: m.serial,
    hours: m.hours,
    odometer: m.odometer,
    odometer_unit: m.odometer == null ? null : m.odometerUnit,
  });
  return Number(id);
}

/**
 * Checks a machine in: owner and machine (on file or new), the next job number, the job
 * (status "checked_in") and its first status-history row, in one transaction. Every id is
 * looked up within this shop, so another shop's owner, machine or staff member is refused
 * (404) and nothing is written. `today` defaults to the date on the shop's own calendar.
 */
export async function checkInJob({ shopId, userId, input, today }: { shopId: number; userId: number; input: CheckInInput; today?: string }) {
  return transaction(async (tx) => {
    // The shop row lock comes first: every insert below takes a shared lock on the shop row
    // through its foreign key, and taking the exclusive lock after those would deadlock two
    // check-ins at the same moment. Rolled back on any refusal, so no number is lost.
    const number = await allocateJobNumber(tx, shopId);
    // allocateJobNumber found the shop row (or threw).
    const shop = (await tx("shops").where({ id: shopId }).first("timezone"))!;
    const dateProblem = promisedOnProblem(input.promisedOn, today ?? shopToday(String(shop.timezone)));
    if (dateProblem) refuse("invalid", "promisedOn", dateProblem);
    if (input.technicianId != null && !(await tx("memberships").where({ shop_id: shopId, user_id: input.technicianId }).whereNull("deactivated_at").first("id"))) {
      refuse("not_found", "technicianId", "That person isn't on this shop's staff. Pick someone from the list.");
    }
    const customerId = await chooseCustomer(tx, shopId, input.customer);
    const machineId = await chooseMachine(tx, shopId, customerId, input.machine);
    const publicId = newPublicId();
    const [jobId] = await tx("jobs").insert({
      shop_id: shopId,
      number,
      public_id: publicId,
      customer_id: customerId,
      machine_id: machineId,
      status: "checked_in",
      concern: input.concern,
      intake_notes: input.intakeNotes,
      promised_on: input.promisedOn,
      technician_user_id: input.technicianId,
      created_by_user_id: userId,
    });
    await tx("job_status_changes").insert({ shop_id: shopId, job_id: jobId, from_status: null, to_status: "checked_in", changed_by_user_id: userId });
    // The journal opens with the check-in, shared like every status change.
    await insertEntry(tx, { shopId, jobId: Number(jobId), kind: "status", authorId: userId, visibility: "shared", body: { from: null, to: "checked_in", note: null } });
    // Consent to texts given at the desk, recorded with when and how (lib/server/texts.ts).
    if (input.textConsent) {
      const typed = (await tx("customers").where({ shop_id: shopId, id: customerId }).first("phone"))?.phone;
      if (!typed) refuse("invalid", "textConsent", "Add the owner's mobile number to text them, or leave the box unticked.");
      await recordTextConsent(tx, { shopId, customerId, phone: typed, how: "check_in", userId }).catch((error: unknown) => {
        if (error instanceof AppError && error.code === "invalid") refuse("invalid", "textConsent", "That phone number can't be texted: give it with its country code, or leave the box unticked.");
        throw error;
      });
    }
    // The owner follows their job by e-mail from the start (they can choose less, or stop).
    const owner = await tx("customers").where({ shop_id: shopId, id: customerId }).first("email", "user_id");
    if (owner?.email) await subscribeOwner({ shopId, jobId: Number(jobId), email: String(owner.email), userId: owner.user_id == null ? null : Number(owner.user_id) }, tx);
    return { id: Number(jobId), number, publicId, customerId, machineId };
  });
}

/**
 * Owners of this shop matching a name, e-mail or phone (digits only, so "013 2290" finds
 * "+1 555 013 2290"), each with their machines: two queries whatever the number of results.
 * An empty search lists the most recently added owners.
 */
export async function searchCustomers({ shopId, q, limit = 10 }: { shopId: number; q: string; limit?: number }): Promise<CustomerSearchResult[]> {
  const query = db()("customers as c").where("c.shop_id", shopId).select("c.id", "c.name", "c.email", "c.phone").limit(limit);
  if (q) {
    const like = `%${q.replace(/[\\%_]/g, (ch) => `\\${ch}`)}%`;
    const digits = q.replace(/\D/g, "");
    query.where((w) => {
      w.orWhere("c.name", "like", like).orWhere("c.email", "like", like);
      if (digits.length >= 3) w.orWhereRaw("REGEXP_REPLACE(c.phone, '[^0-9]', '') LIKE ?", [`%${digits}%`]);
    });
    query.orderBy("c.name").orderBy("c.id");
  } else {
    query.orderBy("c.id", "desc");
  }
  const customers = await query;
  if (!customers.length) return [];
  const ids = customers.map((c: { id: number }) => Number(c.id));
  const machines = await db()("machines")
    .where("shop_id", shopId)
    .whereIn("customer_id", ids)
    .orderBy("id", "desc")
    .select("id", "customer_id", "kind", "year", "make", "model", "serial");
  return customers.map((c: Record<string, unknown>) => ({
    id: Number(c.id),
    name: String(c.name),
    email: (c.email as string | null) ?? null,
    phone: (c.phone as string | null) ?? null,
    machines: machines
      .filter((m: Record<string, unknown>) => Number(m.customer_id) === Number(c.id))
      .map((m: Record<string, unknown>) => ({
        id: Number(m.id),
        kind: m.kind as MachineKind,
        year: m.year == null ? null : Number(m.year),
        make: String(m.make),
        model: String(m.model),
        serial: (m.serial as string | null) ?? null,
      })),
  }));
}
