import "server-only";
import crypto from "node:crypto";
import { claimCustomerRecords, getStaffSignIn, isCustomerAddress, touchLastSignIn } from "@/db/queries/users";
import { insertSignInLink, pruneSignInRecords, redeemSignInLink, reserveAttempt, settleAttempt } from "@/db/queries/sign-in";
import { pruneSessions } from "@/db/queries/sessions";
import { MAIL_PRIORITY, enqueueMail } from "@/db/queries/outbox";
import { transaction } from "@/db/transaction";
import { escapeHtml } from "@/lib/server/mail";
import { timingDecoyHash, verifyPassword } from "@/lib/server/password";
import { appUrl } from "@/lib/server/config";
import { hashToken } from "@/lib/server/signed-token";

/** A positive whole number from the environment, or the fallback (per-address limits that are settings). */
export const envCount = (key: string, fallback: number) => {
  const n = Number(process.env[key]);
  return Number.isInteger(n) && n > 0 ? n : fallback;
};

// Limits per address, and per network address so one machine can't try many accounts.
// The per-network ones are settings: a shop whose staff share one public IP may raise them.
export const LIMITS = {
  passwordFailuresPerEmail: { max: 5, minutes: 15 },
  passwordFailuresPerIp: { max: envCount("SIGN_IN_FAILURES_PER_IP", 30), minutes: 15 },
  linkRequestsPerEmail: { max: 3, minutes: 15 },
  linkRequestsPerIp: { max: envCount("SIGN_IN_LINKS_PER_IP", 10), minutes: 60 },
  linkFailuresPerIp: { max: envCount("SIGN_IN_FAILURES_PER_IP", 30), minutes: 15 },
  linkTtlMinutes: 20,
};

// The answers never tell whether an address has an account: a wrong address and a wrong
// password get the same words, and a link request is answered the same for every address.
export const SIGN_IN_FAILURES = {
  "invalid-input": "Enter your e-mail address and password.",
  "wrong-credentials": "That e-mail address and password don't match a shop account. Check both and try again, or ask your shop owner to add you.",
  "too-many-attempts": `Too many tries. Wait ${LIMITS.passwordFailuresPerEmail.minutes} minutes, then try again.`,
  "too-many-links": `Several links were asked for already. Use the newest one, or wait ${LIMITS.linkRequestsPerEmail.minutes} minutes and ask again.`,
  "link-unknown": "This sign-in link isn't valid. Ask for a new one below.",
  "link-used": "This sign-in link has already been used. Each link works once; ask for a new one below.",
  "link-expired": `This sign-in link has expired. Links last ${LIMITS.linkTtlMinutes} minutes; ask for a new one below.`,
};
export type SignInFailureCode = keyof typeof SIGN_IN_FAILURES;

/** What the link form answers for every address it accepts, known or not. */
export const LINK_REQUEST_ANSWER = `If a shop knows that address, a sign-in link is on its way. It works once and lasts ${LIMITS.linkTtlMinutes} minutes.`;

export class SignInFailure extends Error {
  constructor(readonly code: SignInFailureCode) {
    super(SIGN_IN_FAILURES[code]);
  }
}

/** Now and then, forget attempts, links and sessions old enough to no longer matter. */
async function housekeeping() {
  if (Math.random() < 0.02) {
    await pruneSignInRecords({ olderThanHours: 24 });
    await pruneSessions({ olderThanHours: 24 });
  }
}

/**
 * A staff sign-in. An unknown address, an account with no shop role or no password, and a wrong
 * password all fail the same way after the same work (one query, one bcrypt comparison: against
 * a decoy hash when there is no real one), so neither the answer nor its timing tells them apart.
 */
export async function checkPassword({ email, password, ip }: { email: string; password: string; ip: string }) {
  await housekeeping();
  const byEmail = await reserveAttempt({ kind: "password", subject: email, limit: LIMITS.passwordFailuresPerEmail, counting: "failures" });
  const byIp = await reserveAttempt({ kind: "password", subject: `ip:${ip}`, limit: LIMITS.passwordFailuresPerIp, counting: "failures" });
  if (!byEmail.allowed || !byIp.allowed) throw new SignInFailure("too-many-attempts");

  const user = await getStaffSignIn({ email });
  const usable = user?.passwordHash && user.roles > 0 ? user.passwordHash : null;
  const matches = await verifyPassword(password, usable ?? (await timingDecoyHash()));
  if (!user || !usable || !matches) throw new SignInFailure("wrong-credentials");
  await settleAttempt({ id: byEmail.id, succeeded: true });
  await settleAttempt({ id: byIp.id, succeeded: true });
  await touchLastSignIn({ userId: user.id });
  return { id: user.id, email: user.email, name: user.name };
}

// In lib/server/signed-token.ts, which imports no queries: the texts code uses it too (no import cycle).
export { hashToken };

/** Thrown inside the link transaction to roll back the work done for an unknown address. */
class NotForThisAddress extends Error {}

/**
 * Queues a one-time sign-in link for a machine owner (staff sign in with their password) and
 * answers the same whether or not the address is known: the limits count every address alike,
 * and an unknown address goes through the same work (the link and its e-mail are written, then
 * rolled back), so neither the answer nor its timing tells. The e-mail goes through the outbox
 * at sign-in priority (the worker's fast lane): asked for while mail is down, it is sent when
 * mail is back, and not at all once the link has expired.
 */
export async function requestSignInLink({ email, ip, next }: { email: string; ip: string; next?: string }): Promise<void> {
  await housekeeping();
  const byIp = await reserveAttempt({ kind: "link_request", subject: `ip:${ip}`, limit: LIMITS.linkRequestsPerIp, counting: "accepted" });
  if (!byIp.allowed) throw new SignInFailure("too-many-links");
  const byEmail = await reserveAttempt({ kind: "link_request", subject: email, limit: LIMITS.linkRequestsPerEmail, counting: "accepted" });
  if (!byEmail.allowed) throw new SignInFailure("too-many-links");

  const known = await isCustomerAddress({ email });
  const token = crypto.randomBytes(32).toString("base64url");
  const url = `${appUrl()}/sign-in/link?token=${token}${next ? `&next=${encodeURIComponent(next)}` : ""}`;
  const sendBefore = new Date(Date.now() + LIMITS.linkTtlMinutes * 60_000);
  const lines = `It works once and expires in ${LIMITS.linkTtlMinutes} minutes. If you didn't ask for it, ignore this e-mail.`;
  try {
    await transaction(async (tx) => {
      await insertSignInLink(tx, { email, tokenHash: hashToken(token), ttlMinutes: LIMITS.linkTtlMinutes });
      await enqueueMail(tx, {
        shopId: null,
        kind: "sign-in-link",
        to: email,
        subject: "Your Benchside sign-in link",
        text: `Open this link to follow your machine's job:\n\n${url}\n\n${lines}`,
        html: `<p>Open this link to follow your machine's job:</p><p><a href="${escapeHtml(url)}">Sign in to Benchside</a></p><p>${lines}</p>`,
        priority: MAIL_PRIORITY.signInLink,
        sendBefore,
      });
      if (!known) throw new NotForThisAddress();
    });
  } catch (error) {
    if (!(error instanceof NotForThisAddress)) throw error;
  }
}

export async function consumeSignInLink({ token, ip }: { token: string; ip: string }) {
  const byIp = await reserveAttempt({ kind: "link_use", subject: `ip:${ip}`, limit: LIMITS.linkFailuresPerIp, counting: "failures" });
  if (!byIp.allowed) throw new SignInFailure("too-many-attempts");
  const result = await redeemSignInLink({ tokenHash: hashToken(token) });
  if (!result.ok) throw new SignInFailure(result.reason === "unknown" ? "link-unknown" : result.reason === "used" ? "link-used" : "link-expired");
  await settleAttempt({ id: byIp.id, succeeded: true });
  return claimCustomerRecords({ email: result.email });
}
