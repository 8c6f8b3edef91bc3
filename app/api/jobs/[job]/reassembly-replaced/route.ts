import { z } from "zod";
import { stepFlagSchema } from "@/lib/schemas/bench";
import { route } from "@/lib/route";
import { ids } from "@/lib/server/access";
import { markStepReplaced } from "@/lib/server/bench";
import { idempotentRoute } from "@/lib/server/idempotency";

/** POST /api/jobs/:job/reassembly-replaced — a checklist item's "replaced with new" mark set ("1") or cleared ("0"), replayable with an `Idempotency-Key` (see torque-records). */
export const POST = route({ params: z.object({ job: ids.job }), body: stepFlagSchema, resource: "job", permission: "bench:record" }, ({ body, found, actor, req }) =>
  idempotentRoute(req, actor.userId, body, async () => {
    await markStepReplaced(actor, found, body);
    return { step: body.step, replaced: body.value };
  }),
);
