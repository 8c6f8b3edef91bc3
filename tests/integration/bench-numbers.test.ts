import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Knex } from "knex";
import { listTorqueRecords } from "@/db/queries/bench";
import { listTimeline } from "@/db/queries/journal";
import { isTorqueBody, toleranceOf, torqueProof } from "@/lib/bench";
import type { Actor } from "@/lib/permissions";
import { readingSchema, torqueRecordSchema } from "@/lib/schemas/bench";
import { access } from "@/lib/server/access";
import { addJobPart, updateBenchSettings } from "@/lib/server/bench-parts";
import { recordReading, recordTorque } from "@/lib/server/bench";
import { summarizeEntry } from "@/lib/server/emails/entry-summary";
import { torqueOutcome } from "@/lib/torque-check";
import { makeCustomerWithJobs, makeShop } from "../support/fixtures";
import { testKnex } from "../support/db";

// Issue 18 §1–3 on the record path: the form's text through its schema and the server's reading
// in the shop's style (lib/number-input.ts), into MariaDB, and out to staff, owner and e-mail.
type Shop = Awaited<ReturnType<typeof makeShop>>;
const techOf = (shop: Shop): Actor => ({
  userId: shop.staff.technician!.id,
  email: shop.staff.technician!.email,
  name: "technician",
  memberships: [{ shopId: shop.id, shopSlug: shop.slug, shopName: shop.slug, role: "technician" }],
});

describe("bench numbers on the record path", () => {
  let k: Knex;
  let usd: { shop: Shop; job: { id: number; publicId: string } };
  let cad: { shop: Shop; job: { id: number; publicId: string } };

  async function shopWithJob(label: string, currency: string) {
    const shop = await makeShop(k, { label, roles: ["owner", "technician"] });
    await k("shops").where({ id: shop.id }).update({ currency });
    const made = await makeCustomerWithJobs(k, shop.id, { name: "Ilse Parrow", statuses: ["in_progress"] });
    const id = made.jobIds[0]!;
    return { shop, job: { id, publicId: String((await k("jobs").where({ id }).first("public_id"))!.public_id) } };
  }
  /** As the bench action does it: the form's fields through the schema, then the server with the resolved job. */
  async function logTorque(on: typeof usd, form: Record<string, string>) {
    const tech = techOf(on.shop);
    const input = torqueRecordSchema.parse({ job: on.job.publicId, share: "on", ...form });
    return recordTorque(tech, await access(tech, "job", on.job.publicId, "bench:record"), input);
  }
  const torqueRows = (jobId: number) => k("torque_records").where({ job_id: jobId }).orderBy("id");

  beforeAll(async () => {
    k = testKnex();
    usd = await shopWithJob("numbers-usd", "USD");
    cad = await shopWithJob("numbers-cad", "CAD");
  });
  afterAll(async () => k?.destroy());

  it("stores “1,200” lbf·in as twelve hundred in a US-dollar shop, never 1.2", async () => {
    await logTorque(usd, { fastener: "Rear sprocket nuts", specValue: "1,200", unit: "lbf_in", appliedValue: "1,200", passesDone: "on", checkPass: "on" });
    const row = (await torqueRows(usd.job.id))[0]!;
    expect(Number(row.spec_value)).toBe(1200);
    expect(Number(row.applied_value)).toBe(1200);
    expect([row.passes_done, row.check_pass_done, Number(row.tolerance_pct)]).toEqual([1, 1, 4]);
  });

  it("refuses “1,200” in a Canadian-dollar shop (both conventions meet) with both readings beside the field, writing nothing", async () => {
    const before = (await torqueRows(cad.job.id)).length;
    await expect(logTorque(cad, { fastener: "Rear sprocket nuts", specValue: "1,200", unit: "lbf_in" })).rejects.toMatchObject({
      code: "invalid",
      fields: { specValue: ["Spec torque: “1,200” could be 1200 (the comma grouping thousands) or 1,2 (a decimal comma) — write 1200 or 1,2."] },
    });
    expect(await torqueRows(cad.job.id)).toHaveLength(before);
    // Unambiguous in that shop: read.
    await logTorque(cad, { fastener: "Brake caliper bolts", specValue: "27,5", unit: "nm" });
    expect(Number((await torqueRows(cad.job.id)).at(-1)!.spec_value)).toBe(27.5);
  });

  it("flags the 72 / 65 lbf·ft axle nut for staff, the owner and e-mail, headlined in lbf·ft", async () => {
    await logTorque(usd, { fastener: "Rear axle nut", specValue: "72", unit: "lbf_ft", appliedValue: "65" });
    const staff = (await listTorqueRecords({ shopId: usd.shop.id, jobId: usd.job.id })).find((r) => r.fastener === "Rear axle nut")!;
    expect(torqueOutcome({ ...staff, tolerancePct: toleranceOf(staff) }).kind).toBe("under");
    // NIST SP 811 App. B.9 via REFERENCES.md §1: 65 lbf·ft → 88.1 N·m, 72 lbf·ft → 97.6 N·m.
    expect(torqueProof({ ...staff, displayUnit: "nm" })).toMatch(/^UNDER SPEC: torqued to 65\.0 lbf·ft \(88\.1 N·m\), 9\.7 % under the 72\.0 lbf·ft \(97\.6 N·m\) spec/);
    // Not claimed: nobody ticked the passes or the check pass.
    expect(torqueProof({ ...staff, displayUnit: "nm" })).toMatch(/planned, not recorded as done; no check pass recorded/);

    const owner = await listTimeline({ shopId: usd.shop.id, jobId: usd.job.id, audience: "owner", order: "desc", limit: 50 });
    const entry = owner.entries.find((e) => e.kind === "torque" && isTorqueBody(e.body) && e.body.fastener === "Rear axle nut")!;
    expect(entry).toBeDefined();
    expect(isTorqueBody(entry.body) && torqueProof(entry.body)).toMatch(/^UNDER SPEC/);
    expect(summarizeEntry({ kind: "torque", body: entry.body, caption: null, photoCount: 0 }).text).toMatch(/^Rear axle nut: UNDER SPEC: torqued to 65\.0 lbf·ft \(88\.1 N·m\)/);
  });

  it("refuses applied 0, and a spec implausible for its size until someone has checked it", async () => {
    await expect(logTorque(usd, { fastener: "Axle nut", specValue: "72", unit: "lbf_ft", appliedValue: "0" })).rejects.toMatchObject({
      fields: { appliedValue: ["Applied torque can’t be 0: leave it empty if it wasn’t measured."] },
    });
    const swap = logTorque(usd, { fastener: "Clutch cover bolts, 8 × M6", specValue: "96", unit: "lbf_ft" });
    await expect(swap).rejects.toMatchObject({ fields: { specValue: [expect.stringContaining("did you mean 96.0 lbf·in = 10.8 N·m?")] } });
    expect((await torqueRows(usd.job.id)).some((r) => r.fastener === "Clutch cover bolts, 8 × M6")).toBe(false);
    // The maker's manual says so: recorded, with the warning kept on the record for staff.
    await logTorque(usd, { fastener: "Clutch cover bolts, 8 × M6", specValue: "96", unit: "lbf_ft", plausibleChecked: "on" });
    const kept = (await listTorqueRecords({ shopId: usd.shop.id, jobId: usd.job.id })).find((r) => r.fastener === "Clutch cover bolts, 8 × M6")!;
    expect(kept.warning).toMatch(/^96\.0 lbf·ft is 130\.2 N·m/);
  });

  it("takes a record's tolerance from its wrench, else from the shop's usual wrench (ISO 6789-1 class)", async () => {
    const owner: Actor = { ...techOf(cad.shop), userId: cad.shop.staff.owner!.id, memberships: [{ shopId: cad.shop.id, shopSlug: cad.shop.slug, shopName: cad.shop.slug, role: "owner" }] };
    // Typed in the CAD shop's convention: a space groups, a lone “1.5” has one reading.
    await updateBenchSettings(await access(owner, "shop", cad.shop.slug, "shop:manage-settings"), { torqueUnit: "nm", passes: [30, 60, 100], wrenchClass: "type2_6", chainLimitPct: "1.5", clipMaxMinutes: "10", clipMaxGb: "2", ownerWaitDays: 3 }, owner);
    // 68 against 72 is 5.6 % under: within ±6 % (type II class C/F), outside ±4 % (from memory, unverified).
    await logTorque(cad, { fastener: "Front axle pinch bolts", specValue: "72", unit: "lbf_ft", appliedValue: "68" });
    await logTorque(cad, { fastener: "Rear axle pinch bolts", specValue: "72", unit: "lbf_ft", appliedValue: "68", wrenchClass: "type2_4" });
    const rows = await listTorqueRecords({ shopId: cad.shop.id, jobId: cad.job.id });
    const front = rows.find((r) => r.fastener === "Front axle pinch bolts")!;
    const rear = rows.find((r) => r.fastener === "Rear axle pinch bolts")!;
    expect([front.wrenchClass, front.tolerancePct, torqueOutcome({ ...front, tolerancePct: toleranceOf(front) }).kind]).toEqual(["type2_6", 6, "within"]);
    expect([rear.wrenchClass, rear.tolerancePct, torqueOutcome({ ...rear, tolerancePct: toleranceOf(rear) }).kind]).toEqual(["type2_4", 4, "under"]);
  });

  it("reads readings and part costs with the same reader", async () => {
    const tech = techOf(usd.shop);
    const found = await access(tech, "job", usd.job.publicId, "bench:record");
    const made = await recordReading(tech, found, readingSchema.parse({ job: usd.job.publicId, label: "Idle speed", value: "1,450", unit: "rpm", min: "1,300", max: "1,500" }));
    const row = (await k("readings").where({ id: made.id }).first())!;
    expect([Number(row.value), Number(row.min_value), Number(row.max_value), row.verdict]).toEqual([1450, 1300, 1500, "within"]);
    await expect(recordReading(tech, found, readingSchema.parse({ job: usd.job.publicId, label: "Pad", value: "3,5" }))).rejects.toMatchObject({ fields: { value: [expect.stringContaining("write 3.5")] } });
    const part = await addJobPart(tech, await access(tech, "job", usd.job.publicId, "parts:manage"), {
      job: usd.job.publicId, description: "Chain", partNumber: null, supplier: null, qty: "1", cost: "1,200", status: "needed", expectedOn: null, forWork: { findingId: null, noOkNeeded: true },
    });
    expect((await k("job_parts").where({ id: part.id }).first())!.cost_minor).toBe(120_000);
  });
});
