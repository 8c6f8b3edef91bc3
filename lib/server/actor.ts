import "server-only";
import { cache } from "react";
import { auth } from "@/lib/server/auth";
import { getActorById } from "@/db/queries/users";
import type { Actor } from "@/lib/permissions";

/** The signed-in person and their current shop roles, once per request (roles are never trusted from the token). */
export const getActor = cache(async (): Promise<Actor | null> => {
  const session = await auth();
  const userId = Number(session?.user?.id);
  if (!Number.isInteger(userId) || userId <= 0) return null;
  return getActorById({ userId });
});
