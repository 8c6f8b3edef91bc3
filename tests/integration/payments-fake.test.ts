// Drives fakes/payments with the official `stripe` SDK, the payment page as a browser submits it, and
// `stripe.webhooks.constructEvent`, so the fake stays honest about the API shapes, errors, signatures
// and retries the app relies on.
import { mkdtemp, rm } from "node:fs/promises";
import http from "node:http";
import os from "node:os";
import path from "node:path";
import Stripe from "stripe";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { dropWebhooks, failNextApiCalls, listWebhookDeliveries, redeliverWebhook, submitPaymentPage, waitForWebhook } from "../../fakes/payments/client";
import { parseForm } from "../../fakes/payments/form";
import { createPaymentsFake, type PaymentsFake } from "../../fakes/payments/server";

const KEY = "sk_test_benchside_fake_key";
const SECRET = "whsec_benchside_fake_secret";
const APP = "http://127.0.0.1:9/my/jobs/abc/invoice";

type Received = { raw: string; signature: string; event: Stripe.Event };

/** A stand-in for the app's webhook route: records every delivery; answers 500 to the first N of a type. */
async function startReceiver() {
  const received: Received[] = [];
  const failures = new Map<string, number>();
  const server = http.createServer((req, res) => {
    const chunks: Buffer[] = [];
    req.on("data", (c: Buffer) => chunks.push(c));
    req.on("end", () => {
      const raw = Buffer.concat(chunks).toString("utf8");
      const event = JSON.parse(raw) as Stripe.Event;
      received.push({ raw, signature: String(req.headers["stripe-signature"]), event });
      const left = failures.get(event.type) ?? 0;
      failures.set(event.type, Math.max(0, left - 1));
      res.writeHead(left > 0 ? 500 : 200).end(left > 0 ? "not now" : "ok");
    });
  });
  await new Promise<void>((resolve) => server.listen(0, "127.0.0.1", resolve));
  const { port } = server.address() as { port: number };
  return { url: `http://127.0.0.1:${port}/api/webhooks/payments`, received, failures, close: () => new Promise<void>((r) => server.close(() => r())) };
}

describe("payments fake with the stripe SDK", () => {
  let dir: string;
  let fake: PaymentsFake;
  let receiver: Awaited<ReturnType<typeof startReceiver>>;
  let stripe: Stripe;

  const open = async () => {
    fake = await createPaymentsFake({ port: 0, dir, secretKey: KEY, webhookUrl: receiver.url, webhookSecret: SECRET, webhookRetryBaseMs: 50, webhookMaxAttempts: 4 });
    stripe = new Stripe(KEY, { host: "127.0.0.1", port: fake.port, protocol: "http", maxNetworkRetries: 0 });
  };
  const session = (amount = 1234, extra: Partial<Stripe.Checkout.SessionCreateParams> = {}) =>
    stripe.checkout.sessions.create({
      mode: "payment",
      line_items: [{ quantity: 1, price_data: { currency: "usd", unit_amount: amount, product_data: { name: "Invoice INV-0001 (J-0005)" } } }],
      success_url: `${APP}?paid={CHECKOUT_SESSION_ID}`,
      cancel_url: `${APP}?cancelled=1`,
      metadata: { invoice: "inv_public_1", purpose: "balance" },
      client_reference_id: "inv_public_1",
      ...extra,
    });
  const paid = async (amount = 1234) => {
    const s = await session(amount);
    const page = await submitPaymentPage(s.url!, { card: "4242 4242 4242 4242" });
    expect(page.status).toBe(303);
    return stripe.checkout.sessions.retrieve(s.id);
  };

  beforeAll(async () => {
    dir = await mkdtemp(path.join(os.tmpdir(), "payments-fake-"));
    receiver = await startReceiver();
    await open();
  });
  afterAll(async () => {
    await fake?.close();
    await receiver?.close();
    await rm(dir, { recursive: true, force: true });
  });

  it("reads bracket form bodies the way the SDK writes them", () => {
    expect(parseForm("line_items[0][price_data][currency]=usd&line_items[0][quantity]=2&metadata[a%20b]=x%26y&expand[]=p&expand[]=q")).toEqual({
      line_items: [{ price_data: { currency: "usd" }, quantity: "2" }],
      metadata: { "a b": "x&y" },
      expand: ["p", "q"],
    });
    expect(() => parseForm("__proto__[x]=1")).toThrow(/Invalid parameter name/);
  });

  it("refuses a wrong key (StripeAuthenticationError) and a bad request with the param named", async () => {
    const wrong = new Stripe("sk_test_not_the_key", { host: "127.0.0.1", port: fake.port, protocol: "http", maxNetworkRetries: 0 });
    await expect(wrong.checkout.sessions.retrieve("cs_test_x")).rejects.toBeInstanceOf(Stripe.errors.StripeAuthenticationError);
    const bad = session(1234, { success_url: "not a url" });
    await expect(bad).rejects.toBeInstanceOf(Stripe.errors.StripeInvalidRequestError);
    await expect(bad).rejects.toMatchObject({ param: "success_url" });
    await expect(stripe.checkout.sessions.retrieve("cs_test_missing")).rejects.toMatchObject({ statusCode: 404, code: "resource_missing" });
  });

  it("creates an open session whose url is the fake's payment page", async () => {
    const s = await session();
    expect(s).toMatchObject({ object: "checkout.session", status: "open", payment_status: "unpaid", amount_total: 1234, currency: "usd", client_reference_id: "inv_public_1", metadata: { invoice: "inv_public_1" } });
    expect(s.url).toBe(`${fake.url}/pay/${s.id}`);
    const page = await fetch(s.url!);
    expect(page.status).toBe(200);
    const html = await page.text();
    expect(html).toContain("Pay $12.34");
    expect(html).toContain('<label for="card">Card number</label>');
  });

  it("a declined card shows card_declined and leaves the session open; cancel goes to cancel_url", async () => {
    const s = await session();
    const declined = await submitPaymentPage(s.url!, { card: "4000 0000 0000 0002" });
    expect(declined.status).toBe(402);
    expect(declined.html).toContain("Your card was declined.");
    expect(declined.html).toContain("generic_decline");
    expect((await stripe.checkout.sessions.retrieve(s.id)).status).toBe("open");
    const cancelled = await submitPaymentPage(s.url!, "cancel");
    expect(cancelled).toMatchObject({ status: 303, location: `${APP}?cancelled=1` });
    expect((await stripe.checkout.sessions.retrieve(s.id)).payment_status).toBe("unpaid");
  });

  it("the success card completes the session, creates a succeeded payment intent and redirects with the session id", async () => {
    const s = await session(5000);
    const page = await submitPaymentPage(s.url!, { card: "4242424242424242" });
    expect(page).toMatchObject({ status: 303, location: `${APP}?paid=${s.id}` });
    const done = await stripe.checkout.sessions.retrieve(s.id);
    expect(done).toMatchObject({ status: "complete", payment_status: "paid", url: null });
    const intent = await stripe.paymentIntents.retrieve(String(done.payment_intent));
    expect(intent).toMatchObject({ status: "succeeded", amount: 5000, amount_received: 5000, currency: "usd" });
    // Paying again on the same page just returns to the app.
    expect((await submitPaymentPage(`${fake.url}/pay/${s.id}`, { card: "4242424242424242" })).location).toBe(`${APP}?paid=${s.id}`);
  });

  it("signs checkout.session.completed so constructEvent verifies it, and an altered body fails", async () => {
    const s = await paid(2500);
    await waitForWebhook(fake.url, { type: "checkout.session.completed", objectId: s.id });
    const got = receiver.received.find((r) => r.event.type === "checkout.session.completed" && (r.event.data.object as Stripe.Checkout.Session).id === s.id)!;
    const event = stripe.webhooks.constructEvent(got.raw, got.signature, SECRET);
    expect(event.id).toMatch(/^evt_/);
    expect(event.data.object).toMatchObject({ id: s.id, status: "complete", payment_status: "paid", amount_total: 2500, payment_intent: s.payment_intent });
    expect(() => stripe.webhooks.constructEvent(got.raw.replace("2500", "25"), got.signature, SECRET)).toThrow(Stripe.errors.StripeSignatureVerificationError);
    expect(() => stripe.webhooks.constructEvent(got.raw, got.signature, "whsec_other")).toThrow(Stripe.errors.StripeSignatureVerificationError);
  });

  it("retries with the same event id until the app answers 2xx; a redelivery repeats the id", async () => {
    receiver.failures.set("checkout.session.completed", 2);
    const s = await paid(700);
    const delivery = await waitForWebhook(fake.url, { type: "checkout.session.completed", objectId: s.id });
    expect(delivery.attempts.map((a) => a.status)).toEqual([500, 500, 200]);
    const copies = receiver.received.filter((r) => (r.event.data.object as { id: string }).id === s.id);
    expect(copies).toHaveLength(3);
    expect(new Set(copies.map((c) => c.event.id)).size).toBe(1);
    await redeliverWebhook(fake.url, delivery.event.id);
    await expect.poll(() => receiver.received.filter((r) => r.event.id === delivery.event.id).length).toBe(4);
  });

  it("refunds part, then the rest; never more than what was paid; each sends charge.refunded", async () => {
    const s = await paid(3000);
    const intent = String(s.payment_intent);
    const first = await stripe.refunds.create({ payment_intent: intent, amount: 1000 });
    expect(first).toMatchObject({ object: "refund", amount: 1000, status: "succeeded", payment_intent: intent });
    await expect(stripe.refunds.create({ payment_intent: intent, amount: 2001 })).rejects.toMatchObject({ statusCode: 400, code: "amount_too_large" });
    const rest = await stripe.refunds.create({ payment_intent: intent });
    expect(rest.amount).toBe(2000);
    await expect(stripe.refunds.create({ payment_intent: intent, amount: 1 })).rejects.toMatchObject({ code: "charge_already_refunded" });
    const charge = (await stripe.paymentIntents.retrieve(intent)).latest_charge as string;
    await expect.poll(async () => (await listWebhookDeliveries(fake.url, { type: "charge.refunded", objectId: charge })).length).toBe(2);
    const last = (await listWebhookDeliveries(fake.url, { type: "charge.refunded", objectId: charge })).at(-1)!;
    expect(last.event.data.object).toMatchObject({ amount_refunded: 3000, refunded: true, payment_intent: intent });
  });

  it("expires an open session (checkout.session.expired) and refuses to expire it twice", async () => {
    const s = await session();
    const expired = await stripe.checkout.sessions.expire(s.id);
    expect(expired).toMatchObject({ status: "expired", url: null });
    await waitForWebhook(fake.url, { type: "checkout.session.expired", objectId: s.id });
    await expect(stripe.checkout.sessions.expire(s.id)).rejects.toBeInstanceOf(Stripe.errors.StripeInvalidRequestError);
    expect((await fetch(`${fake.url}/pay/${s.id}`)).status).toBe(410);
  });

  it("replays an idempotent POST and refuses the same key with other parameters", async () => {
    const deposit = (quantity: number) =>
      stripe.checkout.sessions.create(
        { mode: "payment", line_items: [{ quantity, price_data: { currency: "usd", unit_amount: 100, product_data: { name: "Parts deposit" } } }], success_url: APP },
        { idempotencyKey: "same-key" },
      );
    const a = await deposit(2);
    const b = await deposit(2);
    expect(b.id).toBe(a.id);
    expect(a.amount_total).toBe(200);
    const other = deposit(3);
    await expect(other).rejects.toBeInstanceOf(Stripe.errors.StripeIdempotencyError);
  });

  it("fails the next N API calls on request, and drops webhooks when told", async () => {
    await failNextApiCalls(fake.url, 1, 500);
    await expect(session()).rejects.toBeInstanceOf(Stripe.errors.StripeAPIError);
    expect((await session()).status).toBe("open");
    await dropWebhooks(fake.url, true);
    const s = await paid(100);
    await waitForWebhook(fake.url, { type: "checkout.session.completed", objectId: s.id }, "dropped");
    await dropWebhooks(fake.url, false);
  });

  it("keeps its state on disk across a restart", async () => {
    const s = await paid(4200);
    await fake.close();
    await open();
    expect(await stripe.checkout.sessions.retrieve(s.id)).toMatchObject({ status: "complete", amount_total: 4200 });
  });
});
