import "server-only";
import crypto from "node:crypto";
import { claimCustomerRecords, countMemberships, getUserByEmail, isKnownAddress, touchLastSignIn } from "@/db/queries/users";
import { countAttempts, deleteSignInLink, insertSignInLink, recordAttempt, redeemSignInLink } from "@/db/queries/sign-in";
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
  "too-many-attempts": "Too many tries. Wait 15 minutes, then try again.",
  "unknown-customer": "We don't have a job under that e-mail address. Use the address you gave the shop, or ask them to check it.",
  "too-many-links": "We've sent several links to this address already. Use the newest one, or wait 15 minutes and ask again.",
  "link-unknown": "This sign-in link isn't valid. Ask for a new one below.",
  "link-used": "This sign-in link has already been used. Each link works once; ask for a new one below.",
  "link-expired": "This sign-in link has expired. Links last 20 minutes; ask for a new one below.",
} as const;
export type SignInFailureCode = keyof typeof SIGN_IN_FAILURES;

export class SignInFailure extends Error {
  constructor(readonly code: SignInFailureCode) {
    super(SIGN_IN_FAILURES[code]);
  }
}

async function overLimit(kind: "password" | "link_request" | "link_use", subject: string, limit: { max: number; minutes: number }, failedOnly: boolean) {
  return (await countAttempts({ kind, subject, minutes: limit.minutes, failedOnly })) >= limit.max;
}

export async function checkPassword({ email, password, ip }: { email: string; password: string; ip: string }) {
  if (
    (await overLimit("password", email, LIMITS.passwordFailuresPerEmail, true)) ||
    (await overLimit("password", `ip:${ip}`, LIMITS.passwordFailuresPerIp, true))
  ) {
    throw new SignInFailure("too-many-attempts");
  }
  const fail = async (code: SignInFailureCode) => {
    await recordAttempt({ kind: "password", subject: email, succeeded: false });
    await recordAttempt({ kind: "password", subject: `ip:${ip}`, succeeded: false });
    return new SignInFailure(code);
  };
  const user = await getUserByEmail({ email });
  if (!user?.passwordHash || (await countMemberships({ userId: user.id })) === 0) {
    await verifyPassword(password, await timingDecoyHash());
    throw await fail("unknown-email");
  }
  if (!(await verifyPassword(password, user.passwordHash))) throw await fail("wrong-password");
  await recordAttempt({ kind: "password", subject: email, succeeded: true });
  await touchLastSignIn({ userId: user.id });
  return { id: user.id, email: user.email, name: user.name };
}

function hashToken(token: string): string {
  return crypto.createHash("sha256").update(`${token}${process.env.AUTH_SECRET ?? ""}`).digest("hex");
}

export async function requestSignInLink({ email, ip, next }: { email: string; ip: string; next?: string }) {
  if (
    (await overLimit("link_request", email, LIMITS.linkRequestsPerEmail, false)) ||
    (await overLimit("link_request", `ip:${ip}`, LIMITS.linkRequestsPerIp, false))
  ) {
    throw new SignInFailure("too-many-links");
  }
  await recordAttempt({ kind: "link_request", subject: `ip:${ip}`, succeeded: true });
  if (!(await isKnownAddress({ email }))) throw new SignInFailure("unknown-customer");
  await recordAttempt({ kind: "link_request", subject: email, succeeded: true });

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
    await deleteSignInLink({ id }); // an unsent link must not count as outstanding
    throw error;
  }
}

export async function consumeSignInLink({ token, ip }: { token: string; ip: string }) {
  if (await overLimit("link_use", `ip:${ip}`, LIMITS.linkFailuresPerIp, true)) throw new SignInFailure("too-many-attempts");
  const result = await redeemSignInLink({ tokenHash: hashToken(token) });
  if (!result.ok) {
    await recordAttempt({ kind: "link_use", subject: `ip:${ip}`, succeeded: false });
    throw new SignInFailure(result.reason === "unknown" ? "link-unknown" : result.reason === "used" ? "link-used" : "link-expired");
  }
  return claimCustomerRecords({ email: result.email });
}
