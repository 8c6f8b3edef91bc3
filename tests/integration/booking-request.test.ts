import { beforeAll, describe, expect, it } from "vitest";
import type { Knex } from "knex";
import { NextRequest } from "next/server";
import { GET as ticketRoute } from "@/app/api/public/shops/[shop]/booking-ticket/route";
import { saveShopProfile } from "@/db/queries/portfolio";
import { getPublicFace } from "@/db/queries/public-face";
import { bookingRequestSchema } from "@/lib/schemas/booking";
import { getPublicShopPage } from "@/lib/server/portfolio-public";
import { access } from "@/lib/server/access";
import { BOOKING_LIMITS, BOOKING_REFUSALS, bookingTicketFor, requestBooking } from "@/lib/server/booking";
import { inboxPageFor } from "@/lib/server/inbox-view";
import { bookingTicket, readBookingTicket } from "@/lib/server/signed-token";
import { inboxQuerySchema } from "@/lib/schemas/inbox";
import { staffActor } from "../support/authorised-work";
import { testKnex } from "../support/db";
import { makeShop } from "../support/fixtures";
import { refusalOf as failureOf } from "../support/refusal";

// A booking request from the shop's public page (issue 16 §6): lands in the desk inbox, once;
// a honeypot, a minimum fill time carried by a signed ticket and per-address limits keep spam out.
let k: Knex;
let shop: Awaited<ReturnType<typeof makeShop>>;
let other: Awaited<ReturnType<typeof makeShop>>;
let ipCounter = 0;
const freshIp = () => `192.0.2.${++ipCounter}`; // documentation range (RFC 5737), one per test
const SOON = BOOKING_LIMITS.minFillMs + 1_000;

const form = (over: Record<string, string> = {}, ticketShop = shop.id, issuedAgoMs = SOON) =>
  bookingRequestSchema.parse({
    shop: shop.slug,
    ticket: bookingTicket(ticketShop, new Date(Date.now() - issuedAgoMs)),
    name: "Juno Faraday",
    email: "juno@booking.test",
    phone: "+1 555 0142",
    machine: "2017 Ridgeline 450 trail bike",
    work: "Front brake feels soft after a fluid change",
    when: "Any weekday morning",
    ...over,
  });

const bookings = async (shopId: number) => k("shop_events").where({ shop_id: shopId, kind: "booking_request" }).select("id", "payload");

beforeAll(async () => {
  process.env.AUTH_SECRET ??= "booking-request-test-secret";
  process.env.APP_URL ??= "http://localhost:3997";
  k = testKnex();
  shop = await makeShop(k, { label: "booking", roles: ["owner", "service_writer"] });
  other = await makeShop(k, { label: "booking-other", roles: ["owner"] });
});

describe("a booking request from the public page", () => {
  it("lands in the desk inbox once, with the person's words, and is mailed at once to the staff", async () => {
    const before = await k("outbox").where({ shop_id: shop.id, kind: "inbox" }).count({ n: "*" }).first();
    expect(await requestBooking({ input: form(), ip: freshIp() })).toEqual({ recorded: true });
    const rows = await bookings(shop.id);
    expect(rows).toHaveLength(1);
    const raw = rows[0]!.payload as unknown;
    const payload = (typeof raw === "string" ? JSON.parse(raw) : raw) as Record<string, unknown>;
    expect(payload).toMatchObject({ name: "Juno Faraday", email: "juno@booking.test", machine: "2017 Ridgeline 450 trail bike", summary: "Juno Faraday asks to book in: 2017 Ridgeline 450 trail bike" });
    const writer = staffActor(shop, "service_writer");
    const page = await inboxPageFor(writer, await access(writer, "shop", shop.slug, "shop:view-board"), inboxQuerySchema.parse({ kind: "booking_request" }));
    expect(page.items.map((i) => i.kind)).toEqual(["booking_request"]);
    // DEFAULT_DELIVERY "now": one e-mail to each of the two staff members.
    const after = await k("outbox").where({ shop_id: shop.id, kind: "inbox" }).count({ n: "*" }).first();
    expect(Number(after?.n) - Number(before?.n)).toBe(2);
    expect(await bookings(other.id)).toHaveLength(0);
  });

  it("a filled honeypot gets the same answer and writes nothing", async () => {
    const count = (await bookings(shop.id)).length;
    expect(await requestBooking({ input: form({ website: "http://spam.test" }), ip: freshIp() })).toEqual({ recorded: false });
    expect(await bookings(shop.id)).toHaveLength(count);
  });

  it(`a form sent sooner than ${BOOKING_LIMITS.minFillMs} ms after the page was rendered is told to check and send again`, async () => {
    expect(await failureOf(requestBooking({ input: form({}, shop.id, 500), ip: freshIp() }))).toMatchObject({ code: "invalid", message: BOOKING_REFUSALS.tooFast });
  });

  it("a ticket from another shop's page, a forged one or one a day old is refused", async () => {
    expect(await failureOf(requestBooking({ input: form({}, other.id), ip: freshIp() }))).toMatchObject({ code: "invalid", message: BOOKING_REFUSALS.ticket });
    expect(await failureOf(requestBooking({ input: { ...form(), ticket: "A".repeat(40) }, ip: freshIp() }))).toMatchObject({ code: "invalid", message: BOOKING_REFUSALS.ticket });
    expect(await failureOf(requestBooking({ input: form({}, shop.id, BOOKING_LIMITS.maxAgeMs + 60_000), ip: freshIp() }))).toMatchObject({ code: "invalid" });
    expect(await failureOf(requestBooking({ input: { ...form(), shop: "no-such-shop-here" }, ip: freshIp() }))).toMatchObject({ code: "not_found" });
  });

  it(`one network address gets ${BOOKING_LIMITS.perIp.max} requests an hour`, async () => {
    const ip = freshIp();
    for (let i = 0; i < BOOKING_LIMITS.perIp.max; i++) await requestBooking({ input: form({ email: `ip${i}@booking.test` }), ip });
    expect(await failureOf(requestBooking({ input: form({ email: "ipx@booking.test" }), ip }))).toMatchObject({ code: "rate_limited", message: BOOKING_REFUSALS.tooMany });
  });

  it(`one e-mail address gets ${BOOKING_LIMITS.perEmail.max} requests an hour, refused beside the field after that`, async () => {
    const email = "again@booking.test";
    for (let i = 0; i < BOOKING_LIMITS.perEmail.max; i++) await requestBooking({ input: form({ email }), ip: freshIp() });
    expect(await failureOf(requestBooking({ input: form({ email }), ip: freshIp() }))).toMatchObject({ code: "rate_limited", fields: { email: [BOOKING_REFUSALS.tooMany] } });
  });

  it("bad fields are refused by the schema beside the field", () => {
    const parsed = bookingRequestSchema.safeParse({ shop: shop.slug, ticket: "A".repeat(40), name: "", email: "nope", machine: "x", work: "hi", phone: "call me" });
    const paths = parsed.error!.issues.map((i) => i.path[0]).sort();
    expect(paths).toEqual(["email", "machine", "name", "phone", "work"]);
  });

  it("the public page's face: opening hours as the shop keeps them", async () => {
    await k("shops").where({ id: shop.id }).update({ opening_hours: JSON.stringify({ mon: { open: "08:00", close: "17:30" }, sun: null }) });
    const face = await getPublicFace({ slug: shop.slug });
    expect(face?.openingHours?.mon).toEqual({ open: "08:00", close: "17:30" });
    expect(face?.openingHours?.sun).toBeNull();
    expect(await getPublicFace({ slug: "no-such-shop-here" })).toBeNull();
  });

  it("the form's ticket is made when the form asks (the page is cached): this shop's, dated now", async () => {
    const at = new Date("2026-12-04T10:00:00Z");
    const ticket = await bookingTicketFor(shop.slug, at);
    expect(ticket).toMatch(/^[A-Za-z0-9_-]{24,200}$/);
    expect(readBookingTicket(ticket!)).toEqual({ shopId: shop.id, issuedAt: at.getTime() });
    expect(await bookingTicketFor("no-such-shop-here")).toBeNull();
  });

  it("GET /api/public/shops/:shop/booking-ticket: a fresh ticket for anyone, never cached; 404 for no shop", async () => {
    const ask = (slug: string) => ticketRoute(new NextRequest(`http://app.test/api/public/shops/${slug}/booking-ticket`), { params: Promise.resolve({ shop: slug }) });
    const before = Date.now();
    const res = await ask(shop.slug);
    expect(res.status).toBe(200);
    expect(res.headers.get("cache-control")).toBe("no-store");
    const read = readBookingTicket(((await res.json()) as { ticket: string }).ticket);
    expect(read?.shopId).toBe(shop.id);
    expect(read!.issuedAt).toBeGreaterThanOrEqual(before);
    expect(read!.issuedAt).toBeLessThanOrEqual(Date.now());
    const missing = await ask("no-such-shop-here");
    expect(missing.status).toBe(404);
    expect(((await missing.json()) as { error: { code: string } }).error.code).toBe("not_found");
  });

  it("what the shop takes in, written on its profile, is on the public page", async () => {
    const takesIn = "Dirt bikes and quads; engine and brake work, no paint.";
    await saveShopProfile({ shopId: shop.id, displayName: null, about: null, locationText: null, takesIn, showLocation: false, publicEmail: null, publicPhone: null });
    expect((await getPublicShopPage(shop.slug, null))?.shop.takesIn).toBe(takesIn);
  });
});
