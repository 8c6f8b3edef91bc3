import "server-only";
import crypto from "node:crypto";
import { enqueueMail } from "@/db/queries/outbox";
import { reserveAttempt, settleAttempt } from "@/db/queries/sign-in";
import { type InviteRefusal, acceptInvite, insertInvite, inviteByToken, isActiveStaffAddress } from "@/db/queries/staff";
import { transaction } from "@/db/transaction";
import { AppError } from "@/lib/errors";
import { ROLE_LABEL, type StaffRole } from "@/lib/permissions";
import { appUrl } from "@/lib/server/config";
import { escapeHtml } from "@/lib/server/mail";
import { assertUsablePassword, hashPassword } from "@/lib/server/password";
import { envCount, hashToken } from "@/lib/server/sign-in";

// Inviting staff by e-mail (issue 16 §3). The link carries a random token; the database keeps
// its hash. It lasts INVITE_TTL_DAYS and works once. Whoever opens it proves they read that
// mailbox: a new person sets a password there, someone who has one keeps it.

export const INVITE_TTL_DAYS = 7;
/** Wrong or stale tokens tried from one network address, on the invitation and reset pages alike (the sign-in link's setting). */
export const TOKEN_FAILURES_PER_IP = { max: envCount("SIGN_IN_FAILURES_PER_IP", 30), minutes: 15 };

export const INVITE_REFUSALS: Record<InviteRefusal, string> = {
  unknown: "This invitation link isn't valid, or was withdrawn. Ask the shop owner to invite you again.",
  used: "This invitation has already been used. Sign in with your e-mail address and password.",
  expired: `This invitation has expired (invitations last ${INVITE_TTL_DAYS} days). Ask the shop owner to send a new one.`,
};

export async function inviteStaff(input: { shopId: number; shopName: string; email: string; name: string; role: StaffRole; invitedBy: number }) {
  const token = crypto.randomBytes(32).toString("base64url");
  const url = `${appUrl()}/join?token=${token}`;
  await transaction(async (tx) => {
    if (await isActiveStaffAddress(tx, { shopId: input.shopId, email: input.email })) {
      throw new AppError("conflict", "That person is already on your staff.", { email: ["That person is already on your staff."] });
    }
    await insertInvite(tx, { ...input, tokenHash: hashToken(token), ttlDays: INVITE_TTL_DAYS });
    const role = ROLE_LABEL[input.role].toLowerCase();
    const lines = `The link works once and expires in ${INVITE_TTL_DAYS} days. If you weren't expecting this, ignore this e-mail.`;
    await enqueueMail(tx, {
      shopId: input.shopId,
      kind: "staff-invite",
      to: input.email,
      subject: `${input.shopName} invites you to Benchside`,
      text: `Hello ${input.name},\n\n${input.shopName} has added you as ${role} on Benchside. Open this link to accept and set your password:\n\n${url}\n\n${lines}`,
      html: `<p>Hello ${escapeHtml(input.name)},</p><p>${escapeHtml(input.shopName)} has added you as ${escapeHtml(role)} on Benchside.</p><p><a href="${escapeHtml(url)}">Accept and set your password</a></p><p>${lines}</p>`,
    });
  });
}

/** Counts a wrong token against the address that sent it; refuses once there were too many. */
export async function guardTokenUse(ip: string) {
  const attempt = await reserveAttempt({ kind: "token_use", subject: `ip:${ip}`, limit: TOKEN_FAILURES_PER_IP, counting: "failures" });
  if (!attempt.allowed) throw new AppError("rate_limited", `Too many links tried from here. Wait ${TOKEN_FAILURES_PER_IP.minutes} minutes, then open the link again.`);
  return { succeeded: () => settleAttempt({ id: attempt.id, succeeded: true }) };
}

/** The invitation page: what it invites to, or why the link no longer works (rate-limited). */
export async function viewInvite({ token, ip }: { token: string; ip: string }) {
  const guard = await guardTokenUse(ip);
  const found = await inviteByToken({ tokenHash: hashToken(token) });
  if (found.ok) await guard.succeeded();
  return found;
}

/**
 * Accepts an invitation. A person with no password yet must choose one that passes the rules
 * (checked before the link is used up, so a refused password doesn't cost the invitation).
 */
export async function acceptInvitation({ token, name, password, ip }: { token: string; name: string; password: string | undefined; ip: string }) {
  const guard = await guardTokenUse(ip);
  const tokenHash = hashToken(token);
  const found = await inviteByToken({ tokenHash });
  if (!found.ok) throw new AppError(found.reason === "unknown" ? "not_found" : "conflict", INVITE_REFUSALS[found.reason]);
  let passwordHash: string | null = null;
  if (!found.invite.hasPassword) {
    if (!password) throw new AppError("invalid", "Choose a password.", { password: ["Choose a password."] });
    assertUsablePassword(password, [found.invite.email, name, found.invite.shopName]);
    passwordHash = await hashPassword(password);
  }
  const result = await transaction((tx) => acceptInvite(tx, { tokenHash, name, passwordHash }));
  if (!result.ok) {
    if (result.reason === "needs-password") throw new AppError("conflict", "Open the invitation link again and choose a password.");
    throw new AppError(result.reason === "unknown" ? "not_found" : "conflict", INVITE_REFUSALS[result.reason]);
  }
  await guard.succeeded();
  return result;
}
