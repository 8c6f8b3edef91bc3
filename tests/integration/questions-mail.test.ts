// Replies by e-mail, end to end below the browser: the desk's answer mailed through the resend SDK
// to the mail fake, the owner replying on the fake (as its mailbox page does), the fake's signed
// `email.received` webhook delivered to the app's handler (receiveMailWebhook), which fetches the
// text back through the SDK and files it on the job its reply-to address names.
import { mkdtemp, rm } from "node:fs/promises";
import os from "node:os";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Knex } from "knex";
import { createMailFake, type MailFake } from "../../fakes/mail/server";
import { standardSignature } from "../../fakes/mail/inbound";
import { transaction } from "@/db/transaction";
import { sendMail } from "@/lib/server/mail";
import { receiveMailWebhook } from "@/lib/server/mail-inbound";
import { answerQuestion, jobThread, recordOwnerQuestion } from "@/lib/server/questions";
import { makeCustomerWithJobs, makeShop } from "../support/fixtures";
import { testKnex } from "../support/db";
import { startWebhookReceiver } from "../support/webhook-receiver";

const SECRET = `whsec_${Buffer.from("benchside mail webhook test key!").toString("base64")}`;

type Delivery = { id: string; state: string; event: unknown; attempts: { status: number | null }[] };

describe("questions by e-mail reply", () => {
  let k: Knex;
  let dir: string;
  let fake: MailFake;
  let hook: Awaited<ReturnType<typeof startWebhookReceiver>>;
  let shopId: number;
  let jobId: number;
  let otherJobId: number;
  let ownerEmail: string;
  let answerMail: { to: string; subject: string; html: string; text: string; replyTo: string };

  const counts = async () => ({
    questions: Number((await k("job_questions").where({ shop_id: shopId }).count({ n: "*" }).first())!.n),
    events: Number((await k("shop_events").where({ shop_id: shopId }).count({ n: "*" }).first())!.n),
    deliveries: Number((await k("mail_webhook_events").count({ n: "*" }).first())!.n),
  });
  const fakeJson = async <T,>(p: string, init?: RequestInit) => (await fetch(`${fake.url}${p}`, init)).json() as Promise<T>;
  /** Sends a mail as the outbox worker would, and returns the fake's id for it. */
  const send = (mail: { to: string; subject: string; html: string; text: string; replyTo: string }) => sendMail(mail);
  const reply = (messageId: string, text: string) => fakeJson<{ email: { id: string }; delivery: { id: string } }>(`/_fake/messages/${messageId}/reply`, { method: "POST", body: JSON.stringify({ text }) });
  async function delivered(id: string): Promise<Delivery> {
    for (let i = 0; i < 100; i++) {
      const { deliveries } = await fakeJson<{ deliveries: Delivery[] }>("/_fake/inbound");
      const d = deliveries.find((x) => x.id === id);
      if (d && d.state !== "pending") return d;
      await new Promise((r) => setTimeout(r, 50));
    }
    throw new Error(`delivery ${id} never settled`);
  }

  beforeAll(async () => {
    k = testKnex();
    dir = await mkdtemp(path.join(os.tmpdir(), "mail-inbound-"));
    hook = await startWebhookReceiver("/api/webhooks/mail", receiveMailWebhook);
    fake = await createMailFake({ port: 0, dir, apiKey: "re_inbound_test", webhookUrl: hook.url, webhookSecret: SECRET, webhookRetryBaseMs: 50, webhookMaxAttempts: 2 });
    Object.assign(process.env, { RESEND_API_KEY: "re_inbound_test", RESEND_BASE_URL: fake.url, RESEND_WEBHOOK_SECRET: SECRET, MAIL_INBOUND_DOMAIN: "reply.benchside.test", APP_URL: "http://localhost:3999" });
    const shop = await makeShop(k, { label: "qmail", roles: ["owner", "service_writer"] });
    shopId = shop.id;
    ownerEmail = `nadia.${shop.slug}@mail.test`;
    const made = await makeCustomerWithJobs(k, shop.id, { name: "Nadia Brook", email: ownerEmail, statuses: ["inspecting", "inspecting"] });
    [jobId, otherJobId] = [made.jobIds[0]!, made.jobIds[1]!];
    // A question on the page, answered by the desk: the answer mail carries the job's reply-to address.
    const q = await transaction((tx) => recordOwnerQuestion(tx, { shopId, jobId, customerId: made.customerId, body: "Is the chain worn out?", via: "page" }));
    const a = await transaction((tx) => answerQuestion(tx, { shopId, jobId, questionId: q.id, userId: shop.staff.service_writer!.id, userName: "Desk", body: "Yes, it is past the limit." }));
    const row = (await k("outbox").where({ dedupe_scope: shopId, dedupe_key: `question-answer:${a.id}` }).first())!;
    answerMail = { to: row.to_email, subject: row.subject, html: row.html, text: row.text, replyTo: row.reply_to! };
  });
  afterAll(async () => {
    await fake?.close();
    await hook?.close();
    await rm(dir, { recursive: true, force: true });
  });

  it("files the owner's reply, without the quoted mail, on the job its address names", async () => {
    expect(answerMail.replyTo).toMatch(/^q-[a-z2-7]{26}@reply\.benchside\.test$/);
    const before = await counts();
    const messageId = await send(answerMail);
    const sent = await reply(messageId, "Thanks. Do you keep the old chain for me?");
    const d = await delivered(sent.delivery.id);
    expect(d.state).toBe("delivered");
    expect(d.attempts.at(-1)!.status).toBe(200);
    expect(JSON.stringify(d.event)).toContain('"type":"email.received"');

    const thread = await jobThread({ shopId, jobId });
    const last = thread.at(-1)!;
    expect(last).toMatchObject({ author: "owner", authorName: "Nadia Brook", via: "email", body: "Thanks. Do you keep the old chain for me?", answeredAt: null });
    expect(await jobThread({ shopId, jobId: otherJobId })).toEqual([]);
    expect(await counts()).toEqual({ questions: before.questions + 1, events: before.events + 1, deliveries: before.deliveries + 1 });
    const item = await k("shop_events").where({ shop_id: shopId, kind: "owner_question" }).orderBy("id", "desc").first();
    expect(item!.job_id).toBe(jobId);
    const payload = (typeof item!.payload === "string" ? JSON.parse(item!.payload) : item!.payload) as { summary: string };
    expect(payload.summary).toBe("Nadia Brook asked by e-mail: Thanks. Do you keep the old chain for me?");
  });

  it("refuses forged, tampered and stale deliveries and ignores a replayed one, writing nothing", async () => {
    const { data } = await fakeJson<{ data: { id: string; to: string[] }[] }>("/_fake/inbound");
    const { deliveries } = await fakeJson<{ deliveries: Delivery[] }>("/_fake/inbound");
    const original = deliveries.find((x) => x.state === "delivered")!;
    const body = JSON.stringify(original.event);
    const now = Math.floor(Date.now() / 1000);
    const headers = (id: string, t: number, signature: string) => new Headers({ "svix-id": id, "svix-timestamp": String(t), "svix-signature": signature });
    const before = await counts();

    // Replayed: the same delivery id, freshly and correctly signed: acknowledged, nothing new.
    await expect(receiveMailWebhook(body, headers(original.id, now, standardSignature(SECRET, original.id, now, body)))).resolves.toMatchObject({ duplicate: true, applied: false });
    // Forged: signed with another key.
    const forged = `whsec_${Buffer.from("not the shop's webhook secret!!!").toString("base64")}`;
    await expect(receiveMailWebhook(body, headers("msg_forged", now, standardSignature(forged, "msg_forged", now, body)))).rejects.toMatchObject({ code: "unauthenticated" });
    // Tampered: a genuine signature over another body (the address changed to another job's).
    const tampered = body.replace(data[0]!.to[0]!, "q-aaaaaaaaaaaaaaaaaaaaaaaaaa@reply.benchside.test");
    expect(tampered).not.toBe(body);
    await expect(receiveMailWebhook(tampered, headers("msg_tampered", now, standardSignature(SECRET, "msg_tampered", now, body)))).rejects.toMatchObject({ code: "unauthenticated" });
    // Stale: genuine but ten minutes old (the tolerance is five).
    const old = now - 600;
    await expect(receiveMailWebhook(body, headers("msg_old", old, standardSignature(SECRET, "msg_old", old, body)))).rejects.toMatchObject({ code: "unauthenticated" });
    // Unsigned.
    await expect(receiveMailWebhook(body, new Headers())).rejects.toMatchObject({ code: "unauthenticated" });
    expect(await counts()).toEqual(before);
  });

  it("takes a reply from the mailbox page's form, and refuses one posted from another site", async () => {
    const messageId = await send(answerMail);
    const page = await (await fetch(`${fake.url}/m/${messageId}`)).text();
    expect(page).toContain(`action="/m/${messageId}/reply"`);
    const before = await counts();
    const form = (headers: Record<string, string>) =>
      fetch(`${fake.url}/m/${messageId}/reply`, { method: "POST", redirect: "manual", headers: { "content-type": "application/x-www-form-urlencoded", ...headers }, body: new URLSearchParams({ text: "From the page: how long for the parts?" }) });
    const foreign = await form({ origin: "http://evil.test", "sec-fetch-site": "cross-site" });
    expect(foreign.status).toBe(403);
    const ok = await form({ origin: fake.url, "sec-fetch-site": "same-origin" });
    expect(ok.status).toBe(303);
    const inboundId = new URL(ok.headers.get("location")!, fake.url).searchParams.get("replied")!;
    const { deliveries } = await fakeJson<{ deliveries: (Delivery & { event: { data: { email_id: string } } })[] }>("/_fake/inbound");
    expect((await delivered(deliveries.find((d) => d.event.data.email_id === inboundId)!.id)).state).toBe("delivered");
    expect((await jobThread({ shopId, jobId })).at(-1)!.body).toBe("From the page: how long for the parts?");
    expect((await counts()).questions).toBe(before.questions + 1);
  });

  it("doesn't file a reply from someone else who has the address, nor one to no job's address", async () => {
    const before = await counts();
    // The owner forwarded the mail; the friend replies from their own address.
    const forwarded = await send({ ...answerMail, to: "friend@elsewhere.test" });
    const fromFriend = await reply(forwarded, "I'm not the owner but I have a question.");
    expect((await delivered(fromFriend.delivery.id)).state).toBe("delivered");
    // A mail whose reply-to is no job's token.
    const stray = await send({ ...answerMail, replyTo: "q-bbbbbbbbbbbbbbbbbbbbbbbbbb@reply.benchside.test" });
    expect((await delivered((await reply(stray, "Hello?")).delivery.id)).state).toBe("delivered");
    const after = await counts();
    expect(after.questions).toBe(before.questions);
    expect(after.events).toBe(before.events);
  });
});
