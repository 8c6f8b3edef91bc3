import crypto from "node:crypto";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Knex } from "knex";
import { getEvidencePhoto, listAuthorisedWork } from "@/db/queries/approvals";
import { saveMoneySettings } from "@/db/queries/findings";
import { DEFAULT_MONEY_SETTINGS } from "@/lib/approvals";
import { isMoneyKey, stripMoney } from "@/lib/money-fields";
import type { Action, Actor } from "@/lib/permissions";
import type { FindingInput } from "@/lib/schemas/approvals";
import { access } from "@/lib/server/access";
import { sha256Hex } from "@/lib/server/approval-hash";
import { ApprovalRefusal, answerRequest, recordDecision, sendRequest, withdrawRequest } from "@/lib/server/approvals";
import { jobApprovals, requestView } from "@/lib/server/approval-views";
import { createFinding, saveFinding } from "@/lib/server/findings";
import { seedIfEmpty } from "@/db/seeds/demo";
import { canonicalJson } from "@/lib/approvals";
import { makeCustomerWithJobs, makeShop } from "../support/fixtures";
import { freshDatabase, testKnex } from "../support/db";

type Shop = Awaited<ReturnType<typeof makeShop>>;
const staff = (shop: Shop, role: "owner" | "technician" | "service_writer"): Actor => ({
  userId: shop.staff[role]!.id,
  email: shop.staff[role]!.email,
  name: role,
  memberships: [{ shopId: shop.id, shopSlug: shop.slug, shopName: shop.slug, role }],
});
const meta = { ip: "203.0.113.7", userAgent: "vitest" };
// Resolve and check exactly as the route wrapper does before calling the lib/server function.
const onJob = (actor: Actor, publicId: string, permission: Action) => access(actor, "job", publicId, permission);
const onRequest = (actor: Actor, publicId: string, permission: Action) => access(actor, "request", publicId, permission);

/** Every key of a JSON-like value, at any depth. */
function allKeys(value: unknown): string[] {
  if (Array.isArray(value)) return value.flatMap(allKeys);
  if (value === null || typeof value !== "object" || value instanceof Date) return [];
  return Object.entries(value).flatMap(([key, v]) => [key, ...allKeys(v)]);
}

describe("approval requests", () => {
  let k: Knex;
  let shop: Shop;
  let owner: Actor;
  let tech: Actor;
  let writer: Actor;
  let jobs: { id: number; publicId: string }[];
  let photos: string[];

  // Three taxable parts at 8.25 % per line: REFERENCES §5 worked example ($19.99, $42.50, $6.99).
  const draft = (title: string, photoIds: string[] = []): FindingInput => ({
    title,
    found: "Front pads worn to 1 mm; rotor scored.",
    whyItMatters: "Braking distance grows and the rotor is being damaged.",
    safety: "brakes",
    evidence: photoIds.map((ref) => ({ kind: "photo" as const, ref, momentMs: null })),
    lines: [
      { kind: "part", description: "Front brake pads", partNumber: "FBP-220", qty: "1" },
      { kind: "part", description: "Front rotor", partNumber: "FRT-31", qty: "1" },
      { kind: "part", description: "Brake fluid, 250 ml", partNumber: null, qty: "1" },
    ],
  });
  const prices = (input: FindingInput, version: number, amounts = ["19.99", "42.50", "6.99"]): FindingInput => ({
    ...input,
    version,
    lines: input.lines.map((l, i) => ({ ...l, id: undefined, unitPrice: amounts[i] })),
  });

  async function priced(job: { publicId: string }, title: string, photoIds: string[] = []) {
    const made = await createFinding(tech, await onJob(tech, job.publicId, "approvals:draft"), draft(title, photoIds));
    const saved = await saveFinding(writer, await onJob(writer, job.publicId, "approvals:draft"), made.id, prices(draft(title, photoIds), made.version));
    return { id: made.id, version: saved.version };
  }

  beforeAll(async () => {
    k = testKnex();
    shop = await makeShop(k, { label: "approvals", roles: ["owner", "technician", "service_writer"] });
    const email = `ruth.${shop.slug}@mail.test`;
    const [userId] = await k("users").insert({ email, name: "Ada Marsh" });
    const made = await makeCustomerWithJobs(k, shop.id, { name: "Ada Marsh", email, userId: Number(userId), statuses: ["inspecting", "waiting_approval", "ready", "inspecting"] });
    jobs = await Promise.all(made.jobIds.map(async (id) => ({ id, publicId: String((await k("jobs").where({ id }).first("public_id"))!.public_id) })));
    owner = { userId: Number(userId), email, name: "Ada Marsh", memberships: [] };
    tech = staff(shop, "technician");
    writer = staff(shop, "service_writer");
    await saveMoneySettings({ shopId: shop.id, settings: { ...DEFAULT_MONEY_SETTINGS, labourRateMinor: 10_000, tax: { ratePercent: "8.25", method: "per_line" } } });
    // Two posted photos on job 0, the first is evidence.
    const [entryId] = await k("journal_entries").insert({ shop_id: shop.id, job_id: jobs[0]!.id, kind: "photos", visibility: "shop" });
    photos = [0, 1].map(() => crypto.randomBytes(16).toString("base64url").slice(0, 22));
    for (const [position, public_id] of photos.entries()) {
      await k("photos").insert({ public_id, shop_id: shop.id, job_id: jobs[0]!.id, entry_id: entryId, position, display_key: `d/${public_id}`, thumb_key: `t/${public_id}`, width: 800, height: 600, bytes: 1000 });
    }
  });
  afterAll(async () => k?.destroy());

  it("a technician drafts without prices; the desk prices and sends: job waits on the owner, shared entry without prices, mail and reminder queued", async () => {
    const job = jobs[0]!;
    const techDraft = await onJob(tech, job.publicId, "approvals:draft");
    const made = await createFinding(tech, techDraft, draft("Front brakes", [photos[0]!]));
    // A technician may draft but not price (the finding refuses the prices) nor send (the declaration refuses).
    await expect(saveFinding(tech, techDraft, made.id, prices(draft("Front brakes"), 1))).rejects.toMatchObject({ code: "forbidden" });
    await expect(onJob(tech, job.publicId, "approvals:send")).rejects.toMatchObject({ code: "forbidden" });
    const writerSend = await onJob(writer, job.publicId, "approvals:send");
    await expect(sendRequest(writer, writerSend, made.id, { findingVersion: 1 })).rejects.toThrow(/no unit price yet/);
    const saved = await saveFinding(writer, await onJob(writer, job.publicId, "approvals:draft"), made.id, prices(draft("Front brakes", [photos[0]!]), 1));

    const sent = await sendRequest(writer, writerSend, made.id, { findingVersion: saved.version });
    const row = await k("approval_requests").where({ public_id: sent.publicId }).first();
    expect(row!.status).toBe("sent");
    expect(row!.hash).toBe(sha256Hex(row!.canonical));
    expect(row!.estimate_tax_minor).toBe(574); // SSUTA §324 / RCW 82.08.054: 1.65 + 3.51 + 0.58 (REFERENCES §5, per line)
    expect(row!.estimate_total_minor).toBe(6948 + 574); // REFERENCES §5: 69.48 + 5.74
    expect((await k("jobs").where({ id: job.id }).first("status"))!.status).toBe("waiting_approval");

    const entry = await k("journal_entries").where({ job_id: job.id, kind: "approval" }).first();
    expect(entry!.visibility).toBe("shared");
    // Followers read this entry: no amounts in it at all.
    expect(JSON.stringify(entry!.body)).not.toMatch(/Minor|19\.99|1999|price/i);

    const mails = await k("outbox").where({ dedupe_scope: shop.id }).whereIn("dedupe_key", [`approval:${sent.publicId}`, `approval-reminder:${sent.publicId}`]).orderBy("id");
    expect(mails.map((m) => m.kind)).toEqual(["approval", "approval-reminder"]);
    expect(mails[0]!.to_email).toBe(owner.email);
    expect(mails[0]!.text).toContain("$19.99");
    expect(mails[0]!.html).toContain(`/my/jobs/${job.publicId}/approvals/${sent.publicId}`);
    expect(mails[0]!.html).toContain(`/api/approvals/${sent.publicId}/evidence/${photos[0]}/thumb?t=`);
    // Followers are alerted at once, without the title or prices (the owner has their own mail).
    const alert = await k("job_alerts").where({ job_id: job.id, dedupe_key: `approval:${sent.publicId}` }).first();
    expect(alert!.kind).toBe("approval_request");
    expect(JSON.stringify(alert!.payload)).not.toMatch(/Front brakes|\$|Minor/);
    const delayMs = new Date(mails[1]!.next_attempt_at).getTime() - new Date(mails[0]!.next_attempt_at).getTime();
    expect(Math.abs(delayMs - 24 * 3_600_000)).toBeLessThan(60_000);
    // The e-mail token opens exactly the request's evidence.
    const token = /thumb\?t=([A-Za-z0-9_-]+)/.exec(mails[0]!.html)![1]!;
    expect(sha256Hex(token)).toBe(row!.token_hash);
    expect(await getEvidencePhoto({ requestId: row!.id, photoPublicId: photos[0]! })).not.toBeNull();
    expect(await getEvidencePhoto({ requestId: row!.id, photoPublicId: photos[1]! })).toBeNull();
  });

  it("a send whose e-mail can't be queued leaves nothing behind (one transaction)", async () => {
    const job = jobs[3]!;
    const f = await priced(job, "Throttle cable frayed");
    const customer = await k("jobs").where({ id: job.id }).first("customer_id");
    await k("customers").where({ id: customer!.customer_id }).update({ email: "not an address" });
    try {
      await expect(sendRequest(writer, await onJob(writer, job.publicId, "approvals:send"), f.id, { findingVersion: f.version })).rejects.toThrow(/not an e-mail address/);
    } finally {
      await k("customers").where({ id: customer!.customer_id }).update({ email: owner.email });
    }
    expect(await k("approval_requests").where({ finding_id: f.id })).toHaveLength(0);
    expect((await k("jobs").where({ id: job.id }).first("status"))!.status).toBe("inspecting");
    expect(await k("journal_entries").where({ job_id: job.id, kind: "approval" })).toHaveLength(0);
  });

  it("a job that can't go to waiting on approval says so; one already waiting stays there", async () => {
    const ready = await priced(jobs[2]!, "Chain worn");
    await expect(sendRequest(writer, await onJob(writer, jobs[2]!.publicId, "approvals:send"), ready.id, { findingVersion: ready.version })).rejects.toThrow(
      /can't be sent while the job is "Ready to collect"/,
    );
    const waiting = await priced(jobs[1]!, "Second finding while one is open");
    await sendRequest(writer, await onJob(writer, jobs[1]!.publicId, "approvals:send"), waiting.id, { findingVersion: waiting.version });
    expect((await k("jobs").where({ id: jobs[1]!.id }).first("status"))!.status).toBe("waiting_approval");
    expect(await k("job_status_changes").where({ job_id: jobs[1]!.id })).toHaveLength(0);
  });

  it("50 answers at once: exactly one decision; every other one hears it was already answered, with the stored decision", async () => {
    const f = await priced(jobs[1]!, "Rear shock leaking");
    const sent = await sendRequest(writer, await onJob(writer, jobs[1]!.publicId, "approvals:send"), f.id, { findingVersion: f.version });
    const body = (n: number) => ({ shownHash: sent.hash, lines: [1, 2, 3].map((no) => ({ no, answer: (no + n) % 2 ? "approved" : "declined" }) as const), signature: "Ada Marsh", wantsPartsBack: false, confirmed: true as const });
    const answering = await onRequest(owner, sent.publicId, "approvals:answer");
    const results = await Promise.allSettled(Array.from({ length: 50 }, (_, n) => answerRequest(owner, answering, body(n), meta)));
    const request = await k("approval_requests").where({ public_id: sent.publicId }).first();
    expect(await k("approval_decisions").where({ request_id: request!.id })).toHaveLength(1);
    expect(results.filter((r) => r.status === "fulfilled")).toHaveLength(1);
    const losers = results.filter((r): r is PromiseRejectedResult => r.status === "rejected");
    expect(losers).toHaveLength(49);
    for (const l of losers) {
      expect(l.reason).toBeInstanceOf(ApprovalRefusal);
      expect(l.reason.details.reason).toBe("answered");
      expect(l.reason.details.decision.requestId).toBe(request!.id);
    }
    expect(request!.status).toBe("answered");
  });

  it("approved lines become authorised work, declined ones are kept; totals and hash recorded; the reminder is dropped", async () => {
    const job = jobs[0]!;
    const sent = (await k("approval_requests").where({ job_id: job.id, status: "sent" }).first())!;
    await expect(onRequest(writer, sent.public_id, "approvals:answer")).rejects.toMatchObject({ code: "forbidden" });
    const answering = await onRequest(owner, sent.public_id, "approvals:answer");
    await expect(answerRequest(owner, answering, { shownHash: sent.hash, lines: [{ no: 1, answer: "approved" }], signature: "Ada Marsh", wantsPartsBack: false, confirmed: true }, meta)).rejects.toMatchObject({
      code: "invalid",
      fields: { "lines.2": expect.any(Array), "lines.3": expect.any(Array) },
    });
    const lines = [{ no: 1, answer: "approved" }, { no: 2, answer: "declined" }, { no: 3, answer: "approved" }] as const;
    const { decision } = await answerRequest(owner, answering, { shownHash: sent.hash, lines: [...lines], signature: "Ada Marsh", wantsPartsBack: true, confirmed: true }, meta);
    expect(decision.authorisedPreTaxMinor).toBe(1999 + 699); // approved lines only
    expect(decision.authorisedTaxMinor).toBe(165 + 58); // SSUTA §324 / RCW 82.08.054 per line: 1.65 + 0.58 (REFERENCES §5)
    expect(decision.shownHash).toBe(sha256Hex(sent.canonical));
    const row = await k("approval_decisions").where({ request_id: sent.id }).first();
    expect(row).toMatchObject({ method: "online", signature_name: "Ada Marsh", wants_parts_back: 1, ip: meta.ip, user_agent: "vitest" });
    const work = await listAuthorisedWork({ shopId: shop.id, jobId: job.id });
    expect(work.map((w) => w.description)).toEqual(["Front brake pads", "Brake fluid, 250 ml"]);
    expect(await k("outbox").where({ dedupe_scope: shop.id, dedupe_key: `approval-reminder:${sent.public_id}` })).toHaveLength(0);
    const overview = await jobApprovals((await onJob(writer, job.publicId, "journal:view-shop-only")).job);
    expect(overview.authorised.preTaxMinor).toBe(2698);
    expect(overview.declined.map((d) => d.description)).toEqual(["Front rotor"]);
    // An answered finding is closed.
    await expect(saveFinding(writer, await onJob(writer, job.publicId, "approvals:draft"), Number(sent.finding_id), prices(draft("x"), 2))).rejects.toMatchObject({ code: "conflict" });
  });

  it("a technician gets the approvals overview and the request without any amount (issue 22, item 6)", async () => {
    // Job 0 now has an answered request: two lines approved, one declined (the test above).
    const job = jobs[0]!;
    const techJob = await onJob(tech, job.publicId, "journal:view-shop-only");
    const deskJob = await onJob(writer, job.publicId, "journal:view-shop-only");
    expect(techJob.mayViewMoney).toBe(false);
    expect(deskJob.mayViewMoney).toBe(true);
    const overview = await jobApprovals(deskJob.job);
    // The desk's copy has the amounts (REFERENCES §5 worked example: $19.99 + $6.99 approved).
    expect(overview.authorised.preTaxMinor).toBe(1999 + 699);
    expect(allKeys(overview).some(isMoneyKey)).toBe(true);

    // What the route wrapper sends a technician (lib/route.ts strips money when mayViewMoney is false).
    const seen = stripMoney(await jobApprovals(techJob.job));
    expect(allKeys(seen).filter(isMoneyKey)).toEqual([]);
    expect(JSON.stringify(seen)).not.toMatch(/1999|2698|\$|Minor|warnings/);
    // …but still what the bench needs: the findings, where each request stands, what was approved or declined.
    expect(seen.findings.map((f) => f.title)).toContain("Front brakes");
    const brakes = seen.findings.find((f) => f.title === "Front brakes")!;
    expect(brakes.state).toBe("answered");
    expect(brakes.requests[0]!.decision).toMatchObject({ approved: 2, declined: 1 });
    expect(seen.authorised.lines.map((l) => l.description)).toEqual(["Front brake pads", "Brake fluid, 250 ml"]);
    expect(seen.declined.map((l) => l.description)).toEqual(["Front rotor"]);

    // The request itself, by its id: the technician may look, without prices.
    const sent = (await k("approval_requests").where({ job_id: job.id, status: "answered" }).first("public_id"))!;
    const techRequest = await onRequest(tech, sent.public_id, "job:view");
    expect(techRequest.mayViewMoney).toBe(false);
    const view = await requestView(tech, techRequest, job.publicId);
    expect(view.mayViewMoney).toBe(false);
    const request = stripMoney(view);
    expect(allKeys(request).filter(isMoneyKey)).toEqual([]);
    expect(request.decision?.lines.map((l) => l.answer)).toEqual(["approved", "declined", "approved"]);
    expect(request.snapshot.lines.map((l) => l.description)).toEqual(["Front brake pads", "Front rotor", "Brake fluid, 250 ml"]);
  });

  it("a request changed after it was sent is refused, and so is an answer to a version the owner didn't see", async () => {
    const f = await priced(jobs[1]!, "Front wheel bearing");
    const sent = await sendRequest(writer, await onJob(writer, jobs[1]!.publicId, "approvals:send"), f.id, { findingVersion: f.version });
    const answer = { lines: [1, 2, 3].map((no) => ({ no, answer: "approved" as const })), signature: "Ada Marsh", wantsPartsBack: false, confirmed: true as const };
    const answering = await onRequest(owner, sent.publicId, "approvals:answer");
    await expect(answerRequest(owner, answering, { ...answer, shownHash: "0".repeat(64) }, meta)).rejects.toMatchObject({ details: { reason: "changed", current: sent.publicId } });
    const row = await k("approval_requests").where({ public_id: sent.publicId }).first();
    await k("approval_requests").where({ id: row!.id }).update({ canonical: row!.canonical.replace("1999", "999") });
    await expect(answerRequest(owner, answering, { ...answer, shownHash: sent.hash }, meta)).rejects.toThrow(/no longer matches what the shop sent/);
    expect(await k("approval_decisions").where({ request_id: row!.id })).toHaveLength(0);
  });

  it("a withdrawn request can't be answered; its reminder is dropped", async () => {
    const f = await priced(jobs[1]!, "Coolant hose cracked");
    const sent = await sendRequest(writer, await onJob(writer, jobs[1]!.publicId, "approvals:send"), f.id, { findingVersion: f.version });
    await expect(onRequest(tech, sent.publicId, "approvals:send")).rejects.toMatchObject({ code: "forbidden" });
    await withdrawRequest(writer, await onRequest(writer, sent.publicId, "approvals:send"), { reason: "Found a used part instead" });
    const answer = { shownHash: sent.hash, lines: [1, 2, 3].map((no) => ({ no, answer: "approved" as const })), signature: "Ada Marsh", wantsPartsBack: false, confirmed: true as const };
    await expect(answerRequest(owner, await onRequest(owner, sent.publicId, "approvals:answer"), answer, meta)).rejects.toMatchObject({ details: { reason: "withdrawn" } });
    await expect(withdrawRequest(writer, await onRequest(writer, sent.publicId, "approvals:send"), { reason: null })).rejects.toMatchObject({ code: "conflict" });
    expect(await k("outbox").where({ dedupe_scope: shop.id, dedupe_key: `approval-reminder:${sent.publicId}` })).toHaveLength(0);
  });

  it("a revision replaces the open request: the old one is refused and points at the current one", async () => {
    const f = await priced(jobs[1]!, "Brake lever bent");
    const sending = await onJob(writer, jobs[1]!.publicId, "approvals:send");
    const first = await sendRequest(writer, sending, f.id, { findingVersion: f.version });
    await expect(sendRequest(writer, sending, f.id, { findingVersion: f.version })).rejects.toThrow(/Nothing has changed since version 1/);
    const revised = await saveFinding(writer, await onJob(writer, jobs[1]!.publicId, "approvals:draft"), f.id, prices(draft("Brake lever bent"), f.version, ["19.99", "40.00", "6.99"]));
    const second = await sendRequest(writer, sending, f.id, { findingVersion: revised.version });
    const old = await k("approval_requests").where({ public_id: first.publicId }).first();
    expect(old!.status).toBe("replaced");
    const answer = { shownHash: first.hash, lines: [1, 2, 3].map((no) => ({ no, answer: "approved" as const })), signature: "Ada Marsh", wantsPartsBack: false, confirmed: true as const };
    await expect(answerRequest(owner, await onRequest(owner, first.publicId, "approvals:answer"), answer, meta)).rejects.toMatchObject({ details: { reason: "replaced", current: second.publicId } });
    const view = await requestView(owner, await onRequest(owner, first.publicId, "job:view"), jobs[1]!.publicId);
    expect(view.current).toBe(second.publicId);
  });

  it("the desk records a phone answer with who, when and the number called", async () => {
    const f = await priced(jobs[1]!, "Steering stem bearing notchy");
    const sent = await sendRequest(writer, await onJob(writer, jobs[1]!.publicId, "approvals:send"), f.id, { findingVersion: f.version });
    const base = { shownHash: sent.hash, lines: [1, 2, 3].map((no) => ({ no, answer: (no === 2 ? "declined" : "approved") as "approved" | "declined" })), personName: "Ada Marsh", note: null, wantsPartsBack: false };
    const decidedAt = new Date(Date.now() - 60_000);
    await expect(onRequest(tech, sent.publicId, "approvals:record-decision")).rejects.toMatchObject({ code: "forbidden" });
    const recording = await onRequest(writer, sent.publicId, "approvals:record-decision");
    await expect(recordDecision(writer, recording, { ...base, method: "phone", phoneCalled: "+1 555 013 2290", decidedAt: new Date(Date.now() + 3_600_000) })).rejects.toMatchObject({
      fields: { decidedAt: expect.any(Array) },
    });
    await recordDecision(writer, recording, { ...base, method: "phone", phoneCalled: "+1 555 013 2290", decidedAt });
    const row = await k("approval_decisions as d").join("approval_requests as r", "r.id", "d.request_id").where("r.public_id", sent.publicId).first("d.*");
    expect(row).toMatchObject({ method: "phone", person_name: "Ada Marsh", phone_called: "+1 555 013 2290", recorded_by_user_id: writer.userId, signature_name: null });
    expect(new Date(row.decided_at).getTime()).toBe(decidedAt.getTime());
  });

  it("opening the request records when the owner first saw it, not when staff look", async () => {
    const f = await priced(jobs[1]!, "Air filter soaked");
    const sent = await sendRequest(writer, await onJob(writer, jobs[1]!.publicId, "approvals:send"), f.id, { findingVersion: f.version });
    await requestView(writer, await onRequest(writer, sent.publicId, "job:view"), jobs[1]!.publicId);
    expect((await k("approval_requests").where({ public_id: sent.publicId }).first("opened_at"))!.opened_at).toBeNull();
    const opening = await onRequest(owner, sent.publicId, "job:view");
    const view = await requestView(owner, opening, jobs[1]!.publicId);
    expect(view.mayAnswer).toBe(true);
    expect((await k("approval_requests").where({ public_id: sent.publicId }).first("opened_at"))!.opened_at).not.toBeNull();
    // The request in the address of another job of the same owner: no such request there.
    await expect(requestView(owner, opening, jobs[0]!.publicId)).rejects.toMatchObject({ code: "not_found" });
  });

  it("the demo's open request is sealed the way a sent one is", async () => {
    const fresh = await freshDatabase();
    try {
      await fresh.knex.migrate.latest();
      await seedIfEmpty(fresh.knex);
      const row = await fresh.knex("approval_requests").first();
      const snapshot = typeof row!.snapshot === "string" ? JSON.parse(row!.snapshot) : row!.snapshot;
      expect(row!.hash).toBe(sha256Hex(row!.canonical));
      expect(canonicalJson(snapshot)).toBe(row!.canonical);
      // Per line at 8.25 %: only the $189.95 part is taxed, 15.670875 → $15.67 (SSUTA §324 / RCW 82.08.054 half-up, REFERENCES §5)
      expect(row!.estimate_tax_minor).toBe(1567);
      // Supplies 5 % of $138.00 labour = $6.90, under the $25 cap (common trade practice, no published source)
      expect(snapshot.totals.suppliesMinor).toBe(690);
    } finally {
      await fresh.drop();
    }
    // A database of its own, migrated from nothing and seeded: slow on a busy machine.
  }, 90_000);
});
