import "server-only";
import crypto from "node:crypto";
import { claimCustomerRecords, countMemberships, getUserByEmail, isCustomerAddress, touchLastSignIn } from "@/db/queries/users";
import { deleteSignInLink, insertSignInLink, pruneSignInRecords, redeemSignInLink, reserveAttempt, settleAttempt } from "@/db/queries/sign-in";
import { escapeHtml, sendMail } from "@/lib/server/mail";
import { timingDecoyHash, verifyPassword } from "@/lib/server/password";
import { appUrl } from "@/lib/server/config";

const envCount = (key: string, fallback: number) => {
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

export const SIGN_IN_FAILURES = {
  "invalid-input": "Enter your e-mail address and password.",
  "unknown-email": "No shop account uses that e-mail address. Check it, or ask your shop owner to add you.",
  "wrong-password": "That password doesn't match this account. Check it and try again.",
  "too-many-attempts": `Too many tries. Wait ${LIMITS.passwordFailuresPerEmail.minutes} minutes, then try again.`,
  "unknown-customer": "We don't have a job under that e-mail address. Use the address you gave the shop, or ask them to check it.",
  "too-many-links": `We've sent several links already. Use the newest one, or wait ${LIMITS.linkRequestsPerEmail.minutes} minutes and ask again.`,
  "link-unknown": "This sign-in link isn't valid. Ask for a new one below.",
  "link-used": "This sign-in link has already been used. Each link works once; ask for a new one below.",
  "link-expired": `This sign-in link has expired. Links last ${LIMITS.linkTtlMinutes} minutes; ask for a new one below.`,
};
export type SignInFailureCode = keyof typeof SIGN_IN_FAILURES;

export class SignInFailure extends Error {
  constructor(readonly code: SignInFailureCode) {
    super(SIGN_IN_FAILURES[code]);
  }
}

/** Now and then, forget attempts and links old enough to no longer matter to any limit. */
async function housekeeping() {
  if (Math.random() < 0.02) await pruneSignInRecords({ olderThanHours: 24 });
}

export async function checkPassword({ email, password, ip }: { email: string; password: string; ip: string }) {
  await housekeeping();
  const byEmail = await reserveAttempt({ kind: "password", subject: email, limit: LIMITS.passwordFailuresPerEmail, counting: "failures" });
  const byIp = await reserveAttempt({ kind: "password", subject: `ip:${ip}`, limit: LIMITS.passwordFailuresPerIp, counting: "failures" });
  if (!byEmail.allowed || !byIp.allowed) throw new SignInFailure("too-many-attempts");

  const user = await getUserByEmail({ email });
  if (!user?.passwordHash || (await countMemberships({ userId: user.id })) === 0) {
    await verifyPassword(password, await timingDecoyHash());
    throw new SignInFailure("unknown-email");
  }
  if (!(await verifyPassword(password, user.passwordHash))) throw new SignInFailure("wrong-password");
  await settleAttempt({ id: byEmail.id, succeeded: true });
  await settleAttempt({ id: byIp.id, succeeded: true });
  await touchLastSignIn({ userId: user.id });
  return { id: user.id, email: user.email, name: user.name };
}

function hashToken(token: string): string {
  return crypto.createHash("sha256").update(`${token}${process.env.AUTH_SECRET ?? ""}`).digest("hex");
}

/** E-mails a one-time sign-in link to a machine owner (staff sign in with their password). */
export async function requestSignInLink({ email, ip, next }: { email: string; ip: string; next?: string }) {
  await housekeeping();
  // The network address is counted even for unknown e-mails, so addresses can't be probed in bulk.
  const byIp = await reserveAttempt({ kind: "link_request", subject: `ip:${ip}`, limit: LIMITS.linkRequestsPerIp, counting: "accepted" });
  if (!byIp.allowed) throw new SignInFailure("too-many-links");
  if (!(await isCustomerAddress({ email }))) throw new SignInFailure("unknown-customer");
  const byEmail = await reserveAttempt({ kind: "link_request", subject: email, limit: LIMITS.linkRequestsPerEmail, counting: "accepted" });
  if (!byEmail.allowed) throw new SignInFailure("too-many-links");

  const token = crypto.randomBytes(32).toString("base64url");
  const id = await insertSignInLink({ email, tokenHash: hashToken(token), ttlMinutes: LIMITS.linkTtlMinutes });
  const url = `${appUrl()}/sign-in/link?token=${token}${next ? `&next=${encodeURIComponent(next)}` : ""}`;
  try {
    await sendMail({
      to: email,
      subject: "Your Benchside sign-in link",
      text: `Open this link to follow your machine's job:\n\n${url}\n\nIt works once and expires in ${LIMITS.linkTtlMinutes} minutes. If you didn't ask for it, ignore this e-mail.`,
      html: `<p>Open this link to follow your machine's job:</p><p><a href="${escapeHtml(url)}">Sign in to Benchside</a></p><p>It works once and expires in ${LIMITS.linkTtlMinutes} minutes. If you didn't ask for it, ignore this e-mail.</p>`,
    });
  } catch (error) {
    // An unsent link must not be usable, nor count against the owner's limit.
    await deleteSignInLink({ id });
    await settleAttempt({ id: byEmail.id, succeeded: false });
    throw error;
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
