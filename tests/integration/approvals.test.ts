import crypto from "node:crypto";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Knex } from "knex";
import { getEvidencePhoto, listAuthorisedWork } from "@/db/queries/approvals";
import { saveMoneySettings } from "@/db/queries/findings";
import { DEFAULT_MONEY_SETTINGS } from "@/lib/approvals";
import type { Actor } from "@/lib/permissions";
import type { FindingInput } from "@/lib/schemas/approvals";
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
    const made = await createFinding(tech, job.publicId, draft(title, photoIds));
    const saved = await saveFinding(writer, job.publicId, made.id, prices(draft(title, photoIds), made.version));
    return { id: made.id, version: saved.version };
  }

  beforeAll(async () => {
    k = testKnex();
    shop = await makeShop(k, { label: "approvals", roles: ["owner", "technician", "service_writer"] });
    const email = `ruth.${shop.slug}@mail.test`;
    const [userId] = await k("users").insert({ email, name: "Ada Marsh" });
    const made = await makeCustomerWithJobs(k, shop.id, { name: "Ada Marsh", email, userId: Number(userId), statuses: ["inspecting", "waiting_approval", "ready", "inspecting"] });
    jobs = await Promise.all(made.jobIds.map(async (id) => ({ id, publicId: String((await k("jobs").where({ id }).first("public_id")).public_id) })));
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
    const made = await createFinding(tech, job.publicId, draft("Front brakes", [photos[0]!]));
    await expect(saveFinding(tech, job.publicId, made.id, prices(draft("Front brakes"), 1))).rejects.toMatchObject({ code: "forbidden" });
    await expect(sendRequest(tech, job.publicId, made.id, { findingVersion: 1 })).rejects.toMatchObject({ code: "forbidden" });
    await expect(sendRequest(writer, job.publicId, made.id, { findingVersion: 1 })).rejects.toThrow(/no unit price yet/);
    const saved = await saveFinding(writer, job.publicId, made.id, prices(draft("Front brakes", [photos[0]!]), 1));

    const sent = await sendRequest(writer, job.publicId, made.id, { findingVersion: saved.version });
    const row = await k("approval_requests").where({ public_id: sent.publicId }).first();
    expect(row.status).toBe("sent");
    expect(row.hash).toBe(sha256Hex(row.canonical));
    expect(row.estimate_tax_minor).toBe(574); // SSUTA §324 / RCW 82.08.054: 1.65 + 3.51 + 0.58 (REFERENCES §5, per line)
    expect(row.estimate_total_minor).toBe(6948 + 574); // REFERENCES §5: 69.48 + 5.74
    expect((await k("jobs").where({ id: job.id }).first("status")).status).toBe("waiting_approval");

    const entry = await k("journal_entries").where({ job_id: job.id, kind: "approval" }).first();
    expect(entry.visibility).toBe("shared");
    // Followers read this entry: no amounts in it at all.
    expect(JSON.stringify(entry.body)).not.toMatch(/Minor|19\.99|1999|price/i);

    const mails = await k("outbox").where({ dedupe_scope: shop.id }).whereIn("dedupe_key", [`approval:${sent.publicId}`, `approval-reminder:${sent.publicId}`]).orderBy("id");
    expect(mails.map((m) => m.kind)).toEqual(["approval", "approval-reminder"]);
    expect(mails[0].to_email).toBe(owner.email);
    expect(mails[0].text).toContain("$19.99");
    expect(mails[0].html).toContain(`/my/jobs/${job.publicId}/approvals/${sent.publicId}`);
    expect(mails[0].html).toContain(`/api/approvals/${sent.publicId}/evidence/${photos[0]}/thumb?t=`);
    // Followers are alerted at once, without the title or prices (the owner has their own mail).
    const alert = await k("job_alerts").where({ job_id: job.id, dedupe_key: `approval:${sent.publicId}` }).first();
    expect(alert.kind).toBe("approval_request");
    expect(JSON.stringify(alert.payload)).not.toMatch(/Front brakes|\$|Minor/);
    const delayMs = new Date(mails[1].next_attempt_at).getTime() - new Date(mails[0].next_attempt_at).getTime();
    expect(Math.abs(delayMs - 24 * 3_600_000)).toBeLessThan(60_000);
    // The e-mail token opens exactly the request's evidence.
    const token = /thumb\?t=([A-Za-z0-9_-]+)/.exec(mails[0].html)![1]!;
    expect(sha256Hex(token)).toBe(row.token_hash);
    expect(await getEvidencePhoto({ requestId: row.id, photoPublicId: photos[0]! })).not.toBeNull();
    expect(await getEvidencePhoto({ requestId: row.id, photoPublicId: photos[1]! })).toBeNull();
  });

  it("a send whose e-mail can't be queued leaves nothing behind (one transaction)", async () => {
    const job = jobs[3]!;
    const f = await priced(job, "Throttle cable frayed");
    const customer = await k("jobs").where({ id: job.id }).first("customer_id");
    await k("customers").where({ id: customer.customer_id }).update({ email: "not an address" });
    try {
      await expect(sendRequest(writer, job.publicId, f.id, { findingVersion: f.version })).rejects.toThrow(/not an e-mail address/);
    } finally {
      await k("customers").where({ id: customer.customer_id }).update({ email: owner.email });
    }
    expect(await k("approval_requests").where({ finding_id: f.id })).toHaveLength(0);
    expect((await k("jobs").where({ id: job.id }).first("status")).status).toBe("inspecting");
    expect(await k("journal_entries").where({ job_id: job.id, kind: "approval" })).toHaveLength(0);
  });

  it("a job that can't go to waiting on approval says so; one already waiting stays there", async () => {
    const ready = await priced(jobs[2]!, "Chain worn");
    await expect(sendRequest(writer, jobs[2]!.publicId, ready.id, { findingVersion: ready.version })).rejects.toThrow(/can't be sent while the job is "Ready to collect"/);
    const waiting = await priced(jobs[1]!, "Second finding while one is open");
    await sendRequest(writer, jobs[1]!.publicId, waiting.id, { findingVersion: waiting.version });
    expect((await k("jobs").where({ id: jobs[1]!.id }).first("status")).status).toBe("waiting_approval");
    expect(await k("job_status_changes").where({ job_id: jobs[1]!.id })).toHaveLength(0);
  });

  it("50 answers at once: exactly one decision; every other one hears it was already answered, with the stored decision", async () => {
    const f = await priced(jobs[1]!, "Rear shock leaking");
    const sent = await sendRequest(writer, jobs[1]!.publicId, f.id, { findingVersion: f.version });
    const body = (n: number) => ({ shownHash: sent.hash, lines: [1, 2, 3].map((no) => ({ no, answer: (no + n) % 2 ? "approved" : "declined" }) as const), signature: "Ada Marsh", wantsPartsBack: false, confirmed: true as const });
    const results = await Promise.allSettled(Array.from({ length: 50 }, (_, n) => answerRequest(owner, sent.publicId, body(n), meta)));
    const request = await k("approval_requests").where({ public_id: sent.publicId }).first();
    expect(await k("approval_decisions").where({ request_id: request.id })).toHaveLength(1);
    expect(results.filter((r) => r.status === "fulfilled")).toHaveLength(1);
    const losers = results.filter((r): r is PromiseRejectedResult => r.status === "rejected");
    expect(losers).toHaveLength(49);
    for (const l of losers) {
      expect(l.reason).toBeInstanceOf(ApprovalRefusal);
      expect(l.reason.details.reason).toBe("answered");
      expect(l.reason.details.decision.requestId).toBe(request.id);
    }
    expect(request.status).toBe("answered");
  });

  it("approved lines become authorised work, declined ones are kept; totals and hash recorded; the reminder is dropped", async () => {
    const job = jobs[0]!;
    const sent = (await k("approval_requests").where({ job_id: job.id, status: "sent" }).first())!;
    await expect(answerRequest(writer, sent.public_id, { shownHash: sent.hash, lines: [], signature: "x", wantsPartsBack: false, confirmed: true }, meta)).rejects.toMatchObject({ code: "forbidden" });
    await expect(answerRequest(owner, sent.public_id, { shownHash: sent.hash, lines: [{ no: 1, answer: "approved" }], signature: "Ada Marsh", wantsPartsBack: false, confirmed: true }, meta)).rejects.toMatchObject({
      code: "invalid",
      fields: { "lines.2": expect.any(Array), "lines.3": expect.any(Array) },
    });
    const lines = [{ no: 1, answer: "approved" }, { no: 2, answer: "declined" }, { no: 3, answer: "approved" }] as const;
    const { decision } = await answerRequest(owner, sent.public_id, { shownHash: sent.hash, lines: [...lines], signature: "Ada Marsh", wantsPartsBack: true, confirmed: true }, meta);
    expect(decision.authorisedPreTaxMinor).toBe(1999 + 699); // approved lines only
    expect(decision.authorisedTaxMinor).toBe(165 + 58); // SSUTA §324 / RCW 82.08.054 per line: 1.65 + 0.58 (REFERENCES §5)
    expect(decision.shownHash).toBe(sha256Hex(sent.canonical));
    const row = await k("approval_decisions").where({ request_id: sent.id }).first();
    expect(row).toMatchObject({ method: "online", signature_name: "Ada Marsh", wants_parts_back: 1, ip: meta.ip, user_agent: "vitest" });
    const work = await listAuthorisedWork({ shopId: shop.id, jobId: job.id });
    expect(work.map((w) => w.description)).toEqual(["Front brake pads", "Brake fluid, 250 ml"]);
    expect(await k("outbox").where({ dedupe_scope: shop.id, dedupe_key: `approval-reminder:${sent.public_id}` })).toHaveLength(0);
    const overview = await jobApprovals(writer, job.publicId);
    expect(overview.authorised.preTaxMinor).toBe(2698);
    expect(overview.declined.map((d) => d.description)).toEqual(["Front rotor"]);
    // An answered finding is closed.
    await expect(saveFinding(writer, job.publicId, Number(sent.finding_id), prices(draft("x"), 2))).rejects.toMatchObject({ code: "conflict" });
  });

  it("a request changed after it was sent is refused, and so is an answer to a version the owner didn't see", async () => {
    const f = await priced(jobs[1]!, "Front wheel bearing");
    const sent = await sendRequest(writer, jobs[1]!.publicId, f.id, { findingVersion: f.version });
    const answer = { lines: [1, 2, 3].map((no) => ({ no, answer: "approved" as const })), signature: "Ada Marsh", wantsPartsBack: false, confirmed: true as const };
    await expect(answerRequest(owner, sent.publicId, { ...answer, shownHash: "0".repeat(64) }, meta)).rejects.toMatchObject({ details: { reason: "changed", current: sent.publicId } });
    const row = await k("approval_requests").where({ public_id: sent.publicId }).first();
    await k("approval_requests").where({ id: row.id }).update({ canonical: row.canonical.replace("1999", "999") });
    await expect(answerRequest(owner, sent.publicId, { ...answer, shownHash: sent.hash }, meta)).rejects.toThrow(/no longer matches what the shop sent/);
    expect(await k("approval_decisions").where({ request_id: row.id })).toHaveLength(0);
  });

  it("a withdrawn request can't be answered; its reminder is dropped", async () => {
    const f = await priced(jobs[1]!, "Coolant hose cracked");
    const sent = await sendRequest(writer, jobs[1]!.publicId, f.id, { findingVersion: f.version });
    await expect(withdrawRequest(tech, sent.publicId, { reason: null })).rejects.toMatchObject({ code: "forbidden" });
    await withdrawRequest(writer, sent.publicId, { reason: "Found a used part instead" });
    const answer = { shownHash: sent.hash, lines: [1, 2, 3].map((no) => ({ no, answer: "approved" as const })), signature: "Ada Marsh", wantsPartsBack: false, confirmed: true as const };
    await expect(answerRequest(owner, sent.publicId, answer, meta)).rejects.toMatchObject({ details: { reason: "withdrawn" } });
    await expect(withdrawRequest(writer, sent.publicId, { reason: null })).rejects.toMatchObject({ code: "conflict" });
    expect(await k("outbox").where({ dedupe_scope: shop.id, dedupe_key: `approval-reminder:${sent.publicId}` })).toHaveLength(0);
  });

  it("a revision replaces the open request: the old one is refused and points at the current one", async () => {
    const f = await priced(jobs[1]!, "Brake lever bent");
    const first = await sendRequest(writer, jobs[1]!.publicId, f.id, { findingVersion: f.version });
    await expect(sendRequest(writer, jobs[1]!.publicId, f.id, { findingVersion: f.version })).rejects.toThrow(/Nothing has changed since version 1/);
    const revised = await saveFinding(writer, jobs[1]!.publicId, f.id, prices(draft("Brake lever bent"), f.version, ["19.99", "40.00", "6.99"]));
    const second = await sendRequest(writer, jobs[1]!.publicId, f.id, { findingVersion: revised.version });
    const old = await k("approval_requests").where({ public_id: first.publicId }).first();
    expect(old.status).toBe("replaced");
    const answer = { shownHash: first.hash, lines: [1, 2, 3].map((no) => ({ no, answer: "approved" as const })), signature: "Ada Marsh", wantsPartsBack: false, confirmed: true as const };
    await expect(answerRequest(owner, first.publicId, answer, meta)).rejects.toMatchObject({ details: { reason: "replaced", current: second.publicId } });
    const view = await requestView(owner, jobs[1]!.publicId, first.publicId);
    expect(view.current).toBe(second.publicId);
  });

  it("the desk records a phone answer with who, when and the number called", async () => {
    const f = await priced(jobs[1]!, "Steering stem bearing notchy");
    const sent = await sendRequest(writer, jobs[1]!.publicId, f.id, { findingVersion: f.version });
    const base = { shownHash: sent.hash, lines: [1, 2, 3].map((no) => ({ no, answer: (no === 2 ? "declined" : "approved") as "approved" | "declined" })), personName: "Ada Marsh", note: null, wantsPartsBack: false };
    const decidedAt = new Date(Date.now() - 60_000);
    await expect(recordDecision(tech, sent.publicId, { ...base, method: "phone", phoneCalled: "+1 555 013 2290", decidedAt })).rejects.toMatchObject({ code: "forbidden" });
    await expect(recordDecision(writer, sent.publicId, { ...base, method: "phone", phoneCalled: "+1 555 013 2290", decidedAt: new Date(Date.now() + 3_600_000) })).rejects.toMatchObject({
      fields: { decidedAt: expect.any(Array) },
    });
    await recordDecision(writer, sent.publicId, { ...base, method: "phone", phoneCalled: "+1 555 013 2290", decidedAt });
    const row = await k("approval_decisions as d").join("approval_requests as r", "r.id", "d.request_id").where("r.public_id", sent.publicId).first("d.*");
    expect(row).toMatchObject({ method: "phone", person_name: "Ada Marsh", phone_called: "+1 555 013 2290", recorded_by_user_id: writer.userId, signature_name: null });
    expect(new Date(row.decided_at).getTime()).toBe(decidedAt.getTime());
  });

  it("opening the request records when the owner first saw it, not when staff look", async () => {
    const f = await priced(jobs[1]!, "Air filter soaked");
    const sent = await sendRequest(writer, jobs[1]!.publicId, f.id, { findingVersion: f.version });
    await requestView(writer, jobs[1]!.publicId, sent.publicId);
    expect((await k("approval_requests").where({ public_id: sent.publicId }).first("opened_at")).opened_at).toBeNull();
    const view = await requestView(owner, jobs[1]!.publicId, sent.publicId);
    expect(view.mayAnswer).toBe(true);
    expect((await k("approval_requests").where({ public_id: sent.publicId }).first("opened_at")).opened_at).not.toBeNull();
    await expect(requestView(owner, jobs[0]!.publicId, sent.publicId)).rejects.toMatchObject({ code: "not_found" });
  });

  it("the demo's open request is sealed the way a sent one is", async () => {
    const fresh = await freshDatabase();
    try {
      await fresh.knex.migrate.latest();
      await seedIfEmpty(fresh.knex);
      const row = await fresh.knex("approval_requests").first();
      const snapshot = typeof row.snapshot === "string" ? JSON.parse(row.snapshot) : row.snapshot;
      expect(row.hash).toBe(sha256Hex(row.canonical));
      expect(canonicalJson(snapshot)).toBe(row.canonical);
      // Per line at 8.25 %: only the $189.95 part is taxed, 15.670875 → $15.67 (SSUTA §324 / RCW 82.08.054 half-up, REFERENCES §5)
      expect(row.estimate_tax_minor).toBe(1567);
      // Supplies 5 % of $138.00 labour = $6.90, under the $25 cap (common trade practice, no published source)
      expect(snapshot.totals.suppliesMinor).toBe(690);
    } finally {
      await fresh.drop();
    }
  });
});
