import "server-only";
import { unstable_rethrow } from "next/navigation";
import type { z } from "zod";
import { type ErrorBody, toErrorBody } from "@/lib/errors";
import type { Actor } from "@/lib/permissions";
import { requireActor } from "@/lib/server/authorize";

/** What a form action hands back to `useActionState`: nothing yet, success, or an error to show. */
export type ActionState<T = unknown> = null | { ok: true; data: T } | ({ ok: false; values?: Record<string, string> } & ErrorBody);

/**
 * The only way to write a server action (they are public POST endpoints): sign-in required
 * unless `public`, the form parsed with zod, then `run`, which authorises for its resource.
 * Redirects pass through; every other failure comes back as `{ok:false, error}`.
 */
export function formAction<S extends z.ZodType, T, Pub extends boolean = false>(opts: {
  input: S;
  public?: Pub;
  run: (args: { input: z.output<S>; actor: Pub extends true ? Actor | null : Actor }) => Promise<T>;
}) {
  return async (_prev: ActionState<T>, formData: FormData): Promise<ActionState<T>> => {
    const values: Record<string, string> = {};
    for (const [key, value] of formData.entries()) {
      if (typeof value === "string" && !key.startsWith("$") && !/password|token/i.test(key)) values[key] = value;
    }
    try {
      const actor = opts.public ? null : await requireActor();
      const input = opts.input.parse(Object.fromEntries(formData.entries()));
      const data = await opts.run({ input, actor: actor as Pub extends true ? Actor | null : Actor });
      return { ok: true, data };
    } catch (error) {
      unstable_rethrow(error);
      const { status, body } = toErrorBody(error);
      if (status >= 500) console.error(error);
      return { ok: false, values, ...body };
    }
  };
}
