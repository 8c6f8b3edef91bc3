// Texts end to end below the browser: the app queues through the texts' outbox, the worker sends with
// the twilio SDK to the SMS fake (fakes/sms), and the fake's signed status callbacks and inbound texts
// come back to the app's real webhook handlers, verified with the SDK's own validator.
import { mkdtemp, rm } from "node:fs/promises";
import http from "node:http";
import os from "node:os";
import path from "node:path";
import twilio from "twilio";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Knex } from "knex";
import { twilioSignature } from "../../fakes/sms/signature";
import { createSmsFake, type SmsFake } from "../../fakes/sms/server";
import { listJobMessages } from "@/db/queries/mail-log";
import { transaction } from "@/db/transaction";
import { runTextOutboxOnce } from "@/lib/server/outbox-worker";
import { receiveInboundText, receiveTextStatus } from "@/lib/server/text-webhooks";
import { peekSignInLink } from "@/db/queries/sign-in";
import { answerQuestion } from "@/lib/server/questions";
import { consumeSignInLink, hashToken } from "@/lib/server/sign-in";
import { checkInJob } from "@/db/queries/check-in";
import { insertEntry } from "@/db/queries/entries";
import { access } from "@/lib/server/access";
import { createInvoice, issueInvoice } from "@/lib/server/invoices";
import { authorise, ownerWithJobs, staffActor } from "../support/authorised-work";
import { chooseTextsAs, noticeChannels, queueApprovalReminderText, queueApprovalText, queueNoticeText, recordTextConsent, stopTextsAs } from "@/lib/server/texts";
import { cancelReminder } from "@/lib/server/approval-mail";
import { saveTextSettings } from "@/lib/server/text-settings";
import { textSettingsSchema } from "@/lib/schemas/texts";
import type { JobAccess, Resolved } from "@/lib/server/access";
import type { Actor } from "@/lib/permissions";
import type { TextNotice } from "@/lib/texts";
import { testKnex } from "../support/db";
import { makeCustomerWithJobs, makeShop } from "../support/fixtures";

const SID = `AC${"5a".repeat(16)}`;
const TOKEN = "benchside-sms-test-token";
const SHOP_NUMBER = "+15550100777";
// A fixed winter day in the future, so a held text is never due by the database's own clock.
// America/Denver is UTC−7 in January (IANA tz database): 18:00Z is 11:00 there, 05:30Z is 22:30.
const DAYTIME = new Date("2030-01-10T18:00:00Z");
const NIGHT = new Date("2030-01-10T05:30:00Z");
const MORNING = new Date("2030-01-10T15:00:00Z");
const OWNER_EMAIL = `rowan.${Date.now()}@owner.test`;

/** The app's two webhook routes in-process, answering as the route handlers do (error status, or 200). */
async function startAppWebhooks() {
  const server = http.createServer((req, res) => {
    const chunks: Buffer[] = [];
    req.on("data", (c: Buffer) => chunks.push(c));
    req.on("end", () => {
      const url = `${process.env.APP_URL}${req.url}`;
      const request = new Request(url, { method: "POST", headers: req.headers as Record<string, string>, body: Buffer.concat(chunks) });
      const handler = req.url?.startsWith("/api/webhooks/sms/status") ? receiveTextStatus : receiveInboundText;
      handler(request, Buffer.concat(chunks).toString("utf8")).then(
        (result) => res.writeHead(200, { "content-type": "application/json" }).end(JSON.stringify(result)),
        (error: { status?: number }) => res.writeHead(error.status ?? 500).end(),
      );
    });
  });
  await new Promise<void>((resolve) => server.listen(0, "127.0.0.1", resolve));
  const base = `http://127.0.0.1:${(server.address() as { port: number }).port}`;
  return { base, close: () => new Promise<void>((r) => server.close(() => r())) };
}

async function until<T>(what: string, probe: () => Promise<T | null | undefined | false>, ms = 5000): Promise<T> {
  const end = Date.now() + ms;
  for (;;) {
    const value = await probe();
    if (value) return value;
    if (Date.now() > end) throw new Error(`timed out waiting for ${what}`);
    await new Promise((r) => setTimeout(r, 25));
  }
}

describe("text messages through the SMS fake", () => {
  let k: Knex;
  let dir: string;
  let fake: SmsFake;
  let hooks: Awaited<ReturnType<typeof startAppWebhooks>>;
  let shopId: number;
  let customerId: number;
  let jobId: number;
  let phone: string;
  let counter = 0;

  const notice = (): TextNotice => ({ kind: "ready", machine: `test machine ${++counter}`, link: "http://localhost/my/jobs/x" });
  const queue = (now: Date, dedupeKey: string | null = null) => transaction((tx) => queueNoticeText(tx, { shopId, jobId, customerId, notice: notice(), dedupeKey, now }));
  const textRow = async (id: number) => (await k("text_outbox").where({ id }).first())!;
  const fakeMessages = async (query: string) => ((await (await fetch(`${fake.url}/_fake/messages?${query}`)).json()) as { data: { sid: string; body: string; to: string; from: string; status: string }[] }).data;
  const control = (pathname: string, body: unknown) => fetch(`${fake.url}${pathname}`, { method: "POST", body: JSON.stringify(body) });
  /** Sends what is due, as the worker does at `now`, until nothing more is claimed. */
  const drain = async (now = DAYTIME) => {
    let total = 0;
    for (let run = await runTextOutboxOnce({ backoffBaseMs: 0, backoffMaxMs: 0 }, () => now); run.claimed > 0; run = await runTextOutboxOnce({ backoffBaseMs: 0, backoffMaxMs: 0 }, () => now)) total += run.sent;
    return total;
  };
  const reply = (body: string) => control("/_fake/inbound", { from: phone, to: SHOP_NUMBER, body });

  beforeAll(async () => {
    k = testKnex();
    dir = await mkdtemp(path.join(os.tmpdir(), "sms-fake-"));
    hooks = await startAppWebhooks();
    fake = await createSmsFake({ port: 0, dir, accountSid: SID, authToken: TOKEN, stepMs: 20, inboundUrl: `${hooks.base}/api/webhooks/sms/inbound`, webhookRetryBaseMs: 50 });
    Object.assign(process.env, { APP_URL: hooks.base, TWILIO_ACCOUNT_SID: SID, TWILIO_AUTH_TOKEN: TOKEN, TWILIO_API_BASE: fake.url, SMS_DEFAULT_FROM: "+15550100999" });
    const shop = await makeShop(k, { label: "texts" });
    shopId = shop.id;
    await k("shops").where({ id: shopId }).update({ timezone: "America/Denver", sms_from: SHOP_NUMBER });
    // A number of its own per test file, so other files' texts never match.
    phone = `+1555${String(Date.now()).slice(-7)}`;
    const owner = await makeCustomerWithJobs(k, shopId, { name: "Rowan Fielding", email: OWNER_EMAIL, statuses: ["picked_up", "in_progress"] });
    ({ customerId } = owner);
    jobId = owner.jobIds[1]!;
    await transaction((tx) => recordTextConsent(tx, { shopId, customerId, phone, how: "check_in", userId: shop.staff.owner!.id }));
  });

  afterAll(async () => {
    await fake?.close();
    await hooks?.close();
    await rm(dir, { recursive: true, force: true });
  });

  it("records consent with when and how, in E.164", async () => {
    const c = (await k("customers").where({ id: customerId }).first())!;
    expect(c.text_consent_phone).toBe(phone);
    expect(c.text_consent_how).toBe("check_in");
    expect(c.text_consent_at).toBeInstanceOf(Date);
    const log = await k("text_consent_log").where({ customer_id: customerId });
    expect(log.map((r) => [r.action, r.how])).toEqual([["granted", "check_in"]]);
  });

  it("sends through the SDK to the fake, carrying the shop's name; signed callbacks mark it delivered", async () => {
    const queued = await queue(DAYTIME);
    expect(queued).toMatchObject({ heldUntil: null });
    const id = (queued as { id: number }).id;
    expect(await drain()).toBe(1);
    const row = await until("delivered", async () => {
      const r = await textRow(id);
      return r.delivery === "delivered" && r;
    });
    expect(row.state).toBe("sent");
    const [sent] = (await fakeMessages(`to=${encodeURIComponent(phone)}`)).filter((m) => m.sid === row.provider_sid);
    expect(sent!.from).toBe(SHOP_NUMBER);
    expect(sent!.body).toMatch(/^Test shop texts-\w+: Your test machine \d+ is ready to collect\. .* Reply STOP to stop\.$/);
    // The job's sent log lists it beside the mail, with what the carrier reported.
    const log = await listJobMessages({ shopId, jobId });
    expect(log.find((m) => m.channel === "text" && m.id === id)).toMatchObject({ to: phone, state: "sent", delivery: "delivered", providerId: row.provider_sid });
  });

  it("refuses forged and tampered callbacks, ignores replays, and leaves the text as it was", async () => {
    const id = ((await queue(DAYTIME)) as { id: number }).id;
    await drain();
    const row = await until("delivered", async () => {
      const r = await textRow(id);
      return r.delivery === "delivered" && r;
    });
    const url = `${hooks.base}/api/webhooks/sms/status?ref=${row.ref}`;
    const messageSid = String(row.provider_sid);
    const params: Record<string, string> = { AccountSid: SID, ApiVersion: "2010-04-01", From: SHOP_NUMBER, MessageSid: messageSid, MessageStatus: "undelivered", SmsSid: messageSid, SmsStatus: "undelivered", To: phone, ErrorCode: "30003" };
    const post = (p: Record<string, string>, signature: string, at = url) =>
      fetch(at, { method: "POST", headers: { "content-type": "application/x-www-form-urlencoded", "x-twilio-signature": signature }, body: new URLSearchParams(p).toString() });
    const genuine = twilioSignature(TOKEN, url, params);
    // The fake signs as the SDK verifies (its own validator, not ours).
    expect(twilio.validateRequest(TOKEN, genuine, url, params)).toBe(true);

    const forged = await post(params, twilioSignature("not-the-token", url, params));
    const tampered = await post({ ...params, MessageStatus: "failed" }, genuine);
    const otherRow = await post(params, genuine, url.replace(row.ref, "0".repeat(32)));
    const unsigned = await fetch(url, { method: "POST", headers: { "content-type": "application/x-www-form-urlencoded" }, body: new URLSearchParams(params).toString() });
    expect([forged.status, tampered.status, otherRow.status, unsigned.status]).toEqual([401, 401, 401, 401]);
    expect(await textRow(id)).toEqual(row);

    // A genuine callback sent again: the "delivered" the fake already sent, and an older "sent".
    const { ErrorCode: _code, ...withoutError } = params;
    const delivered = { ...withoutError, MessageStatus: "delivered", SmsStatus: "delivered" };
    const replay = await post(delivered, twilioSignature(TOKEN, url, delivered));
    expect(await replay.json()).toMatchObject({ duplicate: true, applied: false });
    const older = { ...delivered, MessageStatus: "sent", SmsStatus: "sent" };
    expect(await (await post(older, twilioSignature(TOKEN, url, older))).json()).toMatchObject({ applied: false });
    expect(await textRow(id)).toEqual(row);
  });

  it("marks a text the carrier could not deliver", async () => {
    await control("/_fake/outcome", { outcome: "undelivered" });
    const id = ((await queue(DAYTIME)) as { id: number }).id;
    await drain();
    const row = await until("undelivered", async () => {
      const r = await textRow(id);
      return r.delivery === "undelivered" && r;
    });
    expect(row.error_code).toBe(30003);
    // The desk hears of it (someone must reach the owner another way), once.
    const told = await k("shop_events").where({ shop_id: shopId, kind: "text_undeliverable" }).whereRaw("JSON_VALUE(payload, '$.to') = ?", [phone]);
    expect(told).toHaveLength(1);
    expect(told[0]!.job_id).toBe(jobId);
  });

  it("holds a text queued in quiet hours until the morning, on the shop's clock", async () => {
    const queued = await queue(NIGHT);
    // 22:30 in Denver: held to 08:00 there, 15:00Z (default quiet hours 21:00–08:00).
    expect(queued).toMatchObject({ heldUntil: MORNING });
    const id = (queued as { id: number }).id;
    expect((await textRow(id)).held_reason).toBe("quiet hours (21:00–08:00, shop time)");
    expect(await drain(NIGHT)).toBe(0);
    expect((await textRow(id)).state).toBe("queued");

    // The morning comes (the database's clock can't be moved, so the row is made due), but the worker's
    // clock still says 22:30: it holds the text again rather than send it at night.
    await k("text_outbox").where({ id }).update({ next_attempt_at: k.fn.now(3) });
    expect(await drain(NIGHT)).toBe(0);
    expect((await textRow(id)).next_attempt_at.toISOString()).toBe(MORNING.toISOString());
    await k("text_outbox").where({ id }).update({ next_attempt_at: k.fn.now(3) });
    expect(await drain(MORNING)).toBe(1);
    expect((await textRow(id)).state).toBe("sent");
  });

  it("retries a failed send with no duplicate on the fake, and a lost answer is not sent twice", async () => {
    await control("/_fake/fail", { count: 2, status: 503 });
    const id = ((await queue(DAYTIME)) as { id: number }).id;
    const tries: string[] = [];
    for (let i = 0; i < 3; i++) {
      const run = await runTextOutboxOnce({ backoffBaseMs: 0, backoffMaxMs: 0 }, () => DAYTIME);
      tries.push(run.sent ? "sent" : run.retrying ? "retrying" : "none");
    }
    expect(tries).toEqual(["retrying", "retrying", "sent"]);
    const sent = await textRow(id);
    expect(sent.attempts).toBe(3);
    expect((await fakeMessages(`to=${encodeURIComponent(phone)}`)).filter((m) => m.sid === sent.provider_sid || m.body === sent.body)).toHaveLength(1);

    // Accepted by the service but the answer lost: the row retries, the first callback proves it went.
    await control("/_fake/lose-answers", { count: 1 });
    const lost = ((await queue(DAYTIME)) as { id: number }).id;
    const first = await runTextOutboxOnce({ backoffBaseMs: 60_000, backoffMaxMs: 60_000 }, () => DAYTIME);
    expect(first.retrying).toBe(1);
    const row = await until("the callback to mark it sent", async () => {
      const r = await textRow(lost);
      return r.state === "sent" && r;
    });
    await k("text_outbox").where({ id: lost }).update({ next_attempt_at: k.fn.now(3) });
    expect(await drain()).toBe(0);
    expect((await fakeMessages(`to=${encodeURIComponent(phone)}`)).filter((m) => m.body === row.body)).toHaveLength(1);
  });

  it("STOP (and its synonyms) blocks further texts until START; each is confirmed once", async () => {
    const pending = ((await queue(DAYTIME)) as { id: number }).id;
    await reply("Unsubscribe.");
    const inbound = await until("the STOP to be filed", () => k("text_inbound").where({ from_phone: phone, filed: "stop" }).first());
    expect(inbound.shop_id).toBe(shopId);
    const c = (await k("customers").where({ id: customerId }).first())!;
    expect(c.text_opt_out_how).toBe("stop_keyword");

    // Nothing new is queued, and the text queued before the STOP is not sent.
    expect(await queue(DAYTIME)).toMatchObject({ id: null });
    await drain();
    expect(await textRow(pending)).toMatchObject({ state: "dead", provider_sid: null });
    const confirmations = (await fakeMessages(`to=${encodeURIComponent(phone)}`)).filter((m) => m.body.includes("you won't get more texts"));
    expect(confirmations).toHaveLength(1);
    expect(confirmations[0]!.from).toBe(SHOP_NUMBER);

    await reply("start");
    await until("the START to be filed", () => k("text_inbound").where({ from_phone: phone, filed: "start" }).first());
    expect(await k("customers").where({ id: customerId }).first()).toMatchObject({ text_opt_out_at: null, text_consent_how: "start_keyword" });
    expect(await queue(DAYTIME)).toMatchObject({ heldUntil: null });
    const log = await k("text_consent_log").where({ customer_id: customerId }).orderBy("id");
    expect(log.map((r) => `${r.action}:${r.how}`)).toEqual(["granted:check_in", "revoked:stop_keyword", "granted:start_keyword"]);
  });

  it("HELP answers with the shop's name and how to stop", async () => {
    await reply(" Help ");
    await until("the HELP to be filed", () => k("text_inbound").where({ from_phone: phone, filed: "help" }).first());
    await drain();
    const help = (await fakeMessages(`to=${encodeURIComponent(phone)}`)).find((m) => m.body.includes("texts about your repair jobs"));
    expect(help!.body).toMatch(/^Test shop texts-\w+: .*Reply STOP to stop\./);
  });

  it("a reply that is no keyword becomes a question on the owner's newest open job, once", async () => {
    await reply("Is the tensioner needed if I replace the chain?");
    const inbound = await until("the reply to be filed", () => k("text_inbound").where({ from_phone: phone, filed: "question" }).first());
    expect(inbound.job_id).toBe(jobId);
    const questions = await k("job_questions").where({ shop_id: shopId, job_id: jobId, via: "sms" });
    expect(questions.map((q) => q.body)).toEqual(["Is the tensioner needed if I replace the chain?"]);
    // The service sends the same webhook again: still one question.
    const [delivery] = (await (await fetch(`${fake.url}/_fake/webhooks?type=inbound&object_id=${inbound.provider_sid}`)).json()).data as { id: string }[];
    await control("/_fake/webhooks/redeliver", { id: delivery!.id });
    await new Promise((r) => setTimeout(r, 300));
    expect(await k("job_questions").where({ shop_id: shopId, job_id: jobId, via: "sms" })).toHaveLength(1);
  });

  it("an approval request goes by text, honouring the choice, with a short link that signs in once and opens it", async () => {
    await k("customers").where({ id: customerId }).update({ notify_channels: "text" });
    expect(await transaction((tx) => noticeChannels(tx, { shopId, customerId }))).toEqual({ email: false, text: true });
    const answerPath = `/my/jobs/pub${counter}/approvals/req${counter}`;
    const queued = await transaction((tx) => queueApprovalText(tx, { shopId, jobId, customerId, email: OWNER_EMAIL, machine: "2019 Testmake TX", answerPath, requestPublicId: `req${counter}`, now: DAYTIME }));
    const row = await textRow((queued as { id: number }).id);
    const token = /\/t\/([A-Za-z0-9_-]{43}) /.exec(row.body)?.[1];
    expect(row.body).toMatch(/^Test shop texts-\w+: Work on your 2019 Testmake TX needs your OK\. See it and answer here: http:\/\/127\.0\.0\.1:\d+\/t\/[\w-]{43} Reply STOP to stop\.$/);
    // Opening the page only reads the link; pressing its button signs in once.
    expect(await peekSignInLink({ tokenHash: hashToken(token!) })).toEqual({ nextPath: answerPath, usable: true });
    await consumeSignInLink({ token: token!, ip: "127.0.0.77" });
    await expect(consumeSignInLink({ token: token!, ip: "127.0.0.77" })).rejects.toMatchObject({ code: "link-used" });
    expect(await peekSignInLink({ tokenHash: hashToken(token!) })).toEqual({ nextPath: answerPath, usable: false });
  });

  it("the desk's answer to a question goes by text (and not by e-mail when the owner chose text only)", async () => {
    const question = (await k("job_questions").where({ shop_id: shopId, job_id: jobId, via: "sms" }).first())!;
    const desk = (await k("memberships").where({ shop_id: shopId }).first())!;
    const { id } = await transaction((tx) => answerQuestion(tx, { shopId, jobId, questionId: Number(question.id), userId: Number(desk.user_id), userName: "Desk", body: "Yes: a worn tensioner wears a new chain fast." }));
    const text = (await k("text_outbox").where({ shop_id: shopId, dedupe_key: `question-answer:${id}` }).first())!;
    expect(text.kind).toBe("answer");
    expect(text.body).toContain('"Yes: a worn tensioner wears a new chain fast."');
    expect(await k("outbox").where({ shop_id: shopId, dedupe_key: `question-answer:${id}` })).toHaveLength(0);
  });

  it("ready to collect goes by text when the job's status entry says so", async () => {
    const entryId = await transaction((tx) => insertEntry(tx, { shopId, jobId, kind: "status", authorId: null, visibility: "shared", body: { from: "in_progress", to: "ready", note: null } }));
    const text = (await k("text_outbox").where({ shop_id: shopId, dedupe_key: `ready:${entryId}` }).first())!;
    expect(text).toMatchObject({ kind: "ready", job_id: jobId, to_phone: phone, from_phone: SHOP_NUMBER });
    expect(text.body).toMatch(/is ready to collect\. Details: http:\/\/127\.0\.0\.1:\d+\/t\/[\w-]{43} Reply STOP to stop\.$/);
    // The e-mail alert follows the owner's choice: text only leaves it to the followers; both sends it to the owner too.
    const before = await k("customers").where({ id: customerId }).first("notify_channels");
    const ready = async (channels: "text" | "both") => {
      await k("customers").where({ id: customerId }).update({ notify_channels: channels });
      const id = await transaction((tx) => insertEntry(tx, { shopId, jobId, kind: "status", authorId: null, visibility: "shared", body: { from: "in_progress", to: "ready", note: null } }));
      const alert = (await k("job_alerts").where({ job_id: jobId, dedupe_key: `ready:${id}` }).first("payload"))!;
      const payload = typeof alert.payload === "string" ? JSON.parse(alert.payload) : alert.payload;
      return payload?.followersOnly === true;
    };
    expect(await ready("text")).toBe(true);
    expect(await ready("both")).toBe(false);
    await k("customers").where({ id: customerId }).update({ notify_channels: before!.notify_channels });
  });

  it("an approval request's reminder text waits the shop's delay (and quiet hours), and is dropped when the request is settled", async () => {
    const shop = await makeShop(k, { label: "texts-remind", roles: ["owner", "service_writer"] });
    await k("shops").where({ id: shop.id }).update({ timezone: "America/Denver", sms_from: "+15550100667" });
    const { jobs, customerId: who } = await ownerWithJobs(k, shop, 1, "Tove Aranda");
    await transaction((tx) => recordTextConsent(tx, { shopId: shop.id, customerId: who, phone: "+1 303 555 0167", how: "check_in", userId: null }));
    const base = { shopId: shop.id, jobId: jobs[0]!.id, customerId: who, email: null, machine: "quad", answerPath: "/my/jobs/x/approvals/y" };
    // Sent 10:00 in Denver (17:00 UTC) with a 24-hour delay: due 10:00 the next day, outside quiet hours.
    const sentAt = new Date("2026-12-07T17:00:00Z");
    await transaction((tx) => queueApprovalReminderText(tx, { ...base, requestPublicId: "remind-day", delayHours: 24, now: sentAt }));
    const day = (await k("text_outbox").where({ shop_id: shop.id, dedupe_key: "approval-reminder:remind-day" }).first())!;
    expect(new Date(day.next_attempt_at).toISOString()).toBe("2026-12-08T17:00:00.000Z");
    expect(day.body).toMatch(/Reminder: work on your quad is still waiting for your OK/);
    // Sent 15:00 with a 6-hour delay: due 21:00, the start of the default quiet hours (21:00–08:00): held to 08:00.
    await transaction((tx) => queueApprovalReminderText(tx, { ...base, requestPublicId: "remind-night", delayHours: 6, now: new Date("2026-12-07T22:00:00Z") }));
    const night = (await k("text_outbox").where({ shop_id: shop.id, dedupe_key: "approval-reminder:remind-night" }).first())!;
    expect(new Date(night.next_attempt_at).toISOString()).toBe("2026-12-08T15:00:00.000Z");
    // Settled (answered, withdrawn or replaced): the reminder is dropped before it goes.
    expect(await transaction((tx) => cancelReminder(tx, { shopId: shop.id, requestPublicId: "remind-day" }))).toBe(true);
    expect(await k("text_outbox").where({ shop_id: shop.id, dedupe_key: "approval-reminder:remind-day" })).toEqual([]);
  });

  it("the desk's real send and issue: the request and the invoice go by text and e-mail to an owner who chose both", async () => {
    const shop = await makeShop(k, { label: "texts-flow", roles: ["owner", "service_writer"] });
    await k("shops").where({ id: shop.id }).update({ timezone: "America/Denver", sms_from: "+15550100666" });
    const writer = staffActor(shop, "service_writer");
    const { owner, jobs, customerId: who } = await ownerWithJobs(k, shop, 1, "Mara Lindqvist");
    await transaction((tx) => recordTextConsent(tx, { shopId: shop.id, customerId: who, phone: "+1 303 555 0166", how: "check_in", userId: writer.userId }));
    await k("customers").where({ id: who }).update({ notify_channels: "both" });
    await authorise({ writer, owner, jobPublicId: jobs[0]!.publicId, title: "Carburettor clean", lines: [{ kind: "labour", description: "Strip and clean the carburettor", hours: "1.5", rate: "100.00" }] });
    const request = (await k("approval_requests").where({ shop_id: shop.id }).first("public_id"))!;
    expect(await k("text_outbox").where({ shop_id: shop.id, dedupe_key: `approval:${request.public_id}` })).toMatchObject([{ kind: "approval", to_phone: "+13035550166", from_phone: "+15550100666" }]);
    expect(await k("outbox").where({ shop_id: shop.id, dedupe_key: `approval:${request.public_id}` })).toHaveLength(1);
    // Answered: the request's reminder text went with its reminder e-mail.
    expect(await k("text_outbox").where({ shop_id: shop.id, dedupe_key: `approval-reminder:${request.public_id}` })).toEqual([]);

    const { publicId } = await createInvoice(writer, await access(writer, "jobMoney", jobs[0]!.publicId, "invoice:create"));
    const editing = await access(writer, "invoice", publicId, "invoice:create");
    await issueInvoice(writer, editing, editing.invoice.version);
    const invoiceText = (await k("text_outbox").where({ shop_id: shop.id, dedupe_key: `invoice:${publicId}:issued` }).first())!;
    expect(invoiceText.body).toMatch(/^Test shop texts-flow-\w+: The invoice for your .+ is ready \(balance due \$\d+\.\d{2}\)\. View or pay: \S+\/t\/[\w-]{43} Reply STOP to stop\.$/);
    expect(await k("outbox").where({ shop_id: shop.id, dedupe_key: `invoice:${publicId}:issued` })).toHaveLength(1);
  });

  describe("keywords in the shop's languages", () => {
    /** A shop with its own number and languages, and an owner who agreed to texts, with one open job. */
    const shopTexting = async (label: string, number: string, languages: string) => {
      const shop = await makeShop(k, { label });
      await k("shops").where({ id: shop.id }).update({ timezone: "America/Denver", sms_from: number, sms_languages: languages });
      const owner = await makeCustomerWithJobs(k, shop.id, { name: "Lucia Ferrer", statuses: ["in_progress"] });
      const ownerPhone = `+1556${String(Date.now() + ++counter).slice(-7)}`;
      await transaction((tx) => recordTextConsent(tx, { shopId: shop.id, customerId: owner.customerId, phone: ownerPhone, how: "check_in", userId: null }));
      const send = (body: string) => control("/_fake/inbound", { from: ownerPhone, to: number, body });
      const filed = (body: string) => until(`"${body}" to be filed`, () => k("text_inbound").where({ from_phone: ownerPhone, body }).first());
      const answers = async () => (await fakeMessages(`to=${encodeURIComponent(ownerPhone)}`)).map((m) => m.body);
      return { shop, owner, ownerPhone, send, filed, answers };
    };

    it("a shop that texts in Spanish honours AYUDA, PARAR and INICIO, answering in Spanish under its name", async () => {
      const es = await shopTexting("texts-es", "+15550100555", "en,es");
      const name = `Test shop ${es.shop.slug}`;

      await es.send("Ayuda");
      expect(await es.filed("Ayuda")).toMatchObject({ filed: "help", shop_id: es.shop.id });
      await drain();
      expect(await es.answers()).toContainEqual(expect.stringMatching(new RegExp(`^${name}: mensajes sobre sus reparaciones\\. .*Responda ALTO para dejar de recibirlos\\.`)));

      await es.send("¡PARAR!");
      expect(await es.filed("¡PARAR!")).toMatchObject({ filed: "stop" });
      expect(await k("customers").where({ id: es.owner.customerId }).first()).toMatchObject({ text_opt_out_how: "stop_keyword" });
      await drain();
      expect(await es.answers()).toContainEqual(`${name}: ya no le enviaremos mensajes. Responda INICIO para recibirlos de nuevo.`);

      await es.send("inicio");
      expect(await es.filed("inicio")).toMatchObject({ filed: "start" });
      expect(await k("customers").where({ id: es.owner.customerId }).first()).toMatchObject({ text_opt_out_at: null, text_consent_how: "start_keyword" });
      await drain();
      expect(await es.answers()).toContainEqual(expect.stringMatching(new RegExp(`^${name}: vuelve a recibir mensajes sobre sus trabajos\\.`)));
      // English stays on beside Spanish, answered in English.
      await es.send("HELP");
      expect(await es.filed("HELP")).toMatchObject({ filed: "help" });
      await drain();
      expect(await es.answers()).toContainEqual(expect.stringMatching(new RegExp(`^${name}: texts about your repair jobs\\.`)));
      // Not one of them became a question.
      expect(await k("job_questions").where({ shop_id: es.shop.id })).toEqual([]);
    });

    it("a shop that texts in French honours ARRÊT with or without its accent, answering in French", async () => {
      const fr = await shopTexting("texts-fr", "+15550100556", "en,fr");
      await fr.send("Arrêt");
      expect(await fr.filed("Arrêt")).toMatchObject({ filed: "stop" });
      await drain();
      expect(await fr.answers()).toContainEqual(`Test shop ${fr.shop.slug}: vous ne recevrez plus de messages de notre part. Répondez START pour les recevoir à nouveau.`);
    });

    it("a shop that texts in English only takes a Spanish or French help word as a reply, but stops whoever sends ALTO", async () => {
      const en = await shopTexting("texts-en-only", "+15550100557", "en");
      await en.send("AIDE");
      expect(await en.filed("AIDE")).toMatchObject({ filed: "question", job_id: en.owner.jobIds[0] });
      await en.send("AYUDA");
      expect(await en.filed("AYUDA")).toMatchObject({ filed: "question", job_id: en.owner.jobIds[0] });
      const questions = await k("job_questions").where({ shop_id: en.shop.id, via: "sms" }).orderBy("id");
      expect(questions.map((q) => q.body)).toEqual(["AIDE", "AYUDA"]);
      // Each is in the desk inbox, where a person reads it; the owner's consent stands and no keyword answer went.
      expect(await k("shop_events").where({ shop_id: en.shop.id, kind: "owner_question" })).toHaveLength(2);
      expect(await k("customers").where({ id: en.owner.customerId }).first()).toMatchObject({ text_opt_out_at: null });
      expect(await k("text_outbox").where({ shop_id: en.shop.id, purpose: "keyword_reply" })).toEqual([]);
      // An opt-out word is honoured in any language: no more texts, one confirmation in the owner's words.
      await en.send("ALTO");
      expect(await en.filed("ALTO")).toMatchObject({ filed: "stop" });
      expect((await k("customers").where({ id: en.owner.customerId }).first())?.text_opt_out_at).toBeInstanceOf(Date);
      await drain();
      expect(await en.answers()).toContainEqual(`Test shop ${en.shop.slug}: ya no le enviaremos mensajes. Responda INICIO para recibirlos de nuevo.`);
    });
  });

  it("a reply goes to the job the shop last texted about, while it is open, not to the owner's newest job", async () => {
    const shop = await makeShop(k, { label: "texts-which-job" });
    const number = "+15550100558";
    await k("shops").where({ id: shop.id }).update({ timezone: "America/Denver", sms_from: number });
    // Two open jobs: the older one (jobIds[0]) and the newer one (jobIds[1]).
    const owner = await makeCustomerWithJobs(k, shop.id, { name: "Harriet Voss", statuses: ["in_progress", "in_progress"] });
    const [older, newer] = owner.jobIds as [number, number];
    const ownerPhone = `+1557${String(Date.now()).slice(-7)}`;
    await transaction((tx) => recordTextConsent(tx, { shopId: shop.id, customerId: owner.customerId, phone: ownerPhone, how: "check_in", userId: null }));
    const textAbout = async (job: number) => {
      await transaction((tx) => queueNoticeText(tx, { shopId: shop.id, jobId: job, customerId: owner.customerId, notice: notice(), dedupeKey: null, now: DAYTIME }));
      expect(await drain()).toBe(1);
    };
    const answer = async (body: string) => {
      await control("/_fake/inbound", { from: ownerPhone, to: number, body });
      return until(`"${body}" to be filed`, () => k("text_inbound").where({ from_phone: ownerPhone, body }).first());
    };

    // No text about a job went yet: the newest open job, as before.
    expect(await answer("Any news?")).toMatchObject({ filed: "question", job_id: newer });
    // The newer job was texted, then the older one: the answer is about the older one.
    await textAbout(newer);
    await textAbout(older);
    expect(await answer("Does the older one need a new chain too?")).toMatchObject({ filed: "question", job_id: older });
    const onOlder = await k("job_questions").where({ shop_id: shop.id, job_id: older, via: "sms" });
    expect(onOlder.map((q) => q.body)).toEqual(["Does the older one need a new chain too?"]);
    // The older job collected: the last texted job still open is the newer one.
    await k("jobs").where({ id: older }).update({ status: "picked_up" });
    expect(await answer("And the other?")).toMatchObject({ filed: "question", job_id: newer });
  });

  describe("consent, the owner's choice and the shop's settings", () => {
    const newOwner = (extra: Record<string, unknown>) => ({
      customer: { mode: "new" as const, name: "Ines Okafor", email: null, phone: "(303) 555-0188", ...extra },
      machine: { mode: "new" as const, kind: "atv" as const, year: null, make: "Testmake", model: "Consent 1", engineCc: null, serial: null, hours: null, odometer: null, odometerUnit: null },
      concern: "Pulls to the left",
      intakeNotes: null,
      promisedOn: null,
      technicianId: null,
    });

    it("records consent given at check-in with the number in E.164, and refuses it without a number, writing nothing", async () => {
      const userId = Number((await k("memberships").where({ shop_id: shopId }).first())!.user_id);
      const job = await checkInJob({ shopId, userId, input: { ...newOwner({}), textConsent: true } });
      const c = (await k("customers").where({ id: job.customerId }).first())!;
      expect(c).toMatchObject({ text_consent_phone: "+13035550188", text_consent_how: "check_in" });
      expect(await k("text_consent_log").where({ customer_id: job.customerId })).toMatchObject([{ action: "granted", how: "check_in", user_id: userId, phone: "+13035550188" }]);

      const jobs = (await k("jobs").where({ shop_id: shopId }).count({ n: "*" }))[0]!.n;
      const refused = checkInJob({ shopId, userId, input: { ...newOwner({ phone: null, email: `no.phone.${Date.now()}@owner.test` }), textConsent: true } });
      await expect(refused).rejects.toMatchObject({ code: "invalid", fields: { textConsent: [expect.stringContaining("mobile number")] } });
      expect((await k("jobs").where({ shop_id: shopId }).count({ n: "*" }))[0]!.n).toBe(jobs);
    });

    it("the owner's page records their choice and consent, and stopping texts there is logged", async () => {
      const owner = await makeCustomerWithJobs(k, shopId, { name: "Tomas Reyes", email: `tomas.${Date.now()}@owner.test`, statuses: ["inspecting"] });
      const access = { job: { shopId, customerId: owner.customerId } } as unknown as JobAccess;
      const actor = { userId: 1 } as Actor;
      expect(await chooseTextsAs(actor, access, { job: "x", channels: "both", phone: "303.555.0177", consent: "yes" })).toEqual({ channels: "both", phone: "+13035550177" });
      expect(await k("customers").where({ id: owner.customerId }).first()).toMatchObject({ notify_channels: "both", text_consent_how: "owner_page", text_consent_phone: "+13035550177" });
      await expect(chooseTextsAs(actor, access, { job: "x", channels: "text", phone: "12", consent: "yes" })).rejects.toMatchObject({ code: "invalid", fields: { phone: [expect.any(String)] } });
      await stopTextsAs(actor, access);
      expect(await k("customers").where({ id: owner.customerId }).first()).toMatchObject({ notify_channels: "email", text_opt_out_how: "owner_page" });
      expect((await k("text_consent_log").where({ customer_id: owner.customerId }).orderBy("id")).map((r) => `${r.action}:${r.how}`)).toEqual(["granted:owner_page", "revoked:owner_page"]);
    });

    it("the shop's sender and quiet hours are saved like every settings section, with who and what changed", async () => {
      const userId = Number((await k("memberships").where({ shop_id: shopId }).first())!.user_id);
      const found = { shop: { id: shopId, slug: "texts" } } as unknown as Resolved<"shop">;
      await saveTextSettings({ userId } as Actor, found, textSettingsSchema.parse({ shop: "texts", smsFrom: "+15550100888", quietStart: "22:30", quietEnd: "7:00", languageFr: "on" }));
      expect(await k("shops").where({ id: shopId }).first()).toMatchObject({ sms_from: "+15550100888", sms_quiet_start: 1350, sms_quiet_end: 420, sms_languages: "en,fr" });
      const change = (await k("shop_setting_changes").where({ shop_id: shopId, section: "texts" }).orderBy("id", "desc").first())!;
      const json = (v: unknown) => (typeof v === "string" ? (JSON.parse(v) as unknown) : v);
      expect(json(change.after)).toEqual({ smsFrom: "+15550100888", quietStart: "22:30", quietEnd: "07:00", languages: ["en", "fr"] });
      expect(json(change.before)).toEqual({ smsFrom: SHOP_NUMBER, quietStart: "21:00", quietEnd: "08:00", languages: ["en"] });
      await k("shops").where({ id: shopId }).update({ sms_from: SHOP_NUMBER, sms_quiet_start: 1260, sms_quiet_end: 480, sms_languages: "en" });
    });

    it("the languages the shop texts in: saved and recorded; a bad value is refused beside its box and nothing is written", async () => {
      const userId = Number((await k("memberships").where({ shop_id: shopId }).first())!.user_id);
      const found = { shop: { id: shopId, slug: "texts" } } as unknown as Resolved<"shop">;
      // As the settings action runs it: the form parsed by the section's schema, then saved.
      const save = async (form: Record<string, string>) => saveTextSettings({ userId } as Actor, found, textSettingsSchema.parse({ shop: "texts", smsFrom: SHOP_NUMBER, quietStart: "21:00", quietEnd: "08:00", ...form }));
      const changes = () => k("shop_setting_changes").where({ shop_id: shopId, section: "texts" }).orderBy("id");
      const json = (v: unknown) => (typeof v === "string" ? (JSON.parse(v) as unknown) : v);

      await save({ languageEs: "on", languageFr: "on" });
      expect((await k("shops").where({ id: shopId }).first("sms_languages"))!.sms_languages).toBe("en,es,fr");
      const recorded = await changes();
      expect(recorded.at(-1)).toMatchObject({ user_id: userId });
      expect(json(recorded.at(-1)!.after)).toMatchObject({ languages: ["en", "es", "fr"] });

      // Unticked boxes send nothing: back to English only.
      await save({});
      expect((await k("shops").where({ id: shopId }).first("sms_languages"))!.sms_languages).toBe("en");
      expect(json((await changes()).at(-1)!.after)).toMatchObject({ languages: ["en"] });

      // A value no box sends: refused beside that box, with words a person can act on; nothing written.
      const before = { shop: await k("shops").where({ id: shopId }).first(), changes: (await changes()).length };
      for (const [field, value, language] of [
        ["languageEs", "yes please", "Spanish"],
        ["languageFr", "de", "French"],
      ] as const) {
        const refused = textSettingsSchema.safeParse({ shop: "texts", smsFrom: SHOP_NUMBER, quietStart: "21:00", quietEnd: "08:00", [field]: value });
        expect(refused.error!.issues.map((i) => [i.path.join("."), i.message])).toEqual([[field, `Tick the box to text in ${language} too, or leave it empty.`]]);
        await expect(save({ [field]: value })).rejects.toThrow(`Tick the box to text in ${language} too`);
      }
      expect(await k("shops").where({ id: shopId }).first()).toEqual(before.shop);
      expect(await changes()).toHaveLength(before.changes);
    });
  });
});
