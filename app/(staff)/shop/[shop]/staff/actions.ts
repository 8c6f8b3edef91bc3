"use server";
import { revalidatePath } from "next/cache";
import { deactivateStaff, reactivateStaff, revokeInvite, setStaffRole } from "@/db/queries/staff";
import { transaction } from "@/db/transaction";
import { formAction } from "@/lib/action";
import { AppError } from "@/lib/errors";
import { inviteStaffSchema, revokeInviteSchema, staffMemberSchema, staffRoleSchema } from "@/lib/schemas/staff";
import { inviteStaff } from "@/lib/server/staff-invites";

// The shop owner runs the staff (permission shop:manage-staff). Role changes and deactivations
// end the person's sessions in the same transaction; the last active owner can't be demoted or
// deactivated (db/queries/staff.ts checks that with the owner rows locked).

const page = (slug: string) => `/shop/${slug}/staff`;

export const inviteStaffAction = formAction({ input: inviteStaffSchema, resource: "shop", permission: "shop:manage-staff" }, async ({ input, actor, found }) => {
  await inviteStaff({ shopId: found.shop.id, shopName: found.shop.name, email: input.email, name: input.name, role: input.role, invitedBy: actor.userId });
  revalidatePath(page(found.shop.slug));
  return { email: input.email };
});

export const changeStaffRoleAction = formAction({ input: staffRoleSchema, resource: "shop", permission: "shop:manage-staff" }, async ({ input, found }) => {
  const changed = await transaction((tx) => setStaffRole(tx, { shopId: found.shop.id, userId: input.user, role: input.role }));
  revalidatePath(page(found.shop.slug));
  return { changed };
});

export const deactivateStaffAction = formAction({ input: staffMemberSchema, resource: "shop", permission: "shop:manage-staff" }, async ({ input, found }) => {
  const changed = await transaction((tx) => deactivateStaff(tx, { shopId: found.shop.id, userId: input.user }));
  revalidatePath(page(found.shop.slug));
  return { changed };
});

export const reactivateStaffAction = formAction({ input: staffMemberSchema, resource: "shop", permission: "shop:manage-staff" }, async ({ input, found }) => {
  const changed = await transaction((tx) => reactivateStaff(tx, { shopId: found.shop.id, userId: input.user }));
  revalidatePath(page(found.shop.slug));
  return { changed };
});

export const revokeInviteAction = formAction({ input: revokeInviteSchema, resource: "shop", permission: "shop:manage-staff" }, async ({ input, found }) => {
  if (!(await revokeInvite({ shopId: found.shop.id, inviteId: input.invite }))) throw new AppError("not_found", "That invitation was already used, withdrawn or expired.");
  revalidatePath(page(found.shop.slug));
  return { revoked: true };
});
