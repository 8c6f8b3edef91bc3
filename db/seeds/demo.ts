// The demo scenario: two invented shops, their people, customers, machines and jobs.
// Every name, make and model here is made up. Passwords are listed in README.md.
import crypto from "node:crypto";
import bcrypt from "bcryptjs";
import type { Knex } from "knex";
import type { JobStatus } from "../../lib/job-status";
import type { MachineKind } from "../../lib/machine";
import type { StaffRole } from "../../lib/permissions";
import { seedApprovalsDemo } from "./demo-approvals";
import { seedBench, seedBenchWork } from "./demo-bench";
import { seedInboxDemo } from "./demo-inbox";
import { seedPortfolioDemo } from "./demo-portfolio";
import { calendarDay, daysFromNow } from "./demo-time";

export const DEMO_PASSWORDS = {
  owner: "gulch-owner-demo",
  service_writer: "gulch-writer-demo",
  technician: "gulch-tech-demo",
  otherShop: "saltmarsh-demo",
  /** A technician who has left Copper Gulch: the account is kept, its membership deactivated. */
  formerTechnician: "gulch-former-demo",
} as const;

type Person = { email: string; name: string; password?: string };
/** `deactivated`: off the staff, kept for the history (memberships.deactivated_at). */
type Staff = Person & { role: StaffRole; deactivated?: boolean };
type MachineSeed = { kind: MachineKind; year: number; make: string; model: string; engineCc: number; serial: string; hours?: number; odometer?: number };
/** A journal note: `day` counts from check-in, `text` is its paragraphs. */
type NoteSeed = { day: number; hour: number; text: string[]; shared: boolean };
type JobSeed = {
  customer: string;
  machine: number;
  path: JobStatus[];
  concern: string;
  promisedInDays: number | null;
  technician: string | null;
  startedDaysAgo: number;
  notes?: NoteSeed[];
  /** People the owner invited to follow the job (e-mail updates, no money). */
  followers?: string[];
};
type ShopSeed = {
  slug: string;
  name: string;
  email: string;
  phone: string;
  timezone: string;
  staff: Staff[];
  customers: (Person & { phone: string; machines: MachineSeed[] })[];
  jobs: JobSeed[];
};

const SHOPS: ShopSeed[] = [
  {
    slug: "copper-gulch",
    name: "Copper Gulch Powersports",
    email: "desk@coppergulch.test",
    phone: "+1 555 010 4471",
    timezone: "America/Denver",
    staff: [
      { role: "owner", email: "dana@coppergulch.test", name: "Dana Okafor", password: DEMO_PASSWORDS.owner },
      { role: "service_writer", email: "priya@coppergulch.test", name: "Priya Lindqvist", password: DEMO_PASSWORDS.service_writer },
      { role: "technician", email: "mateo@coppergulch.test", name: "Mateo Brandt", password: DEMO_PASSWORDS.technician },
      { role: "technician", email: "rafe@coppergulch.test", name: "Rafe Tamsin", password: DEMO_PASSWORDS.formerTechnician, deactivated: true },
    ],
    customers: [
      {
        email: "ruth.calloway@mail.test",
        name: "Ruth Calloway",
        phone: "+1 555 013 2290",
        machines: [{ kind: "atv", year: 2019, make: "Tessaro", model: "Ridgeline 570", engineCc: 570, serial: "TSR57-19-004418", hours: 312.4 }],
      },
      {
        email: "jonah.pike@mail.test",
        name: "Jonah Pike",
        phone: "+1 555 017 8812",
        machines: [{ kind: "dirt_bike", year: 2021, make: "Corvane", model: "Tarn 450", engineCc: 449, serial: "CVT450-21-11873", hours: 88 }],
      },
      {
        email: "imani.reyes@mail.test",
        name: "Imani Reyes",
        phone: "+1 555 019 3054",
        machines: [
          { kind: "side_by_side", year: 2017, make: "Gravik", model: "Hauler 800", engineCc: 799, serial: "GVH8-17-20931", odometer: 6120 },
          { kind: "small_engine", year: 2015, make: "Pellard", model: "P190 vertical shaft", engineCc: 190, serial: "PL190-15-77302" },
        ],
      },
    ],
    jobs: [
      {
        customer: "ruth.calloway@mail.test",
        machine: 0,
        path: ["checked_in", "inspecting", "in_progress", "ready", "picked_up"],
        concern: "Yearly service before hunting season: oil, filters, check the brakes.",
        promisedInDays: -40,
        technician: "mateo@coppergulch.test",
        startedDaysAgo: 45,
      },
      {
        customer: "jonah.pike@mail.test",
        machine: 0,
        path: ["checked_in", "inspecting", "waiting_approval", "waiting_parts"],
        concern: "Hard to start when hot and feels down on power. Rattle from the top end at idle.",
        promisedInDays: -1,
        technician: "mateo@coppergulch.test",
        startedDaysAgo: 9,
        notes: [
          { day: 1, hour: 16, shared: false, text: ["Valve cover off. Cam chain tensioner plunger is at the last notch.", "Chain measured over 20 pins: past the limit in our spec sheet. Guides look glazed."] },
          { day: 1, hour: 17, shared: true, text: ["Top end opened up. The rattle is the cam chain: it has stretched and the tensioner has run out of travel. We'll send you the options before going further."] },
        ],
      },
      {
        customer: "imani.reyes@mail.test",
        machine: 0,
        path: ["checked_in", "inspecting", "in_progress"],
        concern: "Runs hot on long climbs and the fan seems to come on late.",
        promisedInDays: 3,
        technician: "mateo@coppergulch.test",
        startedDaysAgo: 4,
      },
      {
        customer: "imani.reyes@mail.test",
        machine: 1,
        path: ["checked_in", "inspecting", "in_progress", "ready"],
        concern: "Won't start after sitting all winter. Pull cord is fine.",
        promisedInDays: 0,
        technician: "mateo@coppergulch.test",
        startedDaysAgo: 6,
      },
      {
        customer: "ruth.calloway@mail.test",
        machine: 0,
        path: ["checked_in", "inspecting", "waiting_approval"],
        concern: "Grinding from the front left when turning under power.",
        promisedInDays: 5,
        technician: "mateo@coppergulch.test",
        startedDaysAgo: 2,
        notes: [
          { day: 1, hour: 16, shared: true, text: ["Front left CV boot is split and the joint clicks at full lock. Grease has been thrown over the knuckle."] },
          { day: 1, hour: 17, shared: false, text: ["Check whether the parts counter has an axle in stock before we quote."] },
        ],
        followers: ["noor.calloway@mail.test"],
      },
      {
        customer: "jonah.pike@mail.test",
        machine: 0,
        path: ["checked_in"],
        concern: "Clutch slips in third under load after the last race.",
        promisedInDays: 7,
        technician: null,
        startedDaysAgo: 0,
      },
    ],
  },
  {
    slug: "saltmarsh",
    name: "Saltmarsh Small Engine",
    email: "hello@saltmarsh.test",
    phone: "+1 555 014 9920",
    timezone: "America/New_York",
    staff: [
      { role: "owner", email: "wren@saltmarsh.test", name: "Wren Halvorsen", password: DEMO_PASSWORDS.otherShop },
      { role: "technician", email: "sam@saltmarsh.test", name: "Sam Tully", password: DEMO_PASSWORDS.otherShop },
      { role: "service_writer", email: "odile@saltmarsh.test", name: "Odile Brandvold", password: DEMO_PASSWORDS.otherShop },
    ],
    customers: [
      {
        email: "otto.fenn@mail.test",
        name: "Otto Fenn",
        phone: "+1 555 016 4410",
        machines: [{ kind: "snowmobile", year: 2016, make: "Brumal", model: "Drift 600", engineCc: 594, serial: "BRD6-16-33018", odometer: 4210 }],
      },
      {
        // Works at Copper Gulch, brings her own mower engine here: one person, two roles.
        email: "priya@coppergulch.test",
        name: "Priya Lindqvist",
        phone: "+1 555 012 7781",
        machines: [{ kind: "small_engine", year: 2020, make: "Pellard", model: "P160 horizontal shaft", engineCc: 160, serial: "PL160-20-10442" }],
      },
    ],
    jobs: [
      {
        customer: "otto.fenn@mail.test",
        machine: 0,
        path: ["checked_in", "inspecting"],
        concern: "Bogs down above half throttle; new plugs didn't help.",
        promisedInDays: 4,
        technician: "sam@saltmarsh.test",
        startedDaysAgo: 1,
      },
      {
        customer: "priya@coppergulch.test",
        machine: 0,
        path: ["checked_in", "in_progress"],
        concern: "Surges at idle, leaking fuel from the carburettor bowl.",
        promisedInDays: 2,
        technician: "sam@saltmarsh.test",
        startedDaysAgo: 2,
      },
    ],
  },
];

export async function seedDemo(knex: Knex): Promise<void> {
  // Hashing outside the transaction keeps row locks short.
  const allStaff = SHOPS.flatMap((s) => s.staff);
  const hashes = new Map<string, string>();
  for (const person of allStaff) if (person.password && !hashes.has(person.email)) hashes.set(person.email, await bcrypt.hash(person.password, 12));

  await knex.transaction(async (tx) => {
    const userIds = new Map<string, number>();
    const userFor = async (person: Person, withPassword: boolean) => {
      const known = userIds.get(person.email);
      if (known) return known;
      const [id] = await tx("users").insert({ email: person.email, name: person.name, password_hash: withPassword ? hashes.get(person.email) : null });
      userIds.set(person.email, Number(id));
      return Number(id);
    };

    for (const shop of SHOPS) {
      const [shopId] = await tx("shops").insert({ slug: shop.slug, name: shop.name, email: shop.email, phone: shop.phone, timezone: shop.timezone });
      for (const person of shop.staff) {
        const deactivatedAt = person.deactivated ? daysFromNow(-20) : null;
        await tx("memberships").insert({ shop_id: shopId, user_id: await userFor(person, true), role: person.role, deactivated_at: deactivatedAt });
      }
      const customerIds = new Map<string, { id: number; machines: number[] }>();
      for (const c of shop.customers) {
        // A customer who already has an account (here: a staff member elsewhere) is linked now.
        const [customerId] = await tx("customers").insert({ shop_id: shopId, user_id: userIds.get(c.email) ?? null, name: c.name, email: c.email, phone: c.phone });
        const machineIds: number[] = [];
        for (const m of c.machines) {
          const [machineId] = await tx("machines").insert({
            shop_id: shopId,
            customer_id: customerId,
            kind: m.kind,
            year: m.year,
            make: m.make,
            model: m.model,
            engine_cc: m.engineCc,
            serial: m.serial,
            hours: m.hours ?? null,
            odometer: m.odometer ?? null,
            odometer_unit: m.odometer ? "mi" : null,
          });
          machineIds.push(Number(machineId));
        }
        customerIds.set(c.email, { id: Number(customerId), machines: machineIds });
      }

      let number = 1;
      for (const job of shop.jobs) {
        const customer = customerIds.get(job.customer)!;
        const started = daysFromNow(-job.startedDaysAgo);
        const status = job.path[job.path.length - 1]!;
        const deskUser = userIds.get(shop.staff.find((s) => s.role !== "technician")!.email)!;
        const [jobId] = await tx("jobs").insert({
          shop_id: shopId,
          number: number++,
          public_id: crypto.randomBytes(12).toString("base64url"),
          customer_id: customer.id,
          machine_id: customer.machines[job.machine],
          status,
          concern: job.concern,
          promised_on: job.promisedInDays == null ? null : calendarDay(job.promisedInDays, shop.timezone),
          technician_user_id: job.technician ? userIds.get(job.technician) : null,
          created_by_user_id: deskUser,
          created_at: started,
          updated_at: daysFromNow(-job.startedDaysAgo + job.path.length - 1, 15 + job.path.length),
        });
        // The status history walks the path a step per day (the same day for today's check-in);
        // each step is also a shared timeline entry, as a live status change is. Entries go in
        // in time order, since the timeline is ordered by posting order.
        let previous: JobStatus | null = null;
        const techId = job.technician ? userIds.get(job.technician)! : deskUser;
        const entries: Record<string, unknown>[] = [];
        for (const [i, to] of job.path.entries()) {
          const at = daysFromNow(-job.startedDaysAgo + i, 15 + i);
          const by = i === 0 ? deskUser : techId;
          await tx("job_status_changes").insert({ shop_id: shopId, job_id: jobId, from_status: previous, to_status: to, changed_by_user_id: by, changed_at: at });
          entries.push({ kind: "status", visibility: "shared", author_user_id: by, body: JSON.stringify({ from: previous, to, note: null }), created_at: at, shared_at: at });
          previous = to;
        }
        for (const note of job.notes ?? []) {
          const at = daysFromNow(-job.startedDaysAgo + note.day, note.hour);
          const body = { type: "doc", content: note.text.map((text) => ({ type: "paragraph", content: [{ type: "text", text }] })) };
          entries.push({ kind: "note", visibility: note.shared ? "shared" : "shop", author_user_id: techId, body: JSON.stringify(body), created_at: at, shared_at: note.shared ? at : null });
        }
        entries.sort((a, b) => (a.created_at as Date).getTime() - (b.created_at as Date).getTime());
        for (const entry of entries) await tx("journal_entries").insert({ shop_id: shopId, job_id: jobId, ...entry });
        // The owner follows the job from check-in, as a live check-in subscribes them.
        await tx("job_subscribers").insert({ shop_id: shopId, job_id: jobId, email: job.customer.toLowerCase(), user_id: userIds.get(job.customer) ?? null, role: "owner" });
        // Followers have no account until they first sign in with a link (which claims the row).
        for (const email of job.followers ?? []) {
          await tx("job_subscribers").insert({ shop_id: shopId, job_id: jobId, email, user_id: null, role: "follower", invited_by_user_id: userIds.get(job.customer) ?? null });
        }
      }
      await tx("shops").where({ id: shopId }).update({ next_job_number: number });
      await seedBench(tx, { slug: shop.slug, timezone: shop.timezone, deskEmail: shop.staff.find((p) => p.role !== "technician")!.email, jobs: shop.jobs }, Number(shopId), (email) => userIds.get(email));
      await seedApprovalsDemo(tx, shop.slug, Number(shopId), (email) => userIds.get(email));
      await seedBenchWork(tx, { slug: shop.slug, jobs: shop.jobs }, Number(shopId), (email) => userIds.get(email));
      await seedPortfolioDemo(tx, shop.slug, Number(shopId));
      await seedInboxDemo(tx, shop.slug, Number(shopId));
    }
  });
}

/** Seeds only a database without shops, so restarting `npm start` never touches real data. */
export async function seedIfEmpty(knex: Knex): Promise<boolean> {
  const row = await knex("shops").count({ n: "*" }).first();
  if (Number(row?.n ?? 0) > 0) return false;
  await seedDemo(knex);
  return true;
}
