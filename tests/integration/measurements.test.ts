import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Knex } from "knex";
import { listMachineMeasurements, listMeasurementSets } from "@/db/queries/measurements";
import { groupTrends } from "@/lib/measurement-trends";
import { typedText } from "@/lib/measurements";
import type { Action, Actor } from "@/lib/permissions";
import { access } from "@/lib/server/access";
import { requestView } from "@/lib/server/approval-views";
import { sendRequest } from "@/lib/server/approvals";
import { saveFinding } from "@/lib/server/findings";
import { type MeasurementSetData, draftFindingFromSet, recordMeasurementSet } from "@/lib/server/measurements";
import { makeCustomerWithJobs, makeShop } from "../support/fixtures";
import { testKnex } from "../support/db";

// Measurement sets on real MariaDB (issue 18 §5): a valve set with one valve out → draft finding →
// the owner's view of the request shows the limit and its source; trends across two jobs of one
// machine; a negative value refused with nothing written.

type Shop = Awaited<ReturnType<typeof makeShop>>;
const staff = (shop: Shop, role: "owner" | "technician" | "service_writer"): Actor => ({
  userId: shop.staff[role]!.id,
  email: shop.staff[role]!.email,
  name: role,
  memberships: [{ shopId: shop.id, shopSlug: shop.slug, shopName: shop.slug, role }],
});

const SOURCE = "maker's manual p. 3-14";
/** Cylinder 1: intake 0.10–0.20 mm, exhaust 0.20–0.30 mm; the left exhaust valve is tight at 0.12. */
const valveSet = (job: string, exhaustLeft = "0.12"): MeasurementSetData => ({
  job,
  kind: "valve_clearance",
  unit: "mm",
  min: "0.10",
  max: "0.20",
  exhaustMin: "0.20",
  exhaustMax: "0.30",
  source: SOURCE,
  note: null,
  rows: [
    { row: 0, cylinder: 1, side: "intake", label: "left", value: "0.15", oldShim: null },
    { row: 1, cylinder: 1, side: "intake", label: "right", value: "0.20", oldShim: null },
    { row: 2, cylinder: 1, side: "exhaust", label: "left", value: exhaustLeft, oldShim: "2.50" },
    { row: 3, cylinder: 1, side: "exhaust", label: "right", value: "0.25", oldShim: "2.45" },
  ],
});

describe("measurement sets", () => {
  let k: Knex;
  let shop: Shop;
  let tech: Actor;
  let writer: Actor;
  let owner: Actor;
  let machineId: number;
  const jobs: { id: number; publicId: string }[] = [];
  const onJob = (actor: Actor, publicId: string, permission: Action) => access(actor, "job", publicId, permission);
  const counts = async (jobId: number) => ({
    sets: Number((await k("measurement_sets").where({ job_id: jobId }).count({ n: "*" }).first())?.n),
    items: Number((await k("measurement_items as i").join("measurement_sets as s", "s.id", "i.set_id").where({ "s.job_id": jobId }).count({ n: "*" }).first())?.n),
    entries: Number((await k("journal_entries").where({ job_id: jobId }).count({ n: "*" }).first())?.n),
    findings: Number((await k("findings").where({ job_id: jobId }).count({ n: "*" }).first())?.n),
  });

  beforeAll(async () => {
    k = testKnex();
    shop = await makeShop(k, { label: "measure", roles: ["owner", "technician", "service_writer"] });
    tech = staff(shop, "technician");
    writer = staff(shop, "service_writer");
    const email = `owner.${shop.slug}@mail.test`;
    const [userId] = await k("users").insert({ email, name: "Tamsin Reyes" });
    owner = { userId: Number(userId), email, name: "Tamsin Reyes", memberships: [] };
    const made = await makeCustomerWithJobs(k, shop.id, { name: "Tamsin Reyes", email, userId: Number(userId), statuses: ["inspecting", "inspecting", "inspecting"] });
    machineId = made.machineId;
    for (const id of made.jobIds) jobs.push({ id, publicId: String((await k("jobs").where({ id }).first("public_id"))!.public_id) });
  });
  afterAll(async () => k?.destroy());

  it("a valve set with one valve out: items judged and kept as typed, one shop-only entry, then a draft finding the owner sees with its limit", async () => {
    const job = jobs[0]!;
    const made = await recordMeasurementSet(tech, await onJob(tech, job.publicId, "bench:record"), valveSet(job.publicId));
    expect(made.out).toBe(1);

    const items = await k("measurement_items").where({ set_id: made.id }).orderBy("position");
    expect(items.map((i) => [i.item_key, i.verdict, i.value_decimals])).toEqual([
      ["intake:1:left", "within", 2],
      ["intake:1:right", "within", 2],
      ["exhaust:1:left", "below", 2],
      ["exhaust:1:right", "within", 2],
    ]);
    const entry = await k("journal_entries").where({ id: made.entryId }).first();
    expect(entry).toMatchObject({ kind: "reading", visibility: "shop", job_id: job.id });

    const [set] = await listMeasurementSets({ shopId: shop.id, jobId: job.id });
    // 0.20 stays 0.20: the resolution typed comes back.
    expect(set!.items.map((i) => typedText(i.value))).toEqual(["0.15", "0.20", "0.12", "0.25"]);

    const drafted = await draftFindingFromSet(tech, await onJob(tech, job.publicId, "approvals:draft"), made.id);
    expect(drafted.created).toBe(true);
    const finding = await k("findings").where({ id: drafted.findingId }).first();
    expect(finding!.title).toBe("Valve clearance: 1 of 4 out of limit");
    expect(finding!.found).toContain(`Exhaust, cyl 1, left: 0.12 mm — OUT OF LIMIT (under); limit 0.20–0.30 mm (${SOURCE})`);
    // common trade practice, no published source: 2.50 + 0.12 − 0.25 (middle of 0.20–0.30) = 2.37
    expect(finding!.found).toContain("suggested shim 2.37 mm");
    // Once per set: asking again answers the same draft and writes nothing.
    const again = await draftFindingFromSet(tech, await onJob(tech, job.publicId, "approvals:draft"), made.id);
    expect(again).toMatchObject({ findingId: drafted.findingId, created: false });
    expect((await counts(job.id)).findings).toBe(1);

    // The desk prices a line and sends; the owner's view of the request carries the limit and its source.
    const priced = await saveFinding(writer, await onJob(writer, job.publicId, "approvals:draft"), drafted.findingId, {
      version: 1,
      title: finding!.title,
      found: finding!.found,
      whyItMatters: finding!.why_it_matters,
      safety: "none",
      evidence: [],
      lines: [{ kind: "labour", description: "Re-shim the exhaust valve", partNumber: null, hours: "1.0", rate: "95.00" }],
    });
    const sent = await sendRequest(writer, await onJob(writer, job.publicId, "approvals:send"), drafted.findingId, { findingVersion: priced.version });
    const view = await requestView(owner, await access(owner, "request", sent.publicId, "job:view"), job.publicId);
    expect(view.snapshot.finding.found).toContain("limit 0.20–0.30 mm (maker's manual p. 3-14)");
    expect(view.snapshot.finding.found).toContain("OUT OF LIMIT (under)");
  });

  it("a set within every limit offers nothing to draft", async () => {
    const job = jobs[2]!;
    const made = await recordMeasurementSet(tech, await onJob(tech, job.publicId, "bench:record"), valveSet(job.publicId, "0.22"));
    expect(made.out).toBe(0);
    await expect(draftFindingFromSet(tech, await onJob(tech, job.publicId, "approvals:draft"), made.id)).rejects.toThrow(/nothing to draft/);
    expect((await counts(job.id)).findings).toBe(0);
  });

  it("a negative value, or a limit missing, is refused beside its field and nothing is half-written", async () => {
    const job = jobs[1]!;
    const before = await counts(job.id);
    const found = await onJob(tech, job.publicId, "bench:record");
    const negative = valveSet(job.publicId);
    negative.rows[3] = { ...negative.rows[3]!, value: "-0.05" };
    await expect(recordMeasurementSet(tech, found, negative)).rejects.toMatchObject({ code: "invalid", fields: { value3: [expect.stringMatching(/negative/)] } });
    await expect(recordMeasurementSet(tech, found, { ...valveSet(job.publicId), exhaustMax: null })).rejects.toMatchObject({ fields: { exhaustMax: [expect.stringMatching(/exhaust clearance range/)] } });
    // The one parser, in the shop's convention (USD: a point for decimals): "0,12" is refused with the spelling to use, never guessed.
    const comma = valveSet(job.publicId);
    comma.rows[0] = { ...comma.rows[0]!, value: "0,12" };
    await expect(recordMeasurementSet(tech, found, comma)).rejects.toMatchObject({ fields: { value0: [expect.stringMatching(/write 0\.12/)] } });
    // Limits the wrong way round.
    await expect(recordMeasurementSet(tech, found, { ...valveSet(job.publicId), min: "0.30", max: "0.10" })).rejects.toMatchObject({ fields: { min: ["The intake minimum can’t be above the intake maximum."] } });
    // A set of any other kind needs a limit, in a unit its kind is measured in.
    const disc = { ...valveSet(job.publicId), kind: "disc_thickness" as const, min: null, max: null, exhaustMin: null, exhaustMax: null, rows: [{ row: 0, cylinder: null, side: null, label: "Front disc", value: "4.4", oldShim: null }] };
    await expect(recordMeasurementSet(tech, found, disc)).rejects.toMatchObject({ fields: { min: [expect.stringMatching(/Type the limit/)] } });
    await expect(recordMeasurementSet(tech, found, { ...disc, min: "4.5", unit: "psi" })).rejects.toMatchObject({ fields: { unit: [expect.stringMatching(/recorded in mm/)] } });
    expect(await counts(job.id)).toEqual(before);
  });

  it("the same item across two jobs of one machine comes back as one trend, oldest first", async () => {
    const older = jobs[1]!;
    const leak = (job: string, value: string): MeasurementSetData => ({
      job,
      kind: "leak_down",
      unit: "%",
      min: null,
      max: "10",
      exhaustMin: null,
      exhaustMax: null,
      source: "maker's manual p. 2-8",
      note: null,
      rows: [{ row: 0, cylinder: null, side: null, label: "Cylinder 1", value, oldShim: null }],
    });
    await recordMeasurementSet(tech, await onJob(tech, older.publicId, "bench:record"), leak(older.publicId, "4.0"));
    // Dated apart so the order can't come from insertion alone.
    await k("measurement_sets").where({ job_id: older.id }).update({ created_at: new Date("2026-03-01T09:00:00Z") });
    await recordMeasurementSet(tech, await onJob(tech, jobs[2]!.publicId, "bench:record"), leak(jobs[2]!.publicId, "12.5"));

    const trends = groupTrends(await listMachineMeasurements({ shopId: shop.id, machineId }));
    const leakTrend = trends.find((t) => t.kind === "leak_down")!;
    expect(leakTrend.label).toBe("Leak-down: Cylinder 1");
    expect(leakTrend.points.map((p) => [p.jobNumber, typedText(p.value), p.verdict])).toEqual([
      [Number((await k("jobs").where({ id: older.id }).first("number"))!.number), "4.0", "within"],
      [Number((await k("jobs").where({ id: jobs[2]!.id }).first("number"))!.number), "12.5", "above"],
    ]);
    // The exhaust valve of cylinder 1 was measured on jobs 0 and 2: a trend of its own.
    expect(trends.find((t) => t.key === "exhaust:1:left")!.points.map((p) => typedText(p.value))).toEqual(["0.12", "0.22"]);
  });

  it("a valve's longest position still fits its label (cylinder, side and 120 characters typed)", async () => {
    const job = jobs[1]!;
    const long = valveSet(job.publicId);
    long.rows = [{ ...long.rows[0]!, cylinder: 12, side: "exhaust", label: "p".repeat(120) }];
    const made = await recordMeasurementSet(tech, await onJob(tech, job.publicId, "bench:record"), long);
    expect((await k("measurement_items").where({ set_id: made.id }).first())!.label).toBe(`Exhaust, cyl 12, ${"p".repeat(120)}`);
  });

  it("a job removed takes its sets and items with it, its drafted finding too", async () => {
    const job = jobs[0]!;
    const setIds = (await k("measurement_sets").where({ job_id: job.id }).pluck("id")) as number[];
    expect(setIds.length).toBe(1);
    await k("jobs").where({ id: job.id }).del();
    expect(await k("measurement_sets").where({ job_id: job.id }).first()).toBeUndefined();
    expect(await k("measurement_items").whereIn("set_id", setIds).first()).toBeUndefined();
    expect(await k("findings").where({ job_id: job.id }).first()).toBeUndefined();
  });
});
