// The desk inbox fed by the real writers: money recorded at the counter and refunded, a card
// declined on the payments fake's page (its signed webhook through the app's handler), portfolio
// consent given / refused / withdrawn, a follower invited, parts coming in. Each lands once, with
// its job, read for whoever caused it, and without the amount for a technician.
import { mkdtemp, rm } from "node:fs/promises";
import http from "node:http";
import os from "node:os";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Knex } from "knex";
import { listWebhookDeliveries, redeliverWebhook, submitPaymentPage, waitForWebhook } from "../../fakes/payments/client";
import { createPaymentsFake, type PaymentsFake } from "../../fakes/payments/server";
import type { InboxItem } from "@/lib/inbox";
import type { Actor } from "@/lib/permissions";
import { partSchema } from "@/lib/schemas/bench";
import { inboxQuerySchema } from "@/lib/schemas/inbox";
import type { InboxKind } from "@/lib/shop-events";
import { access } from "@/lib/server/access";
import { addJobPart, changeJobPartStatus } from "@/lib/server/bench-parts";
import { inviteFollowerAs } from "@/lib/server/following";
import { inboxPageFor } from "@/lib/server/inbox-view";
import { recordCounterPayment, refundPayment, startInvoiceCheckout } from "@/lib/server/invoice-payments";
import { createInvoice, issueInvoice } from "@/lib/server/invoices";
import { receivePaymentWebhook } from "@/lib/server/payment-webhook";
import { decideConsent, proposeStory, storyContentHash } from "@/lib/server/portfolio";
import { authorise, ownerWithJobs, staffActor } from "../support/authorised-work";
import { testKnex } from "../support/db";
import { makeShop } from "../support/fixtures";

const KEY = "sk_test_benchside_inbox_test";
const SECRET = "whsec_benchside_inbox_test";
const meta = { ip: "203.0.113.7", userAgent: "vitest inbox" };

describe("desk inbox items from the writers", () => {
  let k: Knex;
  let dir: string;
  let fake: PaymentsFake;
  let hook: http.Server;
  let shop: Awaited<ReturnType<typeof makeShop>>;
  let writer: Actor, shopOwner: Actor, tech: Actor, owner: Actor;
  let jobs: { id: number; publicId: string }[];

  /** The inbox as `actor` reads it (resolved and authorised as the handler does). */
  const inbox = async (actor: Actor, query: Record<string, string> = {}) => inboxPageFor(actor, await access(actor, "shop", shop.slug, "shop:view-board"), inboxQuerySchema.parse(query));
  const ofKind = async (actor: Actor, kind: InboxKind): Promise<InboxItem[]> => (await inbox(actor, { kind })).items;
  const jobNumber = async (id: number) => Number((await k("jobs").where({ id }).first("number"))!.number);

  async function issuedInvoice(jobPublicId: string, amount: string) {
    await authorise({ writer, owner, jobPublicId, title: "Brake service", lines: [{ kind: "fee", description: "Brake service", amount }] });
    const made = await createInvoice(writer, await access(writer, "jobMoney", jobPublicId, "invoice:create"));
    const version = (await k("invoices").where({ public_id: made.publicId }).first("version"))!.version;
    await issueInvoice(writer, await access(writer, "invoice", made.publicId, "invoice:create"), version);
    return { publicId: made.publicId, balance: Number((await k("invoices").where({ public_id: made.publicId }).first("balance_minor"))!.balance_minor) };
  }

  beforeAll(async () => {
    k = testKnex();
    dir = await mkdtemp(path.join(os.tmpdir(), "inbox-payments-"));
    // The app's webhook handler in-process, as the route hands it the raw body.
    hook = http.createServer((req, res) => {
      const chunks: Buffer[] = [];
      req.on("data", (c: Buffer) => chunks.push(c));
      req.on("end", () => {
        receivePaymentWebhook(Buffer.concat(chunks).toString("utf8"), (req.headers["stripe-signature"] as string | undefined) ?? null).then(
          (answer) => res.writeHead(200, { "content-type": "application/json" }).end(JSON.stringify(answer)),
          () => res.writeHead(500).end(),
        );
      });
    });
    await new Promise<void>((resolve) => hook.listen(0, "127.0.0.1", resolve));
    const webhookUrl = `http://127.0.0.1:${(hook.address() as { port: number }).port}/api/webhooks/payments`;
    fake = await createPaymentsFake({ port: 0, dir, secretKey: KEY, webhookUrl, webhookSecret: SECRET, webhookRetryBaseMs: 50 });
    Object.assign(process.env, { STRIPE_SECRET_KEY: KEY, STRIPE_WEBHOOK_SECRET: SECRET, STRIPE_API_HOST: "127.0.0.1", STRIPE_API_PORT: String(fake.port), STRIPE_API_PROTOCOL: "http", APP_URL: "http://localhost:3998" });
    shop = await makeShop(k, { label: "inbox", roles: ["owner", "service_writer", "technician"] });
    [writer, shopOwner, tech] = [staffActor(shop, "service_writer"), staffActor(shop, "owner"), staffActor(shop, "technician")];
    ({ owner, jobs } = await ownerWithJobs(k, shop, 3, "Ada Marsh"));
  });
  afterAll(async () => {
    await fake?.close();
    await new Promise<void>((resolve) => (hook ? hook.close(() => resolve()) : resolve()));
    await k?.destroy();
    await rm(dir, { recursive: true, force: true });
  });

  it("money taken at the counter and refunded: one item each, amounts for the desk, none for the technician", async () => {
    const invoice = await issuedInvoice(jobs[0]!.publicId, "46.00");
    expect(invoice.balance).toBe(4600);
    await recordCounterPayment(writer, await access(writer, "invoice", invoice.publicId, "invoice:record-payment"), { invoice: invoice.publicId, method: "cash", amount: "10.00", reference: null });

    const [received] = await ofKind(shopOwner, "payment_received");
    expect(received).toMatchObject({ kind: "payment_received", read: false, amountMinor: 1000, currency: "USD", amount: "$10.00", job: { number: await jobNumber(jobs[0]!.id) }, actorName: expect.stringMatching(/^service_writer /) });
    expect(received!.summary).toMatch(/^Part payment in cash on invoice /);
    // Whoever recorded it has seen it.
    expect((await ofKind(writer, "payment_received"))[0]).toMatchObject({ id: received!.id, read: true });
    // A technician gets the line, never the amount.
    const techView = (await ofKind(tech, "payment_received"))[0]!;
    expect(techView.summary).toBe(received!.summary);
    expect(techView).not.toHaveProperty("amountMinor");
    expect(techView).not.toHaveProperty("amount");

    const payment = (await k("payments").where({ job_id: jobs[0]!.id, kind: "payment" }).first("id"))!;
    await refundPayment(shopOwner, await access(shopOwner, "jobMoney", jobs[0]!.publicId, "invoice:refund"), { job: jobs[0]!.publicId, payment: Number(payment.id), amount: "4.00", reason: "Goodwill", confirmed: "yes" });
    const refunds = await ofKind(writer, "payment_refunded");
    expect(refunds).toHaveLength(1);
    expect(refunds[0]).toMatchObject({ read: false, amountMinor: 400, summary: expect.stringMatching(/^Refund on invoice .* paid back in cash$/) });
  });

  it("a card declined on the payment page tells the desk why, once, even when the webhook comes twice", async () => {
    const invoice = await issuedInvoice(jobs[1]!.publicId, "120.00");
    const { url } = await startInvoiceCheckout(owner, await access(owner, "invoice", invoice.publicId, "invoice:pay"));
    const page = await submitPaymentPage(url, { card: "4000 0000 0000 9995" });
    expect(page.html).toContain("insufficient funds");
    const [delivery] = await listWebhookDeliveries(fake.url, { type: "payment_intent.payment_failed" });
    const delivered = await waitForWebhook(fake.url, { type: "payment_intent.payment_failed", objectId: delivery!.object_id });
    const failed = await ofKind(writer, "payment_failed");
    expect(failed).toHaveLength(1);
    expect(failed[0]).toMatchObject({
      read: false,
      amountMinor: invoice.balance,
      summary: "Online payment didn't go through: Your card has insufficient funds.",
      detail: "Reason given by the payments service: insufficient_funds",
      job: { number: await jobNumber(jobs[1]!.id) },
      actorName: null,
    });
    // The same event again changes nothing (its id is recorded with its effect).
    await redeliverWebhook(fake.url, delivered.event.id);
    await expect.poll(async () => (await listWebhookDeliveries(fake.url, { objectId: delivery!.object_id })).find((d) => d.event.id === delivered.event.id)?.attempts.length).toBe(2);
    expect(await ofKind(writer, "payment_failed")).toHaveLength(1);
    // Money didn't move.
    expect((await k("invoices").where({ public_id: invoice.publicId }).first("balance_minor"))!.balance_minor).toBe(invoice.balance);
  });

  it("portfolio consent given, withdrawn and refused each land, with the owner's typed name", async () => {
    // Two collected jobs of another owner (only collected jobs go in the portfolio).
    const { owner: bea, jobs: done } = await ownerWithJobs(k, shop, 2, "Bea Lund");
    await k("jobs").whereIn("id", done.map((j) => j.id)).update({ status: "picked_up" });
    const stories: Awaited<ReturnType<typeof proposeStory>>["story"][] = [];
    for (const job of done) stories.push((await proposeStory(writer, await access(writer, "job", job.publicId, "portfolio:propose"))).story);
    // Asked (the curation and asking are tested in portfolio.test.ts); agreeing binds to the story's content hash.
    await k("stories").whereIn("id", stories.map((s) => s.id)).update({ status: "consent_requested" });
    const answer = async (job: string, decision: "given" | "refused" | "withdrawn") =>
      decideConsent(bea, await access(bea, "job", job, "portfolio:consent"), { decision, name: "Bea T. Lund", shownHash: await storyContentHash(stories[done.findIndex((d) => d.publicId === job)]!) }, meta);
    await answer(done[0]!.publicId, "given");
    await answer(done[0]!.publicId, "withdrawn");
    await answer(done[1]!.publicId, "refused");
    const given = await ofKind(writer, "consent_given");
    const withdrawn = await ofKind(writer, "consent_withdrawn");
    const refused = await ofKind(writer, "consent_refused");
    expect([given.length, withdrawn.length, refused.length]).toEqual([1, 1, 1]);
    // The name the owner typed to sign, not the account's.
    expect(given[0]!.summary).toMatch(/^Bea T\. Lund agreed to the public story "/);
    expect(withdrawn[0]).toMatchObject({ job: { number: await jobNumber(done[0]!.id) }, actorName: "Bea Lund", summary: expect.stringMatching(/^Bea T\. Lund withdrew consent/) });
    expect(refused[0]).toMatchObject({ job: { number: await jobNumber(done[1]!.id) }, summary: expect.stringMatching(/^Bea T\. Lund said no/) });
  });

  it("a follower invited by the owner lands as one item", async () => {
    await inviteFollowerAs(owner, await access(owner, "job", jobs[2]!.publicId, "job:follow-manage"), "Rory.Marsh@mail.test");
    const items = await ofKind(tech, "follower_added");
    expect(items).toHaveLength(1);
    expect(items[0]).toMatchObject({ read: false, summary: "Ada Marsh invited rory.marsh@mail.test to follow the job", actorName: "Ada Marsh", job: { number: await jobNumber(jobs[2]!.id) } });
  });

  it("a part received (marked in, or added as already in) lands; ordering one doesn't", async () => {
    const onJob = await access(tech, "job", jobs[2]!.publicId, "parts:manage");
    const part = (fields: Record<string, string>) => partSchema.parse({ job: jobs[2]!.publicId, forWork: "booked", ...fields });
    const ordered = await addJobPart(tech, onJob, part({ description: "Front brake pads", partNumber: "FBP-220", qty: "2", status: "ordered" }));
    expect(await ofKind(writer, "parts_received")).toHaveLength(0);
    await changeJobPartStatus(tech, onJob, { part: ordered.id, from: "ordered", to: "received", expectedOn: null });
    await addJobPart(tech, onJob, part({ description: "Brake fluid", status: "received" }));
    const items = await ofKind(writer, "parts_received");
    expect(items.map((i) => i.summary)).toEqual(["1 × Brake fluid received", "2 × Front brake pads (FBP-220) received"]);
    expect(items.every((i) => !i.read && i.job?.number != null)).toBe(true);
    // The technician who marked them in has nothing new to read.
    expect((await ofKind(tech, "parts_received")).every((i) => i.read)).toBe(true);
  });
});
