import "server-only";
import { NextResponse, type NextRequest } from "next/server";
import type { z } from "zod";
import { toErrorBody } from "@/lib/error-body";
import { AppError } from "@/lib/errors";
import type { Actor } from "@/lib/permissions";
import { type Permission, type ResourceKind, type Resolved, checkDeclaration, resolve } from "@/lib/server/access";
import { getActor } from "@/lib/server/actor";
import { crossSiteRefusal, mediaTypeRefusal } from "@/lib/server/request-guard";
import { CLOSE_AFTER_REFUSAL, readJsonCapped } from "@/lib/server/body-limit";
import { reportDatabaseUnavailable } from "@/lib/server/db-health";
import { stripMoney } from "@/lib/money-fields";

type Ctx = { params: Promise<Record<string, string | string[]>> };

/** What a handler takes in: JSON described by a schema, a multipart upload it reads itself, or a raw body (webhooks). */
export type BodyKind = z.ZodType | "multipart" | "raw";

/** A handler's declaration: read by the wrapper at run time and by the generated access test. */
export type RouteDeclaration<P extends z.ZodType, Q extends z.ZodType, B extends BodyKind, K extends ResourceKind | undefined, Pm extends Permission> = {
  /** Path params; anything that doesn't match is a 404 (the address doesn't exist). */
  params?: P;
  /** Query string (GET); repeated keys become arrays. */
  query?: Q;
  body?: B;
  /** The resolver of lib/server/access.ts that finds what this acts on. */
  resource?: K;
  /** A permission of lib/permissions.ts, or "public" (anyone) / "signed-in" (anyone signed in, acting on themselves). */
  permission: Pm;
  /** Webhooks and one-click unsubscribe: callable from anywhere because they are signed or token-bound. */
  crossSite?: "allow";
  /** Largest JSON body accepted (bytes); 256 KiB unless said. */
  maxBodyBytes?: number;
};

type Args<P extends z.ZodType, Q extends z.ZodType, B extends BodyKind, K extends ResourceKind | undefined, Pm extends Permission> = {
  params: z.output<P>;
  query: z.output<Q>;
  body: B extends z.ZodType ? z.output<B> : undefined;
  actor: Pm extends "public" ? Actor | null : Actor;
  found: K extends ResourceKind ? Resolved<K> : undefined;
  req: NextRequest;
};

const STATE_CHANGING = new Set(["POST", "PUT", "PATCH", "DELETE"]);
const DEFAULT_MAX_BODY = 256 * 1024;

/**
 * The only way to write a route handler. In order: refuse cross-site writes and unexpected
 * media types, parse the path (404), sign the actor in (401), parse query and body (422),
 * resolve the resource and check the permission (404/403), then `run`. Money fields leave only
 * for people the permission table lets see money. Every failure is `{error:{code,message,fields}}`.
 */
export function route<
  const Pm extends Permission,
  K extends ResourceKind | undefined = undefined,
  P extends z.ZodType = z.ZodType<Record<string, never>>,
  Q extends z.ZodType = z.ZodType<undefined>,
  B extends BodyKind = z.ZodType<undefined>,
>(decl: RouteDeclaration<P, Q, B, K, Pm>, run: (args: Args<P, Q, B, K, Pm>) => Promise<unknown>) {
  checkDeclaration(decl);
  const handler = async (req: NextRequest, ctx: Ctx) => {
    try {
      if (STATE_CHANGING.has(req.method) && decl.crossSite !== "allow") {
        const crossSite = crossSiteRefusal(req.headers, req.nextUrl);
        if (crossSite) throw crossSite;
        if (decl.body && typeof decl.body !== "string") {
          const media = mediaTypeRefusal(req.headers, "application/json");
          if (media) throw media;
        } else if (decl.body === "multipart") {
          const media = mediaTypeRefusal(req.headers, "multipart/form-data");
          if (media) throw media;
        }
      }
      const rawParams = await ctx.params;
      const params = decl.params ? decl.params.safeParse(rawParams) : { success: true as const, data: {} };
      if (!params.success) throw new AppError("not_found", "There's nothing at this address.");
      // No cookie, no session: anonymous callers (public pages, one-click unsubscribe, health
      // probes) skip the session lookup, as they did before declarations.
      const actor = req.headers.has("cookie") ? await getActor() : null;
      if (!actor && decl.permission !== "public") throw new AppError("unauthenticated", "Sign in first.");
      const query = decl.query ? decl.query.parse(searchParamsObject(req.nextUrl.searchParams)) : undefined;
      const body = decl.body && typeof decl.body !== "string" ? decl.body.parse(await readJsonCapped(req, decl.maxBodyBytes ?? DEFAULT_MAX_BODY)) : undefined;
      const found = decl.resource ? await resolve(actor!, decl.resource, { ...(body as object), ...(params.data as object) }, decl.permission as never) : undefined;
      const result = await run({ params: params.data, query, body, actor, found, req } as Args<P, Q, B, K, Pm>);
      if (result instanceof Response) return result;
      const mayViewMoney = !found || !("mayViewMoney" in found) || found.mayViewMoney !== false;
      return NextResponse.json(mayViewMoney ? result : stripMoney(result));
    } catch (error) {
      const { status, body } = toErrorBody(error);
      if (status >= 500 && status !== 503) console.error(error);
      if (status === 503) reportDatabaseUnavailable();
      // 503: come back shortly; 413: the body was left unread, so the connection can't be reused.
      const headers = status === 503 ? { "retry-after": "5" } : status === 413 ? CLOSE_AFTER_REFUSAL : undefined;
      return NextResponse.json(body, { status, headers });
    }
  };
  return Object.assign(handler, { declaration: decl as RouteDeclaration<z.ZodType, z.ZodType, BodyKind, ResourceKind | undefined, Permission> });
}

/** Repeated keys become arrays (`?status=a&status=b`). */
export function searchParamsObject(params: URLSearchParams): Record<string, string | string[]> {
  const out: Record<string, string | string[]> = {};
  for (const key of new Set(params.keys())) {
    const all = params.getAll(key);
    out[key] = all.length > 1 ? all : (all[0] ?? "");
  }
  return out;
}
