"use server";
import { headers } from "next/headers";
import { redirect } from "next/navigation";
import { AuthError } from "next-auth";
import { formAction } from "@/lib/action";
import { acceptInviteSchema } from "@/lib/schemas/staff";
import { signIn } from "@/lib/server/auth";
import { clientIp } from "@/lib/server/client-ip";
import { acceptInvitation } from "@/lib/server/staff-invites";

/**
 * Accepts a staff invitation (public: the token is the proof). Someone new chooses a password
 * and is signed in with it, through the same credential check as the sign-in form; someone who
 * already has a password keeps it and signs in as usual.
 */
export const acceptInviteAction = formAction({ input: acceptInviteSchema, permission: "public" }, async ({ input }) => {
  const result = await acceptInvitation({ token: input.token, name: input.name, password: input.password, ip: clientIp(await headers()) });
  const home = `/shop/${result.shopSlug}`;
  if (!result.setPassword || !input.password) redirect(`/sign-in?joined=1&next=${encodeURIComponent(home)}`);
  try {
    await signIn("password", { email: result.email, password: input.password, redirectTo: home });
  } catch (error) {
    // The invitation is accepted either way; a refused sign-in (a limit) only means signing in by hand.
    if (error instanceof AuthError) redirect(`/sign-in?joined=1&next=${encodeURIComponent(home)}`);
    throw error;
  }
});
