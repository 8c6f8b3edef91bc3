import "server-only";
import type { Knex } from "knex";
import { db } from "@/db/client";
import type { MembershipsTable, StaffInvitesTable, UsersTable } from "@/db/tables";
import { AppError } from "@/lib/errors";
import type { StaffRole } from "@/lib/permissions";
import { endUserSessions } from "./sessions";

// A shop's staff as its owner runs it (issue 16 §3): the people, their roles, who is off the
// staff, and invitations by e-mail (migration 17). Memberships are never deleted: taking
// someone off sets deactivated_at (history keeps naming them).

export type StaffMember = { userId: number; name: string; email: string; role: StaffRole; deactivatedAt: Date | null; lastSignInAt: Date | null };

/** Everyone who is or was on the shop's staff: active first, then by name. */
export async function listStaffMembers({ shopId }: { shopId: number }): Promise<StaffMember[]> {
  type Row = Pick<MembershipsTable, "role" | "deactivated_at"> & Pick<UsersTable, "id" | "name" | "email" | "last_sign_in_at">;
  const rows = (await db()("memberships as m")
    .join("users as u", "u.id", "m.user_id")
    .where("m.shop_id", shopId)
    .orderByRaw("m.deactivated_at IS NULL DESC")
    .orderBy("u.name")
    .select("u.id", "u.name", "u.email", "u.last_sign_in_at", "m.role", "m.deactivated_at")) as Row[];
  return rows.map((r) => ({ userId: Number(r.id), name: r.name, email: r.email, role: r.role, deactivatedAt: r.deactivated_at, lastSignInAt: r.last_sign_in_at }));
}

/**
 * Locks the shop's active owner rows (in id order, so two changes queue instead of deadlocking)
 * and refuses a change that would leave the shop with no active owner. Run inside the change's
 * own transaction, before it writes: a second owner demoting the first at the same moment waits
 * here, then sees the first change committed and is refused.
 */
async function keepAnOwner(tx: Knex.Transaction, { shopId, userId }: { shopId: number; userId: number }) {
  const owners = await tx("memberships").where({ shop_id: shopId, role: "owner" }).whereNull("deactivated_at").orderBy("id").forUpdate().select("user_id");
  const ids = owners.map((o) => Number(o.user_id));
  if (ids.includes(userId) && ids.length <= 1) {
    throw new AppError("conflict", "A shop needs at least one active owner. Make someone else an owner first.");
  }
}

async function membershipFor(tx: Knex.Transaction, { shopId, userId }: { shopId: number; userId: number }) {
  const row = await tx("memberships").where({ shop_id: shopId, user_id: userId }).forUpdate().first("id", "role", "deactivated_at");
  if (!row) throw new AppError("not_found", "That person isn't on this shop's staff.");
  return row;
}

/** A new role; the person's sessions end, so their next request carries the role they have now. */
export async function setStaffRole(tx: Knex.Transaction, { shopId, userId, role }: { shopId: number; userId: number; role: StaffRole }): Promise<boolean> {
  if (role !== "owner") await keepAnOwner(tx, { shopId, userId });
  const row = await membershipFor(tx, { shopId, userId });
  if (row.role === role) return false;
  await tx("memberships").where({ id: row.id }).update({ role });
  if (!row.deactivated_at) await endUserSessions(tx, { userId, reason: "membership" });
  return true;
}

/** Off the staff (history kept); their sessions end at once. Never the last active owner. */
export async function deactivateStaff(tx: Knex.Transaction, { shopId, userId }: { shopId: number; userId: number }): Promise<boolean> {
  await keepAnOwner(tx, { shopId, userId });
  const row = await membershipFor(tx, { shopId, userId });
  if (row.deactivated_at) return false;
  await tx("memberships").where({ id: row.id }).update({ deactivated_at: tx.fn.now(3) });
  await endUserSessions(tx, { userId, reason: "deactivated" });
  return true;
}

/** Back on the staff with the role they had; they sign in again with their password. */
export async function reactivateStaff(tx: Knex.Transaction, { shopId, userId }: { shopId: number; userId: number }): Promise<boolean> {
  const row = await membershipFor(tx, { shopId, userId });
  if (!row.deactivated_at) return false;
  await tx("memberships").where({ id: row.id }).update({ deactivated_at: null });
  return true;
}

export type OpenInvite = Pick<StaffInvitesTable, "id" | "email" | "name" | "role" | "expires_at" | "created_at">;

/** Invitations not yet used, withdrawn or expired, newest first. */
export async function listOpenInvites({ shopId }: { shopId: number }): Promise<OpenInvite[]> {
  return db()("staff_invites")
    .where({ shop_id: shopId })
    .whereNull("used_at")
    .whereNull("revoked_at")
    .where("expires_at", ">", db().fn.now(3))
    .orderBy("created_at", "desc")
    .limit(100)
    .select("id", "email", "name", "role", "expires_at", "created_at");
}

/** Is this address already on the shop's active staff? (Inviting them again makes no sense.) */
export async function isActiveStaffAddress(k: Knex, { shopId, email }: { shopId: number; email: string }): Promise<boolean> {
  const row = await k("memberships as m").join("users as u", "u.id", "m.user_id").where({ "m.shop_id": shopId, "u.email": email }).whereNull("m.deactivated_at").first("m.id");
  return !!row;
}

/** A new invitation (earlier open ones to the same address at this shop are withdrawn). */
export async function insertInvite(
  tx: Knex.Transaction,
  invite: { shopId: number; email: string; name: string; role: StaffRole; tokenHash: string; invitedBy: number; ttlDays: number },
): Promise<number> {
  await tx("staff_invites").where({ shop_id: invite.shopId, email: invite.email }).whereNull("used_at").whereNull("revoked_at").update({ revoked_at: tx.fn.now(3) });
  const [id] = await tx("staff_invites").insert({
    shop_id: invite.shopId,
    email: invite.email,
    name: invite.name,
    role: invite.role,
    token_hash: invite.tokenHash,
    invited_by_user_id: invite.invitedBy,
    expires_at: tx.raw("NOW(3) + INTERVAL ? DAY", [invite.ttlDays]),
  });
  return Number(id);
}

export async function revokeInvite({ shopId, inviteId }: { shopId: number; inviteId: number }): Promise<boolean> {
  const changed = await db()("staff_invites").where({ shop_id: shopId, id: inviteId }).whereNull("used_at").whereNull("revoked_at").update({ revoked_at: db().fn.now(3) });
  return changed > 0;
}

export type InviteView = { shopName: string; shopSlug: string; email: string; name: string; role: StaffRole; hasPassword: boolean };
export type InviteRefusal = "unknown" | "used" | "expired";

/** What the invitation page shows, or why the link no longer works. Reads only. */
export async function inviteByToken({ tokenHash }: { tokenHash: string }): Promise<{ ok: true; invite: InviteView } | { ok: false; reason: InviteRefusal }> {
  const row = await db()("staff_invites as i")
    .join("shops as s", "s.id", "i.shop_id")
    .leftJoin("users as u", "u.email", "i.email")
    .where("i.token_hash", tokenHash)
    .first("i.email", "i.name", "i.role", "i.used_at", "i.revoked_at", "i.expires_at", "s.name as shop_name", "s.slug", "u.password_hash", db().raw("i.expires_at > NOW(3) AS live"));
  if (!row) return { ok: false, reason: "unknown" };
  if (row.used_at || row.revoked_at) return { ok: false, reason: row.used_at ? "used" : "unknown" };
  if (!Number(row.live)) return { ok: false, reason: "expired" };
  return { ok: true, invite: { shopName: row.shop_name, shopSlug: row.slug, email: row.email, name: row.name, role: row.role, hasPassword: !!row.password_hash } };
}

/**
 * Uses an invitation, once: the invite row is locked, checked and marked used; the person's
 * account is created if new (with `passwordHash`), or given `passwordHash` if it has none (an
 * owner who only ever signed in by link); an account that has a password keeps it. Then the
 * membership: added, or put back with the invited role if they were taken off before.
 */
export async function acceptInvite(
  tx: Knex.Transaction,
  { tokenHash, name, passwordHash }: { tokenHash: string; name: string; passwordHash: string | null },
): Promise<{ ok: true; userId: number; email: string; shopId: number; shopSlug: string; setPassword: boolean } | { ok: false; reason: InviteRefusal | "needs-password" }> {
  const invite = await tx("staff_invites").where({ token_hash: tokenHash }).forUpdate().first();
  if (!invite || invite.revoked_at) return { ok: false, reason: "unknown" };
  if (invite.used_at) return { ok: false, reason: "used" };
  const live = await tx("staff_invites").where({ id: invite.id }).where("expires_at", ">", tx.fn.now(3)).first("id");
  if (!live) return { ok: false, reason: "expired" };

  await tx("users").insert({ email: invite.email, name }).onConflict("email").ignore();
  const user = (await tx("users").where({ email: invite.email }).forUpdate().first("id", "password_hash"))!;
  const setPassword = !user.password_hash;
  if (setPassword) {
    if (!passwordHash) return { ok: false, reason: "needs-password" };
    await tx("users").where({ id: user.id }).update({ password_hash: passwordHash });
  }
  await tx("staff_invites").where({ id: invite.id }).update({ used_at: tx.fn.now(3) });
  const membership = await tx("memberships").where({ shop_id: invite.shop_id, user_id: user.id }).forUpdate().first("id", "deactivated_at");
  if (!membership) await tx("memberships").insert({ shop_id: invite.shop_id, user_id: user.id, role: invite.role });
  else if (membership.deactivated_at) await tx("memberships").where({ id: membership.id }).update({ role: invite.role, deactivated_at: null });
  const shop = (await tx("shops").where({ id: invite.shop_id }).first("slug"))!;
  return { ok: true, userId: Number(user.id), email: invite.email, shopId: invite.shop_id, shopSlug: shop.slug, setPassword };
}
