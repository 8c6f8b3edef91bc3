import { z } from "zod";
import { statusChangeFields } from "@/lib/schemas/jobs";
import { route } from "@/lib/route";
import { ids } from "@/lib/server/access";
import { idempotentRoute } from "@/lib/server/idempotency";
import { changeJobStatus } from "@/lib/server/journal";

/**
 * POST /api/jobs/:job/status {from, to, note, override?} — a status move, replayable with an
 * `Idempotency-Key` (a replay answers as the first move did instead of "someone moved it").
 */
export const POST = route({ params: z.object({ job: ids.job }), body: statusChangeFields, resource: "job", permission: "job:change-status" }, ({ body, found, actor, req }) =>
  idempotentRoute(req, actor.userId, body, async () => {
    await changeJobStatus(actor, found, body);
    return { to: body.to };
  }),
);
