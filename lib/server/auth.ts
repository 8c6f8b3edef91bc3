import "server-only";
import NextAuth, { CredentialsSignin } from "next-auth";
import Credentials from "next-auth/providers/credentials";
import { linkTokenSchema, passwordSignInSchema } from "@/lib/schemas/auth";
import { SignInFailure, type SignInFailureCode, checkPassword, consumeSignInLink } from "@/lib/server/sign-in";
import { clientIp } from "@/lib/server/client-ip";

declare module "next-auth" {
  interface Session {
    /** Shop roles come only with a password sign-in; an e-mailed link opens the owner's area. */
    signInMethod: "password" | "link";
  }
}

declare module "@auth/core/jwt" {
  interface JWT {
    uid?: string;
    method?: "password" | "link";
  }
}

/** Carries our failure code out of next-auth, so the form can say exactly what went wrong. */
class SignInRefused extends CredentialsSignin {
  constructor(code: SignInFailureCode) {
    super(code);
    this.code = code;
  }
}

async function refuseOn<T>(work: () => Promise<T>): Promise<T> {
  try {
    return await work();
  } catch (error) {
    if (error instanceof SignInFailure) throw new SignInRefused(error.code);
    throw error;
  }
}

export const { handlers, auth, signIn, signOut } = NextAuth({
  // JWT sessions keep app instances stateless; memberships are re-read on every request.
  session: { strategy: "jwt", maxAge: 30 * 24 * 60 * 60 },
  trustHost: true,
  pages: { signIn: "/sign-in", error: "/sign-in" },
  logger: {
    // A refused sign-in is an everyday answer shown to the person, not a server error to log.
    error: (error) => {
      if (error instanceof CredentialsSignin) return;
      console.error(error);
    },
  },
  providers: [
    Credentials({
      id: "password",
      name: "Shop staff",
      credentials: { email: {}, password: {} },
      authorize: (raw, request) =>
        refuseOn(async () => {
          const parsed = passwordSignInSchema.safeParse(raw);
          if (!parsed.success) throw new SignInFailure("invalid-input");
          const user = await checkPassword({ ...parsed.data, ip: clientIp(request.headers) });
          return { id: String(user.id), email: user.email, name: user.name };
        }),
    }),
    Credentials({
      id: "email-link",
      name: "E-mail link",
      credentials: { token: {} },
      authorize: (raw, request) =>
        refuseOn(async () => {
          const parsed = linkTokenSchema.safeParse(raw);
          if (!parsed.success) throw new SignInFailure("link-unknown");
          const user = await consumeSignInLink({ token: parsed.data.token, ip: clientIp(request.headers) });
          return { id: String(user.id), email: user.email, name: user.name };
        }),
    }),
  ],
  callbacks: {
    jwt({ token, user, account }) {
      if (user?.id) {
        token.uid = user.id;
        token.method = account?.provider === "password" ? "password" : "link";
      }
      return token;
    },
    session({ session, token }) {
      if (typeof token.uid === "string") session.user.id = token.uid;
      session.signInMethod = token.method === "password" ? "password" : "link";
      return session;
    },
  },
});
