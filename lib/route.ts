import "server-only";
import { NextResponse, type NextRequest } from "next/server";
import type { z } from "zod";
import { AppError, toErrorBody } from "@/lib/errors";
import type { Actor } from "@/lib/permissions";
import { requireActor } from "@/lib/server/authorize";

type Ctx<P> = { params: Promise<P> };

/**
 * The only way to write a route handler: sign-in required unless `public`, the query (GET)
 * or JSON body parsed with zod, then `run`, which authorises for its resource and returns
 * JSON. Every failure becomes `{error:{code,message,fields}}` with the matching status.
 */
export function route<S extends z.ZodType, P = Record<string, string>, Pub extends boolean = false>(opts: {
  input?: S;
  public?: Pub;
  run: (args: { input: z.output<S>; params: P; req: NextRequest; actor: Pub extends true ? Actor | null : Actor }) => Promise<unknown>;
}) {
  return async (req: NextRequest, ctx: Ctx<P>) => {
    try {
      const actor = opts.public ? null : await requireActor();
      let input: unknown = undefined;
      if (opts.input) {
        const raw = req.method === "GET" || req.method === "HEAD" ? searchParamsObject(req.nextUrl.searchParams) : await readJson(req);
        input = opts.input.parse(raw);
      }
      const result = await opts.run({
        input: input as z.output<S>,
        params: await ctx.params,
        req,
        actor: actor as Pub extends true ? Actor | null : Actor,
      });
      return result instanceof Response ? result : NextResponse.json(result);
    } catch (error) {
      const { status, body } = toErrorBody(error);
      if (status >= 500) console.error(error);
      return NextResponse.json(body, { status });
    }
  };
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

async function readJson(req: NextRequest): Promise<unknown> {
  if (!req.headers.get("content-type")?.includes("application/json")) throw new AppError("bad_request", "Send JSON (Content-Type: application/json).");
  try {
    return await req.json();
  } catch {
    throw new AppError("bad_request", "The request body is not valid JSON.");
  }
}
