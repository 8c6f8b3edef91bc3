// Online payment end to end below the browser: the app's checkout through the stripe SDK, the
// payments fake's page and its signed webhooks, delivered to the app's handler (receivePaymentWebhook).
import { mkdtemp, rm } from "node:fs/promises";
import os from "node:os";
import path from "node:path";
import Stripe from "stripe";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Knex } from "knex";
import { dropWebhooks, listWebhookDeliveries, redeliverWebhook, submitPaymentPage, waitForWebhook } from "../../fakes/payments/client";
import { createPaymentsFake, type PaymentsFake } from "../../fakes/payments/server";
import { saveMoneySettings } from "@/db/queries/findings";
import { DEFAULT_MONEY_SETTINGS } from "@/lib/approvals";
import type { Actor } from "@/lib/permissions";
import { access } from "@/lib/server/access";
import { refundPayment, startDepositCheckout, startInvoiceCheckout, requestDeposit } from "@/lib/server/invoice-payments";
import { invoiceView } from "@/lib/server/invoice-views";
import { createInvoice, issueInvoice } from "@/lib/server/invoices";
import { confirmReturn, receivePaymentWebhook } from "@/lib/server/payment-webhook";
import { readWebhookBody } from "@/lib/server/body-limit";
import { authorise, ownerWithJobs, staffActor } from "../support/authorised-work";
import { testKnex } from "../support/db";
import { makeShop } from "../support/fixtures";
import { sendStreamed, startNextLikeServer } from "../support/next-like-server";
import { startWebhookReceiver } from "../support/webhook-receiver";

const KEY = "sk_test_benchside_webhook_test";
const SECRET = "whsec_benchside_webhook_test";

/** The app's webhook route, in-process: the raw body and signature go to the real handler. */
const startAppWebhook = () => startWebhookReceiver("/api/webhooks/payments", (raw, headers) => receivePaymentWebhook(raw, headers.get("stripe-signature")));

describe("online payments through the payments fake", () => {
  let k: Knex;
  let dir: string;
  let fake: PaymentsFake;
  let hook: Awaited<ReturnType<typeof startAppWebhook>>;
  let writer: Actor;
  let shopOwner: Actor;
  let owner: Actor;
  let jobs: { id: number; publicId: string }[];
  let invoice: string;
  const row = () => k("invoices").where({ public_id: invoice }).first();
  const payments = (jobId: number) => k("payments").where({ job_id: jobId }).orderBy("id");

  beforeAll(async () => {
    k = testKnex();
    dir = await mkdtemp(path.join(os.tmpdir(), "payments-webhook-"));
    hook = await startAppWebhook();
    fake = await createPaymentsFake({ port: 0, dir, secretKey: KEY, webhookUrl: hook.url, webhookSecret: SECRET, webhookRetryBaseMs: 50 });
    Object.assign(process.env, { STRIPE_SECRET_KEY: KEY, STRIPE_WEBHOOK_SECRET: SECRET, STRIPE_API_HOST: "127.0.0.1", STRIPE_API_PORT: String(fake.port), STRIPE_API_PROTOCOL: "http", APP_URL: "http://localhost:3999" });
    const shop = await makeShop(k, { label: "payments", roles: ["owner", "service_writer"] });
    writer = staffActor(shop, "service_writer");
    shopOwner = staffActor(shop, "owner");
    await saveMoneySettings({ shopId: shop.id, settings: { ...DEFAULT_MONEY_SETTINGS, tax: { ratePercent: "8.25", method: "per_line" } } });
    ({ owner, jobs } = await ownerWithJobs(k, shop, 2));
    // $42.50 + 8.25 % tax $3.51 (REFERENCES §5, per-line worked value) = $46.01.
    await authorise({ writer, owner, jobPublicId: jobs[0]!.publicId, title: "Rotor", lines: [{ kind: "part", description: "Front rotor", qty: "1", unitPrice: "42.50" }] });
    invoice = (await createInvoice(writer, await access(writer, "jobMoney", jobs[0]!.publicId, "invoice:create"))).publicId;
    await issueInvoice(writer, await access(writer, "invoice", invoice, "invoice:create"), (await row())!.version);
  });
  afterAll(async () => {
    await fake?.close();
    await hook?.close();
    await k?.destroy();
    await rm(dir, { recursive: true, force: true });
  });

  it("refuses a forged, stale or altered webhook (401) and records nothing", async () => {
    const payload = JSON.stringify({ id: "evt_forged_1", object: "event", type: "checkout.session.completed", data: { object: { id: "cs_test_x", payment_status: "paid" } } });
    const sign = (body: string, secret = SECRET, timestamp = Math.floor(Date.now() / 1000)) => Stripe.webhooks.generateTestHeaderString({ payload: body, secret, timestamp });
    await expect(receivePaymentWebhook(payload, sign(payload, "whsec_not_ours"))).rejects.toMatchObject({ code: "unauthenticated" });
    await expect(receivePaymentWebhook(payload, null)).rejects.toMatchObject({ code: "unauthenticated" });
    // The SDK's default tolerance is 300 s (SDK-NOTES): ten minutes old is refused.
    await expect(receivePaymentWebhook(payload, sign(payload, SECRET, Math.floor(Date.now() / 1000) - 600))).rejects.toMatchObject({ code: "unauthenticated" });
    await expect(receivePaymentWebhook(payload.replace("cs_test_x", "cs_test_y"), sign(payload))).rejects.toMatchObject({ code: "unauthenticated" });
    expect(await k("payment_webhook_events").where({ event_id: "evt_forged_1" })).toHaveLength(0);
  });

  it("acknowledges a signed body it can't use and writes nothing (a 5xx would be retried forever)", async () => {
    const sign = (body: string) => Stripe.webhooks.generateTestHeaderString({ payload: body, secret: SECRET });
    const counts = async () => ({
      events: Number((await k("payment_webhook_events").count({ n: "*" }).first())?.n),
      payments: Number((await k("payments").count({ n: "*" }).first())?.n),
      checkouts: await k("payment_checkouts").orderBy("id").select("id", "status"),
    });
    const before = await counts();
    const unusable = [
      "{}",
      "not json at all",
      JSON.stringify({ id: 7, type: null, data: [] }),
      JSON.stringify({ id: "evt_wrong_shape", object: "event", type: "checkout.session.completed", data: { object: { id: 12, payment_status: "paid", amount_total: "lots" } } }),
      JSON.stringify({ id: "evt_refund_shape", object: "event", type: "charge.refunded", data: { object: { id: "ch_1", amount_refunded: -5 } } }),
      JSON.stringify({ id: "evt_not_ours", object: "event", type: "customer.created", data: { object: { id: "cus_1" } } }),
    ];
    for (const body of unusable) {
      expect(await receivePaymentWebhook(body, sign(body)), body).toMatchObject({ received: true, applied: false, ignored: expect.any(String) });
    }
    expect(await counts()).toEqual(before);

    // The route's path: the body capped at 1 MB while read, before the signature (forged, 5 MB: 413 at once).
    const app = await startNextLikeServer(async (req) => receivePaymentWebhook(await readWebhookBody(req), req.headers.get("stripe-signature")), { closeOnRefusal: true });
    try {
      for (const body of unusable) {
        const res = await sendStreamed(app.url, { total: 0, prefix: Buffer.from(body), headers: { "content-type": "application/json", "stripe-signature": sign(body) } });
        expect(res.status, body).toBe(200);
      }
      const forged = await sendStreamed(app.url, { total: 5 * 1024 * 1024, headers: { "content-type": "application/json", "stripe-signature": "t=1,v1=00" } });
      expect(forged.status).toBe(413);
      expect(forged.ms).toBeLessThan(1000);
      expect(app.records.at(-1)!.consumed).toBeLessThan(1024 * 1024 + 256 * 1024);
    } finally {
      await app.close();
    }
    expect(await counts()).toEqual(before);
  });

  it("only the job's owner may start paying", async () => {
    await expect(access(writer, "invoice", invoice, "invoice:pay")).rejects.toMatchObject({ code: "forbidden" });
    const other = (await ownerWithJobs(k, { id: (await row())!.shop_id, slug: "", staff: {} }, 1, "Not The Owner")).owner;
    await expect(access(other, "invoice", invoice, "invoice:pay")).rejects.toMatchObject({ code: "not_found" });
  });

  it("a declined card leaves the invoice unpaid; the success card pays it once, even when the webhook comes twice", async () => {
    const paying = await access(owner, "invoice", invoice, "invoice:pay");
    const { url } = await startInvoiceCheckout(owner, paying);
    expect(url).toMatch(new RegExp(`^${fake.url}/pay/cs_test_`));
    // A second tap reuses the same page.
    expect((await startInvoiceCheckout(owner, await access(owner, "invoice", invoice, "invoice:pay"))).url).toBe(url);
    const declined = await submitPaymentPage(url, { card: "4000 0000 0000 0002" });
    expect(declined.html).toContain("Your card was declined.");
    const sessionId = url.split("/").pop()!;
    // The page resolves the job's money first ("jobMoney", invoice:view), then confirms.
    const returning = await access(owner, "jobMoney", jobs[0]!.publicId, "invoice:view");
    // The return address names the invoice, never the service's session id (issue 20 §4).
    expect(await confirmReturn(returning.job, invoice)).toBe("open");
    expect(await row()).toMatchObject({ status: "issued", balance_minor: 4601 });

    const paid = await submitPaymentPage(url, { card: "4242 4242 4242 4242" });
    expect(paid.location).toBe(`http://localhost:3999/my/jobs/${jobs[0]!.publicId}/invoice?paid=${invoice}`);
    expect(paid.location).not.toContain("cs_");
    const delivery = await waitForWebhook(fake.url, { type: "checkout.session.completed", objectId: sessionId });
    expect(await row()).toMatchObject({ status: "paid", paid_minor: 4601, balance_minor: 0 });
    await redeliverWebhook(fake.url, delivery.event.id);
    await expect.poll(async () => (await listWebhookDeliveries(fake.url, { objectId: sessionId })).find((d) => d.event.id === delivery.event.id)?.attempts.length).toBe(2);
    expect(await confirmReturn(returning.job, invoice)).toBe("paid");
    // This job's invoice confirmed against another job of the same owner is unknown there, and so is the raw session id.
    expect(await confirmReturn((await access(owner, "jobMoney", jobs[1]!.publicId, "invoice:view")).job, invoice)).toBe("unknown");
    expect(await confirmReturn(returning.job, sessionId)).toBe("unknown");
    const rows = await payments(jobs[0]!.id);
    expect(rows).toHaveLength(1);
    expect(rows[0]).toMatchObject({ kind: "payment", method: "online", amount_minor: 4601, provider_session_id: sessionId });
    expect(await k("journal_entries").where({ job_id: jobs[0]!.id, kind: "payment" })).toHaveLength(1);
    const receipts = await k("outbox").where({ kind: "receipt", to_email: owner.email });
    expect(receipts).toHaveLength(1);
    expect(receipts[0]!.text).toContain("Received: $46.01");
  });

  it("a refund reduces the paid amount once, whether the API answer or the webhook is seen first", async () => {
    const payment = (await payments(jobs[0]!.id))[0]!;
    const job = jobs[0]!.publicId;
    await expect(access(writer, "jobMoney", job, "invoice:refund")).rejects.toMatchObject({ code: "forbidden" });
    const refunding = await access(shopOwner, "jobMoney", job, "invoice:refund");
    // The payment must be one of this job's: the other job's money is not refunded from here.
    await expect(refundPayment(shopOwner, await access(shopOwner, "jobMoney", jobs[1]!.publicId, "invoice:refund"), { job: jobs[1]!.publicId, payment: payment.id, amount: "1.00", reason: null, confirmed: "yes" })).rejects.toMatchObject({
      code: "not_found",
    });
    await expect(refundPayment(shopOwner, refunding, { job, payment: payment.id, amount: "46.02", reason: null, confirmed: "yes" })).rejects.toThrow(/At most \$46\.01/);
    await refundPayment(shopOwner, refunding, { job, payment: payment.id, amount: "10.00", reason: "Goodwill", confirmed: "yes" });
    const intent = String(payment.provider_payment_id);
    const charge = String((await new Stripe(KEY, { host: "127.0.0.1", port: fake.port, protocol: "http" }).paymentIntents.retrieve(intent)).latest_charge);
    await waitForWebhook(fake.url, { type: "charge.refunded", objectId: charge });
    const refunds = (await payments(jobs[0]!.id)).filter((p) => p.kind === "refund");
    expect(refunds).toHaveLength(1);
    expect(refunds[0]).toMatchObject({ amount_minor: 1000, refund_of_payment_id: payment.id });
    expect(await row()).toMatchObject({ paid_minor: 3601, balance_minor: 1000, status: "issued" });
    // The webhook found the refund already recorded from the API answer, and said so with a 200.
    expect(hook.answers).not.toContain(500);
    expect(await k("outbox").where({ kind: "receipt", to_email: owner.email })).toHaveLength(2);
  });

  it("owners see the shop's receipt numbers, never the payments service's ids; staff keep them", async () => {
    const job = jobs[0]!;
    const number = Number((await k("jobs").where({ id: job.id }).first("number"))!.number);
    const label = `J-${String(number).padStart(4, "0")}`;
    // The service's ids on record for this job, and any id in the fake's format (fakes/payments/store.ts).
    const onRecord = (await payments(job.id)).flatMap((r) => [r.provider_payment_id, r.provider_refund_id, r.provider_session_id]).filter(Boolean) as string[];
    expect(onRecord.length).toBeGreaterThanOrEqual(3);
    const SERVICE_ID = new RegExp(`(?:^|[^A-Za-z0-9_-])(?:pi|ch|re|cs_test)_[A-Za-z0-9]{24}|${onRecord.join("|")}`);
    // The payment and the refund from the tests above: R1 and R2 in the order they were recorded.
    const receipts = await k("outbox").where({ kind: "receipt", to_email: owner.email }).orderBy("id");
    expect(receipts).toHaveLength(2);
    expect(receipts[0]!.text).toContain(`Receipt no.: ${label}-R1`);
    expect(receipts[1]!.text).toContain(`Refund no.: ${label}-R2`);
    expect(receipts[1]!.text).toContain("Reference: Refund: Goodwill");
    for (const r of receipts) {
      expect(r.text).not.toMatch(SERVICE_ID);
      expect(r.html).not.toMatch(SERVICE_ID);
    }
    // The owner's invoice page, PDF and JSON all read this view.
    const seen = await invoiceView(job.id, "owner");
    expect(seen.payments.map((p) => [p.kind, p.receipt, p.providerPaymentId, p.providerRefundId])).toEqual([
      ["payment", `${label}-R1`, null, null],
      ["refund", `${label}-R2`, null, null],
    ]);
    expect(seen.payments.map((p) => p.reference)).toEqual([null, "Refund: Goodwill"]);
    expect(JSON.stringify(seen.payments)).not.toMatch(SERVICE_ID);
    // The desk reconciles with the service's ids; the numbers are the same ones.
    const desk = await invoiceView(job.id, "shop");
    expect(desk.payments.map((p) => p.receipt)).toEqual([`${label}-R1`, `${label}-R2`]);
    expect(desk.payments[0]!.providerPaymentId).toMatch(/^pi_/);
    expect(desk.payments[0]!.reference).toBe(desk.payments[0]!.providerPaymentId);
  });

  it("a deposit paid online on return is recorded once when the webhook arrives later", async () => {
    const job = jobs[1]!;
    const { deposit } = await requestDeposit(writer, await access(writer, "jobMoney", job.publicId, "invoice:create"), { job: job.publicId, amount: "25.00", note: null, request: null });
    await dropWebhooks(fake.url, true);
    const { url } = await startDepositCheckout(owner, await access(owner, "deposit", deposit.publicId, "invoice:pay"));
    const sessionId = url.split("/").pop()!;
    await submitPaymentPage(url, { card: "4242424242424242" });
    // Back on the invoice page before any webhook: the app asks the service and records it.
    expect(await confirmReturn((await access(owner, "jobMoney", job.publicId, "invoice:view")).job, deposit.publicId)).toBe("paid");
    expect((await k("deposit_requests").where({ public_id: deposit.publicId }).first())!.status).toBe("paid");
    await dropWebhooks(fake.url, false);
    const dropped = await waitForWebhook(fake.url, { type: "checkout.session.completed", objectId: sessionId }, "dropped");
    await redeliverWebhook(fake.url, dropped.event.id);
    await waitForWebhook(fake.url, { type: "checkout.session.completed", objectId: sessionId });
    const rows = await payments(job.id);
    expect(rows.map((r) => [r.kind, r.amount_minor])).toEqual([["deposit", 2500]]);
  });
});
