import "server-only";
import { forbidden, redirect } from "next/navigation";
import { AppError } from "@/lib/errors";
import { type Action, type Actor, type Resource, can } from "@/lib/permissions";
import { getActor } from "@/lib/server/actor";

/**
 * The one authorisation helper. Route handlers and server actions get AppErrors (401/403);
 * pages get a redirect to sign-in or the forbidden page.
 */
export async function requireActor(): Promise<Actor> {
  const actor = await getActor();
  if (!actor) throw new AppError("unauthenticated", "Sign in first.");
  return actor;
}

export function authorize(actor: Actor, action: Action, resource: Resource): void {
  if (!can(actor, action, resource)) throw new AppError("forbidden", "You don't have access to this.");
}

export async function requirePageActor(returnTo: string): Promise<Actor> {
  const actor = await getActor();
  if (!actor) redirect(`/sign-in?next=${encodeURIComponent(returnTo)}`);
  return actor;
}

export function authorizePage(actor: Actor, action: Action, resource: Resource | null): void {
  if (!resource || !can(actor, action, resource)) forbidden();
}
