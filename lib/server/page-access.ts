import "server-only";
import { cache } from "react";
import { forbidden, notFound } from "next/navigation";
import { AppError } from "@/lib/errors";
import type { Action } from "@/lib/permissions";
import { type ResourceKind, type Resolved, resolve } from "@/lib/server/access";
import { requirePageActor } from "@/lib/server/authorize";

/**
 * Pages find and authorise what they show through the same resolvers as handlers and actions:
 * no session → sign-in; the 404/403 of lib/server/access.ts → Next's not-found / forbidden page.
 * Call it before anything streams, so the status is real.
 */
export async function loadPage<K extends ResourceKind>(kind: K, from: Record<string, unknown>, permission: Action, returnTo: string) {
  const actor = await requirePageActor(returnTo);
  try {
    return { actor, ...(await resolve(actor, kind, from, permission)) } as { actor: typeof actor } & Resolved<K>;
  } catch (error) {
    if (error instanceof AppError && error.code === "not_found") notFound();
    if (error instanceof AppError && error.code === "forbidden") forbidden();
    throw error;
  }
}

/**
 * The one loader of the staff job pages (journal, bench, invoice, findings): the shop's staff,
 * the job by its number, and `permission` on it. Once per request.
 */
export const staffJobPage = cache((slug: string, number: string, permission: Action, suffix = "") =>
  loadPage("shopJob", { shop: slug, number }, permission, `/shop/${slug}/jobs/${number}${suffix}`),
);
