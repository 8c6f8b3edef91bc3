import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Knex } from "knex";
import type { MailFake } from "@/fakes/mail/server";
import { readFirstRun } from "@/db/queries/shop-signup";
import { shopSignupSchema } from "@/lib/schemas/shop-signup";
import { SIGNUP_LIMITS, SIGNUP_REFUSALS, confirmShop, startShop, viewShopSignup } from "@/lib/server/shop-signup";
import { checkPassword } from "@/lib/server/sign-in";
import { runOutboxOnce } from "@/lib/server/outbox-worker";
import { makeShop } from "../support/fixtures";
import { listMail } from "../support/mailbox";
import { freshMailWorld } from "../support/mail-world";
import { refusalOf as failureOf } from "../support/refusal";

// A new shop starts itself (issue 16 §1). The outbox worker claims every due row it can see, so
// this file has a database of its own, like sign-in.test.ts.
const PASSWORD = "gravel road at dusk";
let fresh: Awaited<ReturnType<typeof freshMailWorld>>["fresh"];
let db: Knex;
let mail: MailFake;
let ipCounter = 0;
const freshIp = () => `203.0.113.${++ipCounter}`; // documentation range (RFC 5737), one per test
const pool = globalThis as { benchsideDb?: Knex };

const form = (over: Record<string, string> = {}) =>
  shopSignupSchema.parse({
    shopName: "Kestrel Ridge Motor Works",
    slug: "kestrel-ridge",
    timezone: "America/Denver",
    currency: "USD",
    ownerName: "Wren Alvarado",
    email: "wren@kestrel-ridge.test",
    password: PASSWORD,
    ...over,
  });

async function deliver() {
  for (let i = 0; i < 50; i++) {
    const run = await runOutboxOnce({ backoffBaseMs: 0, backoffMaxMs: 0, priorityBackoffBaseMs: 0, priorityBackoffMaxMs: 0 });
    if (run.claimed === 0) return;
  }
  throw new Error("the outbox never emptied");
}

/** The token of the newest confirmation mail to `to`. */
async function tokenFor(to: string): Promise<string> {
  await deliver();
  const [newest] = await listMail(mail.url, { to });
  const token = /\/start\/confirm\?token=([A-Za-z0-9_-]{43})/.exec(newest?.text ?? "")?.[1];
  if (!token) throw new Error(`no confirmation link mailed to ${to}`);
  return token;
}

beforeAll(async () => {
  ({ fresh, k: db, fake: mail } = await freshMailWorld("signup", "http://localhost:3999"));
});
afterAll(async () => {
  await pool.benchsideDb?.destroy();
  await mail?.close();
  await fresh?.drop();
});

describe("a new shop signs up", () => {
  it("sign up → confirmation mail → confirm → shop, owner and membership exist, and the password signs in", async () => {
    const input = form();
    await startShop({ input, ip: freshIp() });
    // Nothing but the pending sign-up exists before the link is opened.
    expect(await db("shops").where({ slug: "kestrel-ridge" }).first()).toBeUndefined();
    expect(await db("users").where({ email: input.email }).first()).toBeUndefined();
    const queued = await db("outbox").where({ to_email: input.email }).first("priority", "send_before");
    expect(Number(queued?.priority)).toBeGreaterThan(0);
    expect(queued?.send_before).not.toBeNull();
    const stored = await db("shop_signups").where({ email: input.email }).first();
    expect(stored?.password_hash).not.toContain(PASSWORD);

    const token = await tokenFor(input.email);
    expect(stored?.token_hash).not.toBe(token);
    expect(await viewShopSignup({ token })).toMatchObject({ ok: true, slug: "kestrel-ridge", existingAccount: false });
    expect(await failureOf(confirmShop({ token, password: "not the one", ip: freshIp() }))).toMatchObject({ code: "invalid", fields: { password: [SIGNUP_REFUSALS["wrong-new-password"]] } });

    expect(await confirmShop({ token, password: PASSWORD, ip: freshIp() })).toEqual({ slug: "kestrel-ridge", email: input.email });
    const shop = await db("shops").where({ slug: "kestrel-ridge" }).first();
    expect(shop).toMatchObject({ name: "Kestrel Ridge Motor Works", timezone: "America/Denver", currency: "USD" });
    const user = await db("users").where({ email: input.email }).first();
    expect(user?.name).toBe("Wren Alvarado");
    expect(await db("memberships").where({ shop_id: shop!.id, user_id: user!.id }).first("role")).toEqual({ role: "owner" });
    expect((await checkPassword({ email: input.email, password: PASSWORD, ip: freshIp() })).id).toBe(user!.id);

    // The checklist starts empty and ticks itself from the data.
    expect(await readFirstRun({ shopId: shop!.id })).toEqual({ labourRate: false, staff: false, firstJob: false });
    await db("shop_money_settings").insert({ shop_id: shop!.id, labour_rate_minor: 9800 });
    await db("staff_invites").insert({ shop_id: shop!.id, email: "tech@kestrel-ridge.test", name: "Tam", role: "technician", token_hash: "a".repeat(64), expires_at: new Date(Date.now() + 86_400_000) });
    expect(await readFirstRun({ shopId: shop!.id })).toEqual({ labourRate: true, staff: true, firstJob: false });

    // The link works once.
    expect(await failureOf(confirmShop({ token, password: PASSWORD, ip: freshIp() }))).toMatchObject({ code: "conflict", message: SIGNUP_REFUSALS["link-used"] });
    expect(await viewShopSignup({ token })).toEqual({ ok: false, message: SIGNUP_REFUSALS["link-used"] });
    expect(await db("shops").where({ slug: "kestrel-ridge" }).count({ n: "*" }).first()).toEqual({ n: 1 });
  });

  it("an address that already has an account proves its own password and gets the new shop", async () => {
    const existing = await makeShop(db, { label: "signup-existing", roles: ["owner"], password: PASSWORD });
    const email = existing.staff.owner!.email;
    await startShop({ input: form({ slug: "second-bay", email, password: "a different new phrase" }), ip: freshIp() });
    const token = await tokenFor(email);
    const [sent] = await listMail(mail.url, { to: email });
    expect(sent?.text).toMatch(/already have a Benchside account/);
    expect(await viewShopSignup({ token })).toMatchObject({ ok: true, existingAccount: true });
    // The password typed on the form doesn't prove the account; the account's own one does.
    expect(await failureOf(confirmShop({ token, password: "a different new phrase", ip: freshIp() }))).toMatchObject({
      code: "invalid",
      fields: { password: [SIGNUP_REFUSALS["wrong-account-password"]] },
    });
    await confirmShop({ token, password: PASSWORD, ip: freshIp() });
    const shop = await db("shops").where({ slug: "second-bay" }).first("id");
    expect(await db("memberships").where({ shop_id: shop!.id, user_id: existing.staff.owner!.id }).first("role")).toEqual({ role: "owner" });
    expect(await db("users").where({ email }).count({ n: "*" }).first()).toEqual({ n: 1 });
  });
});

describe("an address known as a machine owner", () => {
  it("an account with no password (link sign-in only) takes the password chosen on the form, and becomes the owner", async () => {
    const email = "rider@signup.test";
    await db("users").insert({ email, name: "Rider Only" });
    await startShop({ input: form({ slug: "rider-garage", email }), ip: freshIp() });
    const token = await tokenFor(email);
    expect(await viewShopSignup({ token })).toMatchObject({ ok: true, existingAccount: false });
    await confirmShop({ token, password: PASSWORD, ip: freshIp() });
    const user = await db("users").where({ email }).first("id", "name");
    // The name they had stays; the password now signs them in as the shop's owner.
    expect(user?.name).toBe("Rider Only");
    expect((await checkPassword({ email, password: PASSWORD, ip: freshIp() })).id).toBe(user!.id);
    const shop = await db("shops").where({ slug: "rider-garage" }).first("id");
    expect(await db("memberships").where({ shop_id: shop!.id, user_id: user!.id }).first("role")).toEqual({ role: "owner" });
  });
});

describe("refusals", () => {
  it("a taken address is refused beside the slug field, and nothing is stored or mailed", async () => {
    await makeShop(db, { label: "taken" }).then((s) => db("shops").where({ id: s.id }).update({ slug: "taken-slug" }));
    const email = "taken@signup.test";
    expect(await failureOf(startShop({ input: form({ slug: "taken-slug", email }), ip: freshIp() }))).toMatchObject({
      code: "conflict",
      fields: { slug: [SIGNUP_REFUSALS["slug-taken"]] },
    });
    expect(await db("shop_signups").where({ email }).first()).toBeUndefined();
    expect(await db("outbox").where({ to_email: email }).first()).toBeUndefined();
  });

  it("reserved words and malformed addresses are refused by the form schema beside the slug field", () => {
    for (const [slug, message] of [
      ["admin", /kept for Benchside/],
      ["sign-in", /kept for Benchside/],
      ["Bad Slug!", /lowercase letters, digits and single hyphens/],
      ["a--b", /single hyphens/],
      ["ab", /3 to 40/],
    ] as const) {
      const parsed = shopSignupSchema.safeParse({ ...form(), slug });
      expect(parsed.success, slug).toBe(false);
      const issue = parsed.error!.issues.find((i) => i.path[0] === "slug");
      expect(issue?.message, slug).toMatch(message);
    }
    expect(shopSignupSchema.safeParse({ ...form(), timezone: "Mars/Olympus" }).error?.issues[0]?.path).toEqual(["timezone"]);
    expect(shopSignupSchema.safeParse({ ...form(), currency: "XXX" }).error?.issues[0]?.path).toEqual(["currency"]);
  });

  it("a common password is refused beside the password field (NIST SP 800-63B §5.1.1.2)", async () => {
    expect(await failureOf(startShop({ input: form({ slug: "weak-pass", email: "weak@signup.test", password: "password123" }), ip: freshIp() }))).toMatchObject({
      code: "invalid",
      fields: { password: [expect.stringMatching(/commonly used/)] },
    });
  });

  it("an expired link is refused and creates nothing", async () => {
    const email = "late@signup.test";
    await startShop({ input: form({ slug: "late-start", email }), ip: freshIp() });
    const token = await tokenFor(email);
    await db("shop_signups").where({ email }).update({ expires_at: db.raw("NOW(3) - INTERVAL 1 MINUTE") });
    expect(await failureOf(confirmShop({ token, password: PASSWORD, ip: freshIp() }))).toMatchObject({ code: "conflict", message: SIGNUP_REFUSALS["link-expired"] });
    expect(await db("shops").where({ slug: "late-start" }).first()).toBeUndefined();
    expect(await failureOf(confirmShop({ token: "x".repeat(43), password: PASSWORD, ip: freshIp() }))).toMatchObject({ code: "not_found" });
  });

  it("two confirmations of one link at once create one shop", async () => {
    const email = "twice@signup.test";
    await startShop({ input: form({ slug: "double-click", email }), ip: freshIp() });
    const token = await tokenFor(email);
    const results = await Promise.all([0, 1].map(() => failureOf(confirmShop({ token, password: PASSWORD, ip: freshIp() }))));
    expect(results.map((r) => r.code).sort()).toEqual(["conflict", "no failure"]);
    expect(await db("shops").where({ slug: "double-click" }).count({ n: "*" }).first()).toEqual({ n: 1 });
    expect(await db("memberships as m").join("users as u", "u.id", "m.user_id").where("u.email", email).count({ n: "*" }).first()).toEqual({ n: 1 });
  });
});

describe("limits", () => {
  it(`an address gets ${SIGNUP_LIMITS.requestsPerEmail.max} sign-ups an hour, refused beside the e-mail field after that`, async () => {
    const email = "eager@signup.test";
    for (let i = 0; i < SIGNUP_LIMITS.requestsPerEmail.max; i++) {
      expect(await failureOf(startShop({ input: form({ slug: `eager-${i}`, email }), ip: freshIp() }))).toEqual({ code: "no failure" });
    }
    expect(await failureOf(startShop({ input: form({ slug: "eager-x", email }), ip: freshIp() }))).toMatchObject({
      code: "rate_limited",
      fields: { email: [SIGNUP_REFUSALS["too-many"]] },
    });
    await deliver();
    expect(await listMail(mail.url, { to: email })).toHaveLength(SIGNUP_LIMITS.requestsPerEmail.max);
  });

  it(`one network address gets ${SIGNUP_LIMITS.requestsPerIp.max} sign-ups an hour whatever the e-mail`, async () => {
    const ip = freshIp();
    for (let i = 0; i < SIGNUP_LIMITS.requestsPerIp.max; i++) await startShop({ input: form({ slug: `from-ip-${i}`, email: `ip${i}@signup.test` }), ip });
    expect(await failureOf(startShop({ input: form({ slug: "from-ip-x", email: "ipx@signup.test" }), ip }))).toMatchObject({ code: "rate_limited" });
  });

  it("a refused form doesn't use up the limit", async () => {
    const email = "fixer@signup.test";
    for (let i = 0; i < SIGNUP_LIMITS.requestsPerEmail.max + 1; i++) {
      expect((await failureOf(startShop({ input: form({ slug: `fixer-${i}`, email, password: "password" }), ip: freshIp() }))).code).toBe("invalid");
    }
    expect(await failureOf(startShop({ input: form({ slug: "fixer-ok", email }), ip: freshIp() }))).toEqual({ code: "no failure" });
  });
});
