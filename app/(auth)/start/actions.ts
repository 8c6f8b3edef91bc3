"use server";
import { headers } from "next/headers";
import { redirect } from "next/navigation";
import { AuthError } from "next-auth";
import { formAction } from "@/lib/action";
import { confirmSignupSchema, shopSignupSchema } from "@/lib/schemas/shop-signup";
import { signIn } from "@/lib/server/auth";
import { clientIp } from "@/lib/server/client-ip";
import { confirmShop, startShop } from "@/lib/server/shop-signup";

// Public: anyone may start a shop. The limits, the e-mail check and the password rules are in
// lib/server/shop-signup.ts; nothing but the pending sign-up is written until the link is opened.
export const startShopAction = formAction({ input: shopSignupSchema, permission: "public" }, async ({ input }) => {
  await startShop({ input, ip: clientIp(await headers()) });
  redirect(`/start/check-email?to=${encodeURIComponent(input.email)}`);
});

/** Opens the confirmation link: creates the shop, then signs the owner in onto its board. */
export const confirmShopAction = formAction({ input: confirmSignupSchema, permission: "public" }, async ({ input }) => {
  const { slug, email } = await confirmShop({ token: input.token, password: input.password, ip: clientIp(await headers()) });
  try {
    await signIn("password", { email, password: input.password, redirectTo: `/shop/${slug}` });
  } catch (error) {
    // The shop exists; if the sign-in itself is refused (its own limits), send them to sign in.
    if (error instanceof AuthError) redirect(`/sign-in?next=${encodeURIComponent(`/shop/${slug}`)}`);
    throw error;
  }
});
