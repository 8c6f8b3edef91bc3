import "server-only";
import crypto from "node:crypto";
import { createShopFromSignup, findShopSignup, hasUserAccount, insertShopSignup, isSlugTaken, pruneShopSignups } from "@/db/queries/shop-signup";
import { MAIL_PRIORITY, enqueueMail } from "@/db/queries/outbox";
import { reserveAttempt, settleAttempt } from "@/db/queries/sign-in";
import { transaction } from "@/db/transaction";
import { AppError } from "@/lib/errors";
import type { ShopSignupInput } from "@/lib/schemas/shop-signup";
import { appUrl } from "@/lib/server/config";
import { escapeHtml } from "@/lib/server/mail";
import { assertUsablePassword, hashPassword, verifyPassword } from "@/lib/server/password";
import { LIMITS as SIGN_IN_LIMITS, envCount, hashToken } from "@/lib/server/sign-in";

// Per address and per network address, like the sign-in limits (lib/server/sign-in.ts).
export const SIGNUP_LIMITS = {
  requestsPerEmail: { max: 3, minutes: 60 },
  requestsPerIp: { max: envCount("SIGNUPS_PER_IP", 10), minutes: 60 },
  linkFailuresPerIp: { max: envCount("SIGN_IN_FAILURES_PER_IP", 30), minutes: 15 },
  linkTtlMinutes: 60,
};

export const SIGNUP_REFUSALS = {
  "too-many": `Several shops were started from here or for this address already. Use the newest e-mail, or wait ${SIGNUP_LIMITS.requestsPerEmail.minutes} minutes and try again.`,
  "slug-taken": "Another shop has this address. Choose another, e.g. with your town added.",
  "link-unknown": "This confirmation link isn't valid. Open it again from the e-mail, or start again.",
  "link-used": "This confirmation link has already been used: your shop exists. Sign in to reach it.",
  "link-expired": `This confirmation link has expired (links last ${SIGNUP_LIMITS.linkTtlMinutes} minutes). Start again; nothing was created.`,
  "too-many-tries": "Too many tries from here. Wait 15 minutes, then open the link again.",
  "wrong-new-password": "That isn't the password you chose when you started the shop. Try again.",
  "wrong-account-password": "That isn't the password of your Benchside account. Enter the password you sign in with, or reset it from the sign-in page first.",
  "slug-gone": "Another shop took this address after you started. Start again with another address; nothing was created.",
} as const;

const refuse = (code: "invalid" | "rate_limited" | "conflict" | "not_found", key: keyof typeof SIGNUP_REFUSALS, field?: string): never => {
  throw new AppError(code, SIGNUP_REFUSALS[key], field ? { [field]: [SIGNUP_REFUSALS[key]] } : undefined);
};

/**
 * Stores the pending shop and queues its confirmation link at sign-in priority (the worker's fast
 * lane; never sent after the link expires). Nothing else is created until the link is opened.
 * The answer is the same whether or not the address has an account; only the e-mail says so.
 */
export async function startShop({ input, ip }: { input: ShopSignupInput; ip: string }): Promise<void> {
  if (Math.random() < 0.02) await pruneShopSignups({ olderThanHours: 48 });
  const byIp = await reserveAttempt({ kind: "signup_request", subject: `ip:${ip}`, limit: SIGNUP_LIMITS.requestsPerIp, counting: "accepted" });
  if (!byIp.allowed) refuse("rate_limited", "too-many");
  const byEmail = await reserveAttempt({ kind: "signup_request", subject: input.email, limit: SIGNUP_LIMITS.requestsPerEmail, counting: "accepted" });
  if (!byEmail.allowed) refuse("rate_limited", "too-many", "email");
  try {
    if (await isSlugTaken({ slug: input.slug })) refuse("conflict", "slug-taken", "slug");
    assertUsablePassword(input.password, [input.ownerName, input.email, input.shopName, "benchside"]);
  } catch (error) {
    // A refused form doesn't use up the limits: the person fixes a field and sends it again.
    await settleAttempt({ id: byIp.id, succeeded: false });
    await settleAttempt({ id: byEmail.id, succeeded: false });
    throw error;
  }

  const token = crypto.randomBytes(32).toString("base64url");
  const url = `${appUrl()}/start/confirm?token=${token}`;
  const passwordHash = await hashPassword(input.password);
  await transaction(async (tx) => {
    const hasAccount = await hasUserAccount({ email: input.email }, tx);
    await insertShopSignup(tx, { ...input, passwordHash, tokenHash: hashToken(token), ttlMinutes: SIGNUP_LIMITS.linkTtlMinutes });
    const account = hasAccount
      ? "You already have a Benchside account with this address. When the link asks for a password, enter the one you sign in with (not the one typed on the form); the new shop is added to that account."
      : "When the link asks, enter the password you chose on the form.";
    const lines = `The link works once and expires in ${SIGNUP_LIMITS.linkTtlMinutes} minutes. If you didn't start a shop, ignore this e-mail and nothing is created.`;
    await enqueueMail(tx, {
      shopId: null,
      kind: "shop-signup",
      to: input.email,
      subject: `Confirm your shop on Benchside: ${input.shopName}`,
      text: `Open this link to create ${input.shopName} (/${input.slug}):\n\n${url}\n\n${account}\n\n${lines}`,
      html: `<p>Open this link to create <strong>${escapeHtml(input.shopName)}</strong>:</p><p><a href="${escapeHtml(url)}">Confirm and create the shop</a></p><p>${escapeHtml(account)}</p><p>${lines}</p>`,
      priority: MAIL_PRIORITY.signInLink,
      sendBefore: new Date(Date.now() + SIGNUP_LIMITS.linkTtlMinutes * 60_000),
    });
  });
}

/** What the confirmation page shows before the password is typed (the token holder reads their own mail). */
export async function viewShopSignup({ token }: { token: string }) {
  const found = await findShopSignup({ tokenHash: hashToken(token) });
  if (!found) return { ok: false as const, message: SIGNUP_REFUSALS["link-unknown"] };
  if (found.state !== "open") return { ok: false as const, message: SIGNUP_REFUSALS[found.state === "used" ? "link-used" : "link-expired"] };
  return { ok: true as const, shopName: found.shopName, slug: found.slug, email: found.email, existingAccount: !!found.accountPasswordHash };
}

/**
 * Opens the link: the password proves the person (the one chosen at sign-up, or, when the
 * address already has an account with a password, that account's, counted against the same
 * per-address lock as sign-in). Then the shop, owner and membership are written in one
 * transaction with the sign-up row locked, so the link works once however often it is opened.
 */
export async function confirmShop({ token, password, ip }: { token: string; password: string; ip: string }): Promise<{ slug: string; email: string }> {
  const byIp = await reserveAttempt({ kind: "signup_use", subject: `ip:${ip}`, limit: SIGNUP_LIMITS.linkFailuresPerIp, counting: "failures" });
  if (!byIp.allowed) refuse("rate_limited", "too-many-tries");
  const tokenHash = hashToken(token);
  const found = await findShopSignup({ tokenHash });
  if (!found) refuse("not_found", "link-unknown");
  if (found!.state !== "open") refuse("conflict", found!.state === "used" ? "link-used" : "link-expired");
  const s = found!;

  if (s.accountPasswordHash) {
    const byEmail = await reserveAttempt({ kind: "password", subject: s.email, limit: SIGN_IN_LIMITS.passwordFailuresPerEmail, counting: "failures" });
    if (!byEmail.allowed) refuse("rate_limited", "too-many-tries", "password");
    if (!(await verifyPassword(password, s.accountPasswordHash))) refuse("invalid", "wrong-account-password", "password");
    await settleAttempt({ id: byEmail.id, succeeded: true });
  } else if (!(await verifyPassword(password, s.passwordHash))) {
    refuse("invalid", "wrong-new-password", "password");
  }

  try {
    await transaction(async (tx) => {
      const locked = await findShopSignup({ tokenHash, lock: true }, tx);
      if (!locked || locked.state !== "open") refuse("conflict", locked?.state === "expired" ? "link-expired" : "link-used");
      if (await isSlugTaken({ slug: locked!.slug }, tx)) refuse("conflict", "slug-gone");
      await createShopFromSignup(tx, locked!);
    });
  } catch (error) {
    // Two sign-ups for one address confirmed at the same moment: the unique key keeps one.
    if ((error as { code?: string }).code === "ER_DUP_ENTRY") refuse("conflict", "slug-gone");
    throw error;
  }
  await settleAttempt({ id: byIp.id, succeeded: true });
  return { slug: s.slug, email: s.email };
}
