import { beforeAll, describe, expect, it } from "vitest";
import type { Knex } from "knex";
import { countUnread, listInbox } from "@/db/queries/inbox";
import { saveMoneySettings } from "@/db/queries/findings";
import { transaction } from "@/db/transaction";
import { DEFAULT_MONEY_SETTINGS } from "@/lib/approvals";
import type { Action, Actor } from "@/lib/permissions";
import { tokenOfAddress } from "@/lib/questions";
import type { FindingInput } from "@/lib/schemas/approvals";
import { access } from "@/lib/server/access";
import { answerRequest, sendRequest } from "@/lib/server/approvals";
import { createFinding, saveFinding } from "@/lib/server/findings";
import { answerAs, answerQuestion, askAs, jobThread, recordOwnerQuestion } from "@/lib/server/questions";
import { makeCustomerWithJobs, makeShop } from "../support/fixtures";
import { testKnex } from "../support/db";

// Questions on a job (issue 21 §4): the owner asks on a line and on the job page, the desk answers,
// the thread keeps order and authorship, the inbox item appears and clears, the answer is mailed
// with the job's reply-to address, and nothing of a recorded approval decision moves.

type Shop = Awaited<ReturnType<typeof makeShop>>;
const staff = (shop: Shop, role: "owner" | "technician" | "service_writer"): Actor => ({
  userId: shop.staff[role]!.id,
  email: shop.staff[role]!.email,
  name: `${role} ${shop.slug}`,
  memberships: [{ shopId: shop.id, shopSlug: shop.slug, shopName: shop.slug, role }],
});
const onJob = (actor: Actor, publicId: string, permission: Action) => access(actor, "job", publicId, permission);
const meta = { ip: "203.0.113.9", userAgent: "vitest" };

const finding: FindingInput = {
  title: "Drive chain and sprockets",
  found: "Chain stretched past the service limit; rear sprocket teeth hooked.",
  whyItMatters: "A worn chain can jump the sprocket.",
  safety: "none",
  evidence: [],
  lines: [
    { kind: "part", description: "Drive chain", partNumber: "DC-520", qty: "1", unitPrice: "89.00" },
    { kind: "part", description: "Cam chain tensioner", partNumber: "CT-11", qty: "1", unitPrice: "54.00" },
  ],
};

describe("questions on a job", () => {
  let k: Knex;
  let shop: Shop;
  let owner: Actor;
  let writer: Actor;
  let tech: Actor;
  let job: { id: number; publicId: string; customerId: number };
  let requestPublicId: string;

  beforeAll(async () => {
    k = testKnex();
    shop = await makeShop(k, { label: "questions", roles: ["owner", "service_writer", "technician"] });
    const email = `iris.${shop.slug}@mail.test`;
    const [userId] = await k("users").insert({ email, name: "Iris Calder" });
    const made = await makeCustomerWithJobs(k, shop.id, { name: "Iris Calder", email, userId: Number(userId), statuses: ["inspecting"] });
    job = { id: made.jobIds[0]!, publicId: String((await k("jobs").where({ id: made.jobIds[0]! }).first("public_id"))!.public_id), customerId: made.customerId };
    owner = { userId: Number(userId), email, name: "Iris Calder", memberships: [] };
    writer = staff(shop, "service_writer");
    tech = staff(shop, "technician");
    await saveMoneySettings({ shopId: shop.id, settings: { ...DEFAULT_MONEY_SETTINGS, labourRateMinor: 9_000 } });
    const made2 = await createFinding(tech, await onJob(tech, job.publicId, "approvals:draft"), { ...finding, lines: finding.lines.map((l) => ({ ...l, unitPrice: undefined })) });
    const saved = await saveFinding(writer, await onJob(writer, job.publicId, "approvals:draft"), made2.id, { ...finding, version: made2.version });
    requestPublicId = (await sendRequest(writer, await onJob(writer, job.publicId, "approvals:send"), made2.id, { findingVersion: saved.version })).publicId;
  });

  it("files the owner's question on a line, lands it in the inbox, and clears it when the desk answers", async () => {
    const unreadBefore = await countUnread({ shopId: shop.id, userId: writer.userId });
    const asked = await askAs(owner, await onJob(owner, job.publicId, "questions:ask"), { job: job.publicId, body: "  Is the tensioner needed if I replace the chain?  ", request: requestPublicId, line: 2 });
    await askAs(owner, await onJob(owner, job.publicId, "questions:ask"), { job: job.publicId, body: "When could it be ready?" });

    // In the desk inbox, unread for the desk, naming the line.
    expect(await countUnread({ shopId: shop.id, userId: writer.userId })).toBe(unreadBefore + 2);
    const { items } = await listInbox({ shopId: shop.id, userId: writer.userId, kinds: ["owner_question"], limit: 10 });
    expect(items.map((i) => i.summary)).toContain("Iris Calder asked about line 2 (Cam chain tensioner): Is the tensioner needed if I replace the chain?");
    expect(items.every((i) => i.job?.number != null && !i.read)).toBe(true);

    // A technician may read the thread but not answer it (the desk answers).
    await expect(onJob(tech, job.publicId, "questions:answer")).rejects.toMatchObject({ code: "forbidden" });
    const answered = await answerAs(writer, await onJob(writer, job.publicId, "questions:answer"), { job: job.publicId, question: asked.id, body: "Yes: the old tensioner lets the new chain slap. We'd fit both." });

    const thread = await jobThread({ shopId: shop.id, jobId: job.id });
    expect(thread.map((m) => [m.author, m.authorName, m.via])).toEqual([
      ["owner", "Iris Calder", "page"],
      ["owner", "Iris Calder", "page"],
      ["staff", `service_writer ${shop.slug}`, "page"],
    ]);
    expect(thread[0]).toMatchObject({ id: asked.id, body: "Is the tensioner needed if I replace the chain?", line: { requestPublicId, no: 2, description: "Cam chain tensioner" } });
    expect(thread[0]!.answeredAt).not.toBeNull();
    expect(thread[1]).toMatchObject({ line: null, answeredAt: null });
    expect(thread[2]).toMatchObject({ id: answered.id, answersQuestionId: asked.id });
    // Oldest first, by time as well as by id.
    expect(thread.map((m) => m.at)).toEqual([...thread.map((m) => m.at)].sort());

    // Answered: the item is read for the whole staff; the open one still counts.
    expect(await countUnread({ shopId: shop.id, userId: writer.userId })).toBe(unreadBefore + 1);
    expect(await countUnread({ shopId: shop.id, userId: shop.staff.owner!.id })).toBe(unreadBefore + 1);

    // The answer is mailed to the owner through the outbox, with the job's reply-to address.
    const mail = await k("outbox").where({ dedupe_scope: shop.id, dedupe_key: `question-answer:${answered.id}` }).first();
    expect(mail!.to_email).toBe(owner.email);
    expect(mail!.kind).toBe("question-answer");
    expect(mail!.text).toContain("We'd fit both.");
    expect(mail!.text).toContain("Is the tensioner needed");
    const token = tokenOfAddress(mail!.reply_to!);
    expect(token).toMatch(/^[a-z2-7]{26}$/);
    expect((await k("job_reply_tokens").where({ token: token! }).first())!.job_id).toBe(job.id);
  });

  it("refuses a second answer to an answered question and an empty one, writing nothing", async () => {
    const [q] = (await jobThread({ shopId: shop.id, jobId: job.id })).filter((m) => m.author === "owner" && m.answeredAt);
    const before = await k("job_questions").where({ job_id: job.id }).count({ n: "*" }).first();
    const found = await onJob(writer, job.publicId, "questions:answer");
    await expect(answerAs(writer, found, { job: job.publicId, question: q!.id, body: "Again" })).rejects.toMatchObject({ code: "conflict" });
    const open = (await jobThread({ shopId: shop.id, jobId: job.id })).find((m) => m.author === "owner" && !m.answeredAt)!;
    await expect(answerAs(writer, found, { job: job.publicId, question: open.id, body: "   " })).rejects.toMatchObject({ code: "invalid", fields: { body: expect.any(Array) } });
    expect(await k("job_questions").where({ job_id: job.id }).count({ n: "*" }).first()).toEqual(before);
  });

  it("never changes a recorded approval decision", async () => {
    const request = (await k("approval_requests").where({ public_id: requestPublicId }).first())!;
    const answering = await access(owner, "request", requestPublicId, "approvals:answer");
    await answerRequest(owner, answering, { shownHash: request.hash, lines: [{ no: 1, answer: "approved" }, { no: 2, answer: "declined" }], signature: "Iris Calder", wantsPartsBack: false, confirmed: true }, meta);
    const snapshot = async () => ({
      request: await k("approval_requests").where({ id: request.id }).first("status", "answered_at", "hash"),
      decision: await k("approval_decisions").where({ request_id: request.id }).first(),
      lines: await k("approval_decision_lines").where({ job_id: job.id }).orderBy("id"),
      parts: await k("job_parts").where({ job_id: job.id }).orderBy("id").select("id", "owner_answer", "status"),
      status: (await k("jobs").where({ id: job.id }).first("status"))!.status,
    });
    const before = await snapshot();
    expect(before.decision).toBeTruthy();

    // The owner asks about the declined line after deciding; the desk answers.
    const q = await askAs(owner, await onJob(owner, job.publicId, "questions:ask"), { job: job.publicId, body: "Can I change my mind about the tensioner?", request: requestPublicId, line: 2 });
    await answerAs(writer, await onJob(writer, job.publicId, "questions:answer"), { job: job.publicId, question: q.id, body: "Yes, we'll send a new request for it." });
    expect(await snapshot()).toEqual(before);
  });

  it("refuses a stranger, a follower and a line the request doesn't have, writing nothing", async () => {
    const count = async () => Number((await k("job_questions").where({ shop_id: shop.id }).count({ n: "*" }).first())!.n);
    const events = async () => Number((await k("shop_events").where({ shop_id: shop.id }).count({ n: "*" }).first())!.n);
    const before = [await count(), await events()];
    const [strangerId] = await k("users").insert({ email: `stranger.${shop.slug}@mail.test`, name: "Stranger" });
    const stranger: Actor = { userId: Number(strangerId), email: `stranger.${shop.slug}@mail.test`, name: "Stranger", memberships: [] };
    await expect(onJob(stranger, job.publicId, "questions:ask")).rejects.toMatchObject({ code: "not_found" });
    // Staff see the job but don't ask on the owner's behalf.
    await expect(onJob(writer, job.publicId, "questions:ask")).rejects.toMatchObject({ code: "forbidden" });
    // Another customer of the shop, named as the asker directly: refused by the writer itself.
    const other = await makeCustomerWithJobs(k, shop.id, { name: "Other Owner", statuses: ["inspecting"] });
    await expect(transaction((tx) => recordOwnerQuestion(tx, { shopId: shop.id, jobId: job.id, customerId: other.customerId, body: "Hi", via: "sms" }))).rejects.toMatchObject({ code: "forbidden" });
    const found = await onJob(owner, job.publicId, "questions:ask");
    await expect(askAs(owner, found, { job: job.publicId, body: "About line 9?", request: requestPublicId, line: 9 })).rejects.toMatchObject({ code: "invalid", fields: { line: expect.any(Array) } });
    expect([await count(), await events()]).toEqual(before);
    await k("jobs").whereIn("id", other.jobIds).delete();
  });

  it("files one question per provider message, and cuts a long text instead of refusing it", async () => {
    const long = "x".repeat(2500);
    const first = await transaction((tx) => recordOwnerQuestion(tx, { shopId: shop.id, jobId: job.id, customerId: job.customerId, body: long, via: "email", sourceRef: "mail:abc" }));
    const again = await transaction((tx) => recordOwnerQuestion(tx, { shopId: shop.id, jobId: job.id, customerId: job.customerId, body: long, via: "email", sourceRef: "mail:abc" }));
    expect(again.id).toBe(first.id);
    const row = (await k("job_questions").where({ id: first.id }).first())!;
    expect(row.body.length).toBe(2000);
    expect(row.via).toBe("email");
    // Answering by the plain writer works the same as through the action.
    await transaction((tx) => answerQuestion(tx, { shopId: shop.id, jobId: job.id, questionId: first.id, userId: writer.userId, userName: writer.name, body: "Noted." }));
    expect((await k("job_questions").where({ id: first.id }).first())!.answered_at).not.toBeNull();
  });
});
