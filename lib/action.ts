import "server-only";
import { headers } from "next/headers";
import { unstable_rethrow } from "next/navigation";
import type { z } from "zod";
import { toErrorBody } from "@/lib/error-body";
import { AppError, type ErrorBody } from "@/lib/errors";
import type { Actor } from "@/lib/permissions";
import { type Permission, type ResourceKind, type Resolved, checkDeclaration, resolve } from "@/lib/server/access";
import { getActor } from "@/lib/server/actor";
import { reportDatabaseUnavailable } from "@/lib/server/db-health";
import { crossSiteRefusal } from "@/lib/server/request-guard";

/** What a form action hands back to `useActionState`: nothing yet, success, or an error to show. */
export type ActionState<T = unknown> = null | { ok: true; data: T } | ({ ok: false; values?: Record<string, string> } & ErrorBody);

/** An action's declaration: read by the wrapper at run time and by the generated access test. */
export type ActionDeclaration<S extends z.ZodType, K extends ResourceKind | undefined, Pm extends Permission> = {
  input: S;
  /** The resolver of lib/server/access.ts that finds what this acts on, from the parsed form. */
  resource?: K;
  permission: Pm;
};

type Args<S extends z.ZodType, K extends ResourceKind | undefined, Pm extends Permission> = {
  input: z.output<S>;
  actor: Pm extends "public" ? Actor | null : Actor;
  found: K extends ResourceKind ? Resolved<K> : undefined;
};

/**
 * The only way to write a server action (they are public POST endpoints). In order: refuse a
 * cross-site post, read the form, sign the actor in, parse with zod, resolve the resource and
 * check the permission, then `run`. Redirects pass through; every other failure comes back as
 * `{ok:false, error}` with the values typed (never passwords or tokens) so the form can refill.
 */
export function formAction<S extends z.ZodType, T, const Pm extends Permission, K extends ResourceKind | undefined = undefined>(
  decl: ActionDeclaration<S, K, Pm>,
  run: (args: Args<S, K, Pm>) => Promise<T>,
) {
  checkDeclaration(decl);
  const action = async (_prev: ActionState<T>, formData: FormData): Promise<ActionState<T>> => {
    const values: Record<string, string> = {};
    try {
      const h = await headers();
      const crossSite = crossSiteRefusal(h, new URL(`http://${h.get("host") ?? "localhost"}`));
      if (crossSite) throw crossSite;
      if (!(formData instanceof FormData)) throw new AppError("bad_request", "Send the form as a form.");
      for (const [key, value] of formData.entries()) {
        if (typeof value === "string" && !key.startsWith("$") && !/password|token/i.test(key)) values[key] = value;
      }
      const actor = await getActor();
      if (!actor && decl.permission !== "public") throw new AppError("unauthenticated", "Sign in first.");
      const input = decl.input.parse(Object.fromEntries(formData.entries()));
      const found = decl.resource ? await resolve(actor!, decl.resource, input as Record<string, unknown>, decl.permission as never) : undefined;
      const data = await run({ input, actor, found } as Args<S, K, Pm>);
      return { ok: true, data };
    } catch (error) {
      unstable_rethrow(error);
      const { status, body } = toErrorBody(error);
      if (status >= 500 && status !== 503) console.error(error);
      if (status === 503) reportDatabaseUnavailable();
      return { ok: false, values, ...body };
    }
  };
  return Object.assign(action, { declaration: decl as ActionDeclaration<z.ZodType, ResourceKind | undefined, Permission> });
}
