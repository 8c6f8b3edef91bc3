import "server-only";
import NextAuth, { CredentialsSignin } from "next-auth";
import Credentials from "next-auth/providers/credentials";
import { linkTokenSchema, passwordSignInSchema } from "@/lib/schemas/auth";
import { SignInFailure, type SignInFailureCode, checkPassword, consumeSignInLink } from "@/lib/server/sign-in";
import { clientIp, trustedProxyHops } from "@/lib/server/client-ip";
import { appUrl } from "@/lib/server/config";
import { endSession, startSession } from "@/db/queries/sessions";

declare module "next-auth" {
  interface Session {
    /** Shop roles come only with a password sign-in; an e-mailed link opens the owner's area. */
    signInMethod: "password" | "link";
    /** The server-side session the cookie names (db/queries/sessions.ts); checked on every request. */
    sessionId?: string;
  }
}

declare module "@auth/core/jwt" {
  interface JWT {
    uid?: string;
    method?: "password" | "link";
    sid?: string;
  }
}

const MAX_AGE_SECONDS = 30 * 24 * 60 * 60;

// Auth.js builds its own addresses from AUTH_URL when set, else from the request's Host and
// X-Forwarded-Host. Forwarded headers are believed only when a proxy of ours is declared
// (TRUSTED_PROXY_HOPS ≥ 1; lib/server/client-ip.ts strips them otherwise) or AUTH_TRUST_HOST says
// so; without either, the app's own address (APP_URL) is the one Auth.js uses.
const trustHost = trustedProxyHops() >= 1 || /^(1|true)$/i.test(process.env.AUTH_TRUST_HOST ?? "");
if (!trustHost && !process.env.AUTH_URL && !process.env.NEXTAUTH_URL) process.env.AUTH_URL = appUrl();

/**
 * Where to go after signing in or out: a path of this app, and always as a path, so no host
 * taken from the request ever ends up in a redirect. Anything else goes to the home page.
 */
export function sameAppPath(url: string, baseUrl: string): string {
  // "/x" but not "//host" or "/\\host", and nothing a browser would strip (tabs, newlines).
  const isPath = (p: string) => /^\/(?![/\\])[^\u0000-\u001f\u007f\\]*$/.test(p);
  if (isPath(url)) return url;
  try {
    const parsed = new URL(url);
    const path = `${parsed.pathname}${parsed.search}${parsed.hash}`;
    if (parsed.origin === baseUrl && isPath(path)) return path;
  } catch {
    // Not a URL at all.
  }
  return "/";
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
  // The encrypted JWT names a row of user_sessions, which getActor checks (with the person's
  // roles) on every request: a session ends for real when that row is ended (sign-out, "sign
  // out everywhere", a password change), on every app instance at once.
  session: { strategy: "jwt", maxAge: MAX_AGE_SECONDS },
  ...(trustHost ? { trustHost: true } : {}),
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
    async jwt({ token, user, account }) {
      if (user?.id) {
        const method = account?.provider === "password" ? "password" : "link";
        token.uid = user.id;
        token.method = method;
        token.sid = await startSession({ userId: Number(user.id), method, maxAgeSeconds: MAX_AGE_SECONDS });
      }
      return token;
    },
    session({ session, token }) {
      if (typeof token.uid === "string") session.user.id = token.uid;
      session.signInMethod = token.method === "password" ? "password" : "link";
      if (typeof token.sid === "string") session.sessionId = token.sid;
      return session;
    },
    redirect: ({ url, baseUrl }) => sameAppPath(url, baseUrl),
  },
  events: {
    // Signing out ends the session on the server too: a copy of the cookie stops working.
    async signOut(message) {
      const sid = "token" in message ? message.token?.sid : undefined;
      if (typeof sid === "string") await endSession({ sessionId: sid, reason: "sign-out" });
    },
  },
});
