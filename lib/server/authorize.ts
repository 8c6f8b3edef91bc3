import "server-only";
import { redirect } from "next/navigation";
import type { Actor } from "@/lib/permissions";
import { getActor } from "@/lib/server/actor";

/**
 * Pages: the signed-in person, or a redirect to sign-in that comes back here. What they may see
 * is decided by the resolvers (lib/server/access.ts, through lib/server/page-access.ts).
 */
export async function requirePageActor(returnTo: string): Promise<Actor> {
  const actor = await getActor();
  if (!actor) redirect(`/sign-in?next=${encodeURIComponent(returnTo)}`);
  return actor;
}
