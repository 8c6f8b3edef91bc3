import "server-only";
import { cache } from "react";
import { auth } from "@/lib/server/auth";
import { getActorById } from "@/db/queries/users";
import type { Actor } from "@/lib/permissions";

/**
 * The signed-in person and their current shop roles, once per request (roles are read
 * fresh, never trusted from the token). Someone who signed in with an e-mailed link acts
 * only as a machine owner: shop roles need the password.
 */
export const getActor = cache(async (): Promise<Actor | null> => {
  const session = await auth();
  const userId = Number(session?.user?.id);
  if (!Number.isInteger(userId) || userId <= 0) return null;
  const actor = await getActorById({ userId });
  if (!actor || session?.signInMethod === "password") return actor;
  return { ...actor, memberships: [] };
});
