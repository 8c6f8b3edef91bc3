import "server-only";
import { cache } from "react";
import { auth } from "@/lib/server/auth";
import { getActorBySession } from "@/db/queries/users";
import type { Actor } from "@/lib/permissions";

/**
 * The signed-in person and their current shop roles, once per request. The cookie only names
 * a session: whether it is still live (not signed out, not ended by a password change or a
 * lost role) and the person's roles are read fresh, in one query, never trusted from the token.
 * Someone who signed in with an e-mailed link acts only as a machine owner: shop roles need
 * the password.
 */
export const getActor = cache(async (): Promise<Actor | null> => {
  const session = await auth();
  return actorOfSession(session?.user?.id, session?.sessionId);
});

/** The live actor a session names (user id and session id, as the token carries them), or null. */
export async function actorOfSession(user: unknown, sessionId: unknown): Promise<Actor | null> {
  const userId = Number(user);
  if (!Number.isInteger(userId) || userId <= 0 || typeof sessionId !== "string" || !sessionId) return null;
  const live = await getActorBySession({ userId, sessionId });
  if (!live) return null;
  return live.method === "password" ? live.actor : { ...live.actor, memberships: [] };
}

/** The id of this request's session (to end it, or keep it when ending the others); null when signed out. */
export async function currentSessionId(): Promise<string | null> {
  const session = await auth();
  return typeof session?.sessionId === "string" && session.sessionId ? session.sessionId : null;
}
