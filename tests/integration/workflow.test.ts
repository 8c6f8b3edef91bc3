import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Knex } from "knex";
import { saveMoneySettings } from "@/db/queries/findings";
import { DEFAULT_MONEY_SETTINGS } from "@/lib/approvals";
import type { Action, Actor } from "@/lib/permissions";
import { access } from "@/lib/server/access";
import { answerRequest, recordDecision, sendRequest, withdrawRequest } from "@/lib/server/approvals";
import { addJobPart, changeJobPartStatus } from "@/lib/server/bench-parts";
import { addTeardownStep, tickTeardownStep } from "@/lib/server/bench";
import { createFinding } from "@/lib/server/findings";
import { recordCounterPayment } from "@/lib/server/invoice-payments";
import { createInvoice, issueInvoice } from "@/lib/server/invoices";
import { changeJobStatus } from "@/lib/server/journal";
import { type PricedLine, ownerWithJobs, staffActor } from "../support/authorised-work";
import { testKnex } from "../support/db";
import { makeShop } from "../support/fixtures";

// Issue 15: the job follows its events. Every event goes through the real writer; the test reads
// the job's status, its history (which event moved it, who caused it), the shop's event log and
// the outbox/alerts the owner would hear from.

type Shop = Awaited<ReturnType<typeof makeShop>>;
const on = (actor: Actor, job: string, permission: Action) => access(actor, "job", job, permission);
const meta = { ip: "203.0.113.9", userAgent: "vitest" };

describe("the job follows what happens", () => {
  let k: Knex;
  let shop: Shop;
  let writer: Actor;
  let tech: Actor;
  let owner: Actor;
  let jobs: { id: number; publicId: string }[];

  const status = async (jobId: number) => (await k("jobs").where({ id: jobId }).first("status"))!.status;
  const lastChange = async (jobId: number) => k("job_status_changes").where({ job_id: jobId }).orderBy("id", "desc").first();
  const events = (jobId: number, kind: string) => k("shop_events").where({ job_id: jobId, kind }).orderBy("id");

  async function send(jobPublicId: string, title: string, lines: PricedLine[]) {
    const made = await createFinding(writer, await on(writer, jobPublicId, "approvals:draft"), {
      title,
      found: `${title}: found on inspection.`,
      whyItMatters: null,
      safety: "none",
      evidence: [],
      lines: lines.map((l) => ({ ...l, partNumber: null })),
    });
    const sent = await sendRequest(writer, await on(writer, jobPublicId, "approvals:send"), made.id, { findingVersion: made.version });
    return { findingId: made.id, ...sent, lineCount: lines.length };
  }
  async function answer(sent: { publicId: string; hash: string; lineCount: number }, approve: number[]) {
    return answerRequest(
      owner,
      await access(owner, "request", sent.publicId, "approvals:answer"),
      { shownHash: sent.hash, lines: Array.from({ length: sent.lineCount }, (_, i) => ({ no: i + 1, answer: approve.includes(i) ? "approved" : "declined" })), signature: owner.name, wantsPartsBack: false, confirmed: true },
      meta,
    );
  }
  const part = async (jobPublicId: string, description: string, forWork: { findingId: number | null; noOkNeeded: boolean }) =>
    addJobPart(tech, await on(tech, jobPublicId, "parts:manage"), { job: jobPublicId, description, partNumber: null, supplier: null, qty: "1", cost: null, status: "ordered", expectedOn: null, forWork });

  beforeAll(async () => {
    k = testKnex();
    shop = await makeShop(k, { label: "workflow", roles: ["owner", "service_writer", "technician"] });
    writer = staffActor(shop, "service_writer");
    tech = staffActor(shop, "technician");
    await saveMoneySettings({ shopId: shop.id, settings: { ...DEFAULT_MONEY_SETTINGS, labourRateMinor: 10_000 } });
    ({ owner, jobs } = await ownerWithJobs(k, shop, 4));
  });
  afterAll(async () => k?.destroy());

  it("requests out → waits on the owner; the last answer in → back to work, with the cause, the person and an inbox item", async () => {
    const job = jobs[0]!;
    const chain = await send(job.publicId, "Cam chain stretched", [
      { kind: "part", description: "Cam chain", qty: "1", unitPrice: "48.00" },
      { kind: "labour", description: "Fit cam chain", hours: "2.0", rate: "100.00" },
    ]);
    expect(await status(job.id)).toBe("waiting_approval");
    expect(await lastChange(job.id)).toMatchObject({ from_status: "inspecting", to_status: "waiting_approval", cause: "request_sent", changed_by_user_id: writer.userId });
    const tyre = await send(job.publicId, "Rear tyre worn", [{ kind: "part", description: "Rear tyre", qty: "1", unitPrice: "95.00" }]);

    // The chain's priced line made its job part (issue 19); ordered before the owner said yes, it
    // doesn't wait the job, and the owner hears nothing about parts (no status entry, no alert).
    const linePart = await k("job_parts").where({ job_id: job.id, finding_id: chain.findingId, description: "Cam chain" }).whereNotNull("finding_line_id").first("id", "status");
    expect(linePart!.status).toBe("needed");
    const early = { id: Number(linePart!.id), ...(await changeJobPartStatus(tech, await on(tech, job.publicId, "parts:manage"), { part: Number(linePart!.id), from: "needed", to: "ordered", expectedOn: null })) };
    expect(early.jobMovedTo).toBeNull();
    expect(await status(job.id)).toBe("waiting_approval");
    expect(await k("job_alerts").where({ job_id: job.id, kind: "parts_in" })).toHaveLength(0);

    await answer(chain, [0, 1]);
    expect(await status(job.id)).toBe("waiting_approval"); // the tyre is still open
    // The last answer, given by phone to the desk: every line declined.
    await recordDecision(writer, await access(writer, "request", tyre.publicId, "approvals:record-decision"), {
      shownHash: tyre.hash,
      lines: [{ no: 1, answer: "declined" }],
      method: "phone",
      personName: owner.name,
      phoneCalled: "+1 555 0100",
      note: "Will replace it himself.",
      wantsPartsBack: false,
      decidedAt: new Date(),
    });
    // The chain's part is now for authorised work and still to come: the job waits on parts.
    expect(await status(job.id)).toBe("waiting_parts");
    expect(await lastChange(job.id)).toMatchObject({ from_status: "waiting_approval", to_status: "waiting_parts", cause: "request_answered", changed_by_user_id: writer.userId });
    const answered = await events(job.id, "owner_answered");
    expect(answered).toHaveLength(2);
    expect(answered.map((e) => Boolean(e.inbox))).toEqual([true, true]);
    const payload = (e: { payload: unknown }) => (typeof e.payload === "string" ? JSON.parse(e.payload) : e.payload);
    expect(payload(answered[0]!)).toMatchObject({ title: "Cam chain stretched", approved: ["Cam chain", "Fit cam chain"], declined: [], method: "online", amountMinor: 24_800, currency: "USD" });
    expect(payload(answered[0]!).detail).toBe("Approved: Cam chain, Fit cam chain.");
    expect(payload(answered[1]!)).toMatchObject({ title: "Rear tyre worn", approved: [], declined: ["Rear tyre"], method: "phone", detail: "Declined: Rear tyre." });
    expect(payload(answered[1]!).summary).toMatch(/answered “Rear tyre worn” \(by phone\)/);
    expect((await events(job.id, "status_moved")).length).toBeGreaterThanOrEqual(2);

    // The part arrives: back on the bench, and the owner hears at once.
    await changeJobPartStatus(tech, await on(tech, job.publicId, "parts:manage"), { part: early.id, from: "ordered", to: "received", expectedOn: null });
    expect(await status(job.id)).toBe("in_progress");
    expect(await lastChange(job.id)).toMatchObject({ cause: "part_received", changed_by_user_id: tech.userId });
    expect(await k("job_alerts").where({ job_id: job.id, kind: "parts_in" })).toHaveLength(1);
  });

  it("a part for booked work waits the job; reassembly finished makes it ready", async () => {
    const job = jobs[1]!;
    await changeJobStatus(tech, await on(tech, job.publicId, "job:change-status"), { from: "inspecting", to: "in_progress", note: null });
    const gasket = await part(job.publicId, "Base gasket", { findingId: null, noOkNeeded: true });
    expect(gasket.jobMovedTo).toBe("waiting_parts");
    expect(await lastChange(job.id)).toMatchObject({ cause: "part_needed" });
    await changeJobPartStatus(tech, await on(tech, job.publicId, "parts:manage"), { part: gasket.id, from: "ordered", to: "received", expectedOn: null });
    expect(await status(job.id)).toBe("in_progress");

    const bench = await on(tech, job.publicId, "bench:record");
    for (const removed of ["Seat", "Side panels"]) await addTeardownStep(tech, bench, { job: job.publicId, removed, count: null, size: null, notes: null, storage: null, photo: null });
    const steps = await k("teardown_steps").where({ job_id: job.id }).orderBy("id");
    expect((await tickTeardownStep(tech, bench, { step: steps[0]!.id, value: true })).jobMovedTo).toBeNull();
    expect((await tickTeardownStep(tech, bench, { step: steps[1]!.id, value: true })).jobMovedTo).toBe("ready");
    expect(await lastChange(job.id)).toMatchObject({ from_status: "in_progress", to_status: "ready", cause: "reassembly_finished" });
  });

  it("collection needs a paid invoice, or a reason that is recorded", async () => {
    const job = jobs[2]!;
    const sent = await send(job.publicId, "Carb clean", [{ kind: "fee", description: "Carb clean", amount: "60.00" }]);
    await answer(sent, [0]);
    expect(await status(job.id)).toBe("in_progress");
    await changeJobStatus(tech, await on(tech, job.publicId, "job:change-status"), { from: "in_progress", to: "ready", note: null });
    const collect = async (override: string | null) =>
      changeJobStatus(writer, await on(writer, job.publicId, "job:change-status"), { from: "ready", to: "picked_up", note: null, override });

    await expect(collect(null)).rejects.toThrow(/no invoice yet/);
    const money = await access(writer, "jobMoney", job.publicId, "invoice:create");
    const { publicId } = await createInvoice(writer, money);
    await expect(collect(null)).rejects.toThrow(/still a draft/);
    const editing = await access(writer, "invoice", publicId, "invoice:create");
    await issueInvoice(writer, editing, editing.invoice.version);
    await expect(collect(null)).rejects.toThrow(/isn't paid/);
    expect(await status(job.id)).toBe("ready");
    const taking = await access(writer, "invoice", publicId, "invoice:record-payment");
    await recordCounterPayment(writer, taking, { invoice: publicId, method: "cash", amount: "60.00", reference: null });
    await collect(null);
    expect(await status(job.id)).toBe("picked_up");
    expect(await lastChange(job.id)).toMatchObject({ to_status: "picked_up", cause: "collected", changed_by_user_id: writer.userId });

    // Another job, handed back unpaid with the desk's reason, which the history keeps.
    const other = jobs[3]!;
    await changeJobStatus(tech, await on(tech, other.publicId, "job:change-status"), { from: "inspecting", to: "ready", note: null });
    await expect(changeJobStatus(writer, await on(writer, other.publicId, "job:change-status"), { from: "ready", to: "picked_up", note: null, override: null })).rejects.toMatchObject({ code: "conflict" });
    await changeJobStatus(writer, await on(writer, other.publicId, "job:change-status"), { from: "ready", to: "picked_up", note: null, override: "Fleet customer, invoiced monthly" });
    expect(await lastChange(other.id)).toMatchObject({ to_status: "picked_up", note: "Handed back before payment: Fleet customer, invoiced monthly" });
  });

  it("a hand move off parts tells the owner nothing about parts; only the last part in does", async () => {
    const [job] = (await ownerWithJobs(k, shop, 1, "Cal Rusk")).jobs;
    await changeJobStatus(tech, await on(tech, job!.publicId, "job:change-status"), { from: "inspecting", to: "in_progress", note: null });
    const chain = await part(job!.publicId, "Drive chain", { findingId: null, noOkNeeded: true });
    expect(chain.jobMovedTo).toBe("waiting_parts");
    await changeJobStatus(tech, await on(tech, job!.publicId, "job:change-status"), { from: "waiting_parts", to: "in_progress", note: "Fitting the old chain for a test ride" });
    expect(await lastChange(job!.id)).toMatchObject({ cause: "manual" });
    expect(await k("job_alerts").where({ job_id: job!.id, kind: "parts_in" })).toHaveLength(0);
  });

  it("withdrawing the last open request takes the job off the owner", async () => {
    const [job] = (await ownerWithJobs(k, shop, 1, "Bo Fenn")).jobs;
    const sent = await send(job!.publicId, "Grips", [{ kind: "fee", description: "Heated grips", amount: "80.00" }]);
    expect(await status(job!.id)).toBe("waiting_approval");
    await withdrawRequest(writer, await access(writer, "request", sent.publicId, "approvals:send"), { reason: "Owner will decide at pick-up" });
    expect(await status(job!.id)).toBe("in_progress");
    expect(await lastChange(job!.id)).toMatchObject({ cause: "request_withdrawn" });
  });
});
