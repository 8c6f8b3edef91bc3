"use server";
import { headers } from "next/headers";
import { redirect } from "next/navigation";
import { AuthError } from "next-auth";
import { formAction } from "@/lib/action";
import { AppError } from "@/lib/errors";
import { linkRequestSchema, linkTokenSchema, passwordSignInSchema } from "@/lib/schemas/auth";
import { signIn, signOut } from "@/lib/server/auth";
import { clientIp } from "@/lib/server/client-ip";
import { endEverySession } from "@/db/queries/sessions";
import { SIGN_IN_FAILURES, SignInFailure, type SignInFailureCode, requestSignInLink } from "@/lib/server/sign-in";
import { z } from "zod";

const nextField = z.object({ next: linkRequestSchema.shape.next });

/** next-auth wraps our refusal; turn it back into our own clear message. */
function refusal(error: unknown): never {
  if (error instanceof AuthError) {
    const code = (error as AuthError & { code?: string }).code;
    const message = code && code in SIGN_IN_FAILURES ? SIGN_IN_FAILURES[code as SignInFailureCode] : "Sign-in failed. Try again.";
    throw new AppError(code === "too-many-attempts" ? "rate_limited" : "unauthenticated", message);
  }
  throw error;
}

export const signInWithPassword = formAction({ input: passwordSignInSchema.extend(nextField.shape), permission: "public" }, async ({ input }) => {
  try {
    await signIn("password", { email: input.email, password: input.password, redirectTo: input.next ?? "/" });
  } catch (error) {
    refusal(error);
  }
});

export const requestOwnerLink = formAction({ input: linkRequestSchema, permission: "public" }, async ({ input }) => {
  try {
    await requestSignInLink({ email: input.email, ip: clientIp(await headers()), next: input.next });
  } catch (error) {
    // The only refusal left is a limit, and it is the same for known and unknown addresses.
    if (error instanceof SignInFailure) throw new AppError("rate_limited", error.message, { email: [error.message] });
    throw error;
  }
  redirect(`/sign-in/check-email?to=${encodeURIComponent(input.email)}`);
});

export const signInWithLink = formAction({ input: linkTokenSchema.extend(nextField.shape), permission: "public" }, async ({ input }) => {
  try {
    await signIn("email-link", { token: input.token, redirectTo: input.next ?? "/my" });
  } catch (error) {
    refusal(error);
  }
});

// Public: signing out twice, or when the session has already expired, is harmless. Signing out
// ends this session on the server too (the signOut event in lib/server/auth.ts).
export const signOutAction = formAction({ input: z.object({}), permission: "public" }, async () => {
  await signOut({ redirectTo: "/sign-in" });
});

/** Ends every session of the signed-in person, on every device, this one included. */
export const signOutEverywhereAction = formAction({ input: z.object({}), permission: "signed-in" }, async ({ actor }) => {
  await endEverySession({ userId: actor.userId });
  await signOut({ redirectTo: "/sign-in?signed-out=everywhere" });
});
