import { z } from "zod";
import { torqueRecordSchema } from "@/lib/schemas/bench";
import { route } from "@/lib/route";
import { ids } from "@/lib/server/access";
import { recordTorque } from "@/lib/server/bench";
import { idempotentRoute } from "@/lib/server/idempotency";

/**
 * POST /api/jobs/:job/torque-records — the bench form's fields (as typed, text) as JSON. A route
 * rather than only the form's action because the phone's outbox replays it after a reload, and an
 * action's id changes between builds; an `Idempotency-Key` makes the replay record nothing new.
 */
export const POST = route({ params: z.object({ job: ids.job }), body: torqueRecordSchema, resource: "job", permission: "bench:record" }, ({ body, found, actor, req }) =>
  idempotentRoute(req, actor.userId, body, async () => ({ id: (await recordTorque(actor, found, body)).id })),
);
