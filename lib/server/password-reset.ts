import "server-only";
import crypto from "node:crypto";
import { MAIL_PRIORITY, enqueueMail } from "@/db/queries/outbox";
import { insertPasswordReset, passwordAccountByEmail, passwordHashOf, prunePasswordResets, redeemPasswordReset, resetByToken } from "@/db/queries/password-resets";
import { changePassword } from "@/db/queries/sessions";
import { reserveAttempt, settleAttempt } from "@/db/queries/sign-in";
import { transaction } from "@/db/transaction";
import { AppError } from "@/lib/errors";
import { appUrl } from "@/lib/server/config";
import { escapeHtml } from "@/lib/server/mail";
import { assertUsablePassword, hashPassword, timingDecoyHash, verifyPassword } from "@/lib/server/password";
import { envCount, hashToken } from "@/lib/server/sign-in";
import { guardTokenUse } from "@/lib/server/staff-invites";

// Forgotten passwords (issue 16 §3): a link by e-mail, asked for from the sign-in page. The
// answer is the same for every address, known or not, and so is the work (an unknown address's
// link and mail are written and rolled back, as sign-in links are: lib/server/sign-in.ts).

export const RESET_LIMITS = {
  requestsPerEmail: { max: 3, minutes: 60 },
  // The sign-in links' setting: a shop whose staff share one public address may raise it.
  requestsPerIp: { max: envCount("SIGN_IN_LINKS_PER_IP", 10), minutes: 60 },
  changeFailuresPerUser: { max: 5, minutes: 15 },
  ttlMinutes: 60,
};

export const RESET_REQUEST_ANSWER = `If that address belongs to a Benchside staff account, a link to choose a new password is on its way. It works once and lasts ${RESET_LIMITS.ttlMinutes} minutes.`;

export const RESET_REFUSALS = {
  unknown: "This password link isn't valid. Ask for a new one.",
  used: "This password link has already been used. Each link works once; ask for a new one if you need to.",
  expired: `This password link has expired (links last ${RESET_LIMITS.ttlMinutes} minutes). Ask for a new one.`,
};

class NotForThisAddress extends Error {}

export async function requestPasswordReset({ email, ip }: { email: string; ip: string }): Promise<void> {
  if (Math.random() < 0.02) await prunePasswordResets({ olderThanHours: 24 }); // now and then, forget stale links
  const byIp = await reserveAttempt({ kind: "reset_request", subject: `ip:${ip}`, limit: RESET_LIMITS.requestsPerIp, counting: "accepted" });
  const byEmail = byIp.allowed ? await reserveAttempt({ kind: "reset_request", subject: email, limit: RESET_LIMITS.requestsPerEmail, counting: "accepted" }) : null;
  if (!byIp.allowed || !byEmail?.allowed) {
    throw new AppError("rate_limited", `Several links were asked for already. Use the newest one, or wait an hour and ask again.`, { email: ["Too many requests for now."] });
  }
  const account = await passwordAccountByEmail({ email });
  const token = crypto.randomBytes(32).toString("base64url");
  const url = `${appUrl()}/sign-in/reset?token=${token}`;
  const lines = `It works once and expires in ${RESET_LIMITS.ttlMinutes} minutes. Choosing a new password signs you out everywhere. If you didn't ask for it, ignore this e-mail: your password stays as it is.`;
  try {
    await transaction(async (tx) => {
      // An unknown address has no user to hang a link on: only its mail is written, then rolled back.
      if (account) await insertPasswordReset(tx, { userId: account.id, tokenHash: hashToken(token), ttlMinutes: RESET_LIMITS.ttlMinutes });
      await enqueueMail(tx, {
        shopId: null,
        kind: "password-reset",
        to: email,
        subject: "Choose a new Benchside password",
        text: `Open this link to choose a new password:\n\n${url}\n\n${lines}`,
        html: `<p>Open this link to choose a new password:</p><p><a href="${escapeHtml(url)}">Choose a new password</a></p><p>${lines}</p>`,
        priority: MAIL_PRIORITY.signInLink,
        sendBefore: new Date(Date.now() + RESET_LIMITS.ttlMinutes * 60_000),
      });
      if (!account) throw new NotForThisAddress();
    });
  } catch (error) {
    if (!(error instanceof NotForThisAddress)) throw error;
  }
}

/** The reset page: whether its link still works (rate-limited per network address). */
export async function viewPasswordReset({ token, ip }: { token: string; ip: string }) {
  const guard = await guardTokenUse(ip);
  const found = await resetByToken({ tokenHash: hashToken(token) });
  if (found.ok) await guard.succeeded();
  return found;
}

/** A new password from a reset link: every session of the person ends; they sign in afresh. */
export async function resetPassword({ token, password, ip }: { token: string; password: string; ip: string }) {
  const guard = await guardTokenUse(ip);
  const tokenHash = hashToken(token);
  const found = await resetByToken({ tokenHash });
  if (!found.ok) throw new AppError(found.reason === "unknown" ? "not_found" : "conflict", RESET_REFUSALS[found.reason]);
  assertUsablePassword(password, [found.email, found.name]);
  const passwordHash = await hashPassword(password);
  const result = await transaction((tx) => redeemPasswordReset(tx, { tokenHash, passwordHash }));
  if (!result.ok) throw new AppError(result.reason === "unknown" ? "not_found" : "conflict", RESET_REFUSALS[result.reason]);
  await guard.succeeded();
  return result;
}

/**
 * A signed-in person changes their own password: the current one is required (wrong guesses
 * are limited per person), the new one must pass the rules; every other session ends.
 */
export async function changeOwnPassword({ userId, sessionId, current, next }: { userId: number; sessionId: string | null; current: string; next: string }) {
  const attempt = await reserveAttempt({ kind: "password_change", subject: `user:${userId}`, limit: RESET_LIMITS.changeFailuresPerUser, counting: "failures" });
  if (!attempt.allowed) throw new AppError("rate_limited", `Too many wrong passwords. Wait ${RESET_LIMITS.changeFailuresPerUser.minutes} minutes, then try again.`);
  const account = await passwordHashOf({ userId });
  const matches = await verifyPassword(current, account?.hash ?? (await timingDecoyHash()));
  if (!account?.hash || !matches) throw new AppError("invalid", "That isn't your current password.", { current: ["That isn't your current password."] });
  await settleAttempt({ id: attempt.id, succeeded: true });
  if (current === next) throw new AppError("invalid", "Choose a password different from the current one.", { password: ["Choose a password different from the current one."] });
  assertUsablePassword(next, [account.email, account.name]);
  return changePassword({ userId, passwordHash: await hashPassword(next), keep: sessionId });
}
