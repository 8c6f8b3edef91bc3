import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Knex } from "knex";
import { insertTorqueRecord, listTeardownSteps, listTorqueRecords } from "@/db/queries/bench";
import { listTimeline } from "@/db/queries/journal";
import { checklistFromSteps, isTorqueBody, torqueProof } from "@/lib/bench";
import type { Actor } from "@/lib/permissions";
import { stepTorqueSchema, teardownStepSchema, torqueRecordSchema } from "@/lib/schemas/bench";
import { access } from "@/lib/server/access";
import { addTeardownStep, recordTorque, setTeardownTorque } from "@/lib/server/bench";
import { summarizeEntry } from "@/lib/server/emails/entry-summary";
import { todayIn, toolLine, wrenchRangeFlags } from "@/lib/torque-special";
import { makeCustomerWithJobs, makeShop } from "../support/fixtures";
import { testKnex } from "../support/db";

// Issue 18 §3–4 on the record path: the form's text through its schema and the server, into
// MariaDB, and out to staff, the owner's timeline and e-mail; refusals write nothing.
type Shop = Awaited<ReturnType<typeof makeShop>>;
const TZ = "America/Denver";
const DAY = 86_400_000;
/** A date `days` from today where the shop is. */
const dayFromToday = (days: number) => todayIn(TZ, new Date(Date.now() + days * DAY));

describe("torque records: the wrench, torque-angle and special fasteners", () => {
  let k: Knex;
  let shop: Shop;
  let tech: Actor;
  let job: { id: number; publicId: string };

  const found = () => access(tech, "job", job.publicId, "bench:record");
  const logTorque = async (form: Record<string, string>) => recordTorque(tech, await found(), torqueRecordSchema.parse({ job: job.publicId, ...form }));
  const counts = async () => ({
    records: Number((await k("torque_records").where({ job_id: job.id }).count({ n: "*" }).first())!.n),
    entries: Number((await k("journal_entries").where({ job_id: job.id }).count({ n: "*" }).first())!.n),
  });

  beforeAll(async () => {
    k = testKnex();
    shop = await makeShop(k, { label: "torque-special", roles: ["owner", "technician"] });
    await k("shops").where({ id: shop.id }).update({ currency: "USD", timezone: TZ });
    const made = await makeCustomerWithJobs(k, shop.id, { name: "Wren Halloway", statuses: ["in_progress"] });
    job = { id: made.jobIds[0]!, publicId: String((await k("jobs").where({ id: made.jobIds[0]! }).first("public_id"))!.public_id) };
    tech = { userId: shop.staff.technician!.id, email: shop.staff.technician!.email, name: "technician", memberships: [{ shopId: shop.id, shopSlug: shop.slug, shopName: shop.slug, role: "technician" }] };
  });
  afterAll(async () => k?.destroy());

  it("records the tool, its serial, calibration date and maximum, and a 20 N·m + 90° step, for staff, the owner and e-mail", async () => {
    const calibratedOn = dayFromToday(-400);
    const made = await logTorque({
      fastener: "Cylinder head bolts, 4 × M10 10.9",
      specValue: "20",
      unit: "nm",
      appliedValue: "20",
      tool: "3/8 click wrench",
      toolSerial: "TW-0427",
      calibratedOn,
      wrenchMax: "100",
      wrenchMaxUnit: "",
      angleStages: "90",
      angleDone: "on",
      lubrication: "oiled",
      oneTime: "on",
      passesDone: "on",
      share: "on",
    });
    const row = (await k("torque_records").where({ id: made.id }).first())!;
    expect([row.tool_serial, row.calibrated_on, Number(row.wrench_max_value), row.wrench_max_unit, JSON.parse(row.angle_stages!), row.angle_done, row.lubrication, row.one_time]).toEqual([
      "TW-0427",
      calibratedOn,
      100,
      "nm",
      [90],
      1,
      "oiled",
      1,
    ]);

    const staff = (await listTorqueRecords({ shopId: shop.id, jobId: job.id })).find((r) => r.id === made.id)!;
    expect(staff).toMatchObject({ toolSerial: "TW-0427", calibratedOn, wrenchMax: { value: 100, unit: "nm" }, angleStages: [90], angleDone: true, lubrication: "oiled", oneTime: true });
    // 400 days before the day it was used: over a year (ISO 6789 default interval of 12 months, from memory, unverified).
    expect(toolLine(staff, todayIn(TZ))).toBe(`Tool: 3/8 click wrench · serial TW-0427 · calibrated ${calibratedOn} (calibration over a year old) · maximum 100.0 N·m`);
    // Passes of 20 N·m at 30 / 60 / 100 % are 6, 12 and 20 N·m; 20 % of a 100 N·m wrench is 20 N·m
    // (ISO 6789-2 calibration points, REFERENCES.md §9, from memory): passes 1 and 2 are flagged.
    expect(wrenchRangeFlags(staff)[0]).toMatch(/^Passes 1 \(30 %, 6\.0 N·m\) and 2 \(60 %, 12\.0 N·m\) are below 20 % of the wrench's 100\.0 N·m maximum/);

    const owner = await listTimeline({ shopId: shop.id, jobId: job.id, audience: "owner", order: "desc", limit: 50 });
    const entry = owner.entries.find((e) => e.kind === "torque" && isTorqueBody(e.body) && e.body.fastener.startsWith("Cylinder head"))!;
    expect(isTorqueBody(entry.body) && torqueProof(entry.body)).toMatch(/; then \+ 90° by angle, done; threads oiled; one-time \(torque-to-yield\) fasteners: replace with new, never re-use$/);
    // The e-mail says the wrench facts the views show (tests/unit/entry-summary-torque.test.ts).
    expect(summarizeEntry({ kind: "torque", body: entry.body, caption: null, photoCount: 0, usedOn: todayIn(TZ) }).text!.split("\n")).toEqual([
      "Cylinder head bolts, 4 × M10 10.9: Torqued to 20.0 N·m, within ±4 % of the 20.0 N·m spec; then + 90° by angle, done; threads oiled; one-time (torque-to-yield) fasteners: replace with new, never re-use",
      toolLine(staff, todayIn(TZ)),
      `Outside the wrench's range: ${wrenchRangeFlags(staff)[0]}.`,
    ]);
  });

  it("refuses a calibration date after today (the shop's day) beside its field, writing nothing", async () => {
    const before = await counts();
    await expect(logTorque({ fastener: "Sprocket nuts", specValue: "40", unit: "nm", tool: "1/2 click wrench", toolSerial: "TW-9", calibratedOn: dayFromToday(2) })).rejects.toMatchObject({
      code: "invalid",
      fields: { calibratedOn: [`The calibration date can’t be after today (${todayIn(TZ)}): use the date on the wrench’s calibration certificate.`] },
    });
    expect(await counts()).toEqual(before);
  });

  it("refuses a loosen-and-retorque tick without its sequence, “other” threads without what, and a bad angle, writing nothing", async () => {
    const before = await counts();
    const base = { fastener: "Crank pulley bolt", specValue: "40", unit: "nm" };
    await expect(logTorque({ ...base, loosenRetorque: "on" })).rejects.toMatchObject({ fields: { retorqueSequence: [expect.stringContaining("Say how it is loosened and retorqued")] } });
    await expect(logTorque({ ...base, lubrication: "other" })).rejects.toMatchObject({ fields: { lubricationOther: ["Say what was on the threads, e.g. “molybdenum paste”."] } });
    await expect(logTorque({ ...base, angleStages: "90 + 400" })).rejects.toMatchObject({ fields: { angleStages: ["Angle stage 2 (degrees) must be at most 360."] } });
    await expect(logTorque({ ...base, wrenchMax: "1,2" })).rejects.toMatchObject({ fields: { wrenchMax: [expect.stringContaining("write 1.2")] } });
    expect(await counts()).toEqual(before);
    // With its sequence it is recorded and said.
    const made = await logTorque({ ...base, retorqueSequence: "loosen 180°, retorque to 40 N·m" });
    const rec = (await listTorqueRecords({ shopId: shop.id, jobId: job.id })).find((r) => r.id === made.id)!;
    expect(torqueProof({ ...rec, displayUnit: "nm" })).toMatch(/; loosened and retorqued \(loosen 180°, retorque to 40 N·m\)$/);
  });

  it("reads a record written before migration 27 as before", async () => {
    const body = { fastener: "Old cover bolts", specValue: 10, unit: "nm" as const, appliedValue: null, tool: "beam wrench", passPercents: [30, 60, 100], boltCount: null, pattern: null, note: null, displayUnit: "nm" as const };
    const made = await insertTorqueRecord({ shopId: shop.id, jobId: job.id, userId: tech.userId, visibility: "shop", body });
    const rec = (await listTorqueRecords({ shopId: shop.id, jobId: job.id })).find((r) => r.id === made.id)!;
    expect([rec.toolSerial, rec.calibratedOn, rec.wrenchMax, rec.angleStages, rec.lubrication, rec.oneTime]).toEqual([null, null, null, null, null, null]);
    expect(torqueProof(rec)).toBe(torqueProof(body));
    expect(toolLine(rec, "2026-12-05")).toBe("Tool: beam wrench");
  });

  it("a one-time (torque-to-yield) step torque puts “replace with new” on its checklist item; its plausibility is checked like a record's", async () => {
    const f = await found();
    const head = await addTeardownStep(tech, f, teardownStepSchema.parse({ job: job.publicId, removed: "Cylinder head bolts", count: "4", size: "M6" }));
    const cover = await addTeardownStep(tech, f, teardownStepSchema.parse({ job: job.publicId, removed: "Cam cover", count: "6" }));
    const step = (form: Record<string, string>) => setTeardownTorque(tech, f, stepTorqueSchema.parse({ job: job.publicId, step: String(head.id), torqueUnit: "nm", ...form }));
    // 96 lbf·ft on an M6 (NIST SP 811 App. B.9: 130.2 N·m): the same warning and confirm as a torque record; nothing saved until ticked.
    await expect(step({ torqueValue: "96", torqueUnit: "lbf_ft", oneTime: "on" })).rejects.toMatchObject({ fields: { torqueValue: [expect.stringMatching(/did you mean 96\.0 lbf·in = 10\.8 N·m\?\. Check the number/)] } });
    expect((await k("teardown_steps").where({ id: head.id }).first())!.torque_value).toBeNull();
    await expect(step({ torqueValue: "10", angleStages: "ninety" })).rejects.toMatchObject({ fields: { angleStages: [expect.stringContaining("Write the angle in degrees")] } });

    await step({ torqueValue: "10", angleStages: "90 + 90", lubrication: "oiled", oneTime: "on" });
    await setTeardownTorque(tech, f, stepTorqueSchema.parse({ job: job.publicId, step: String(cover.id), torqueValue: "10", torqueUnit: "nm" }));
    const steps = await listTeardownSteps({ shopId: shop.id, jobId: job.id });
    const items = checklistFromSteps(steps, [30, 60, 100]);
    const headItem = items.find((i) => i.id === head.id)!;
    const coverItem = items.find((i) => i.id === cover.id)!;
    expect(headItem).toMatchObject({ replaceWithNew: true, torque: { value: 10, angleStages: [90, 90], lubrication: "oiled", oneTime: true } });
    expect(coverItem).toMatchObject({ replaceWithNew: false, torque: { angleStages: [], lubrication: null, oneTime: false } });
    // The value the maker's manual gives is taken once someone has looked.
    await step({ torqueValue: "96", torqueUnit: "lbf_ft", plausibleChecked: "on", oneTime: "on" });
    expect(Number((await k("teardown_steps").where({ id: head.id }).first())!.torque_value)).toBe(96);
  });
});
