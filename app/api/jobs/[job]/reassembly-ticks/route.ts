import { z } from "zod";
import { stepFlagSchema } from "@/lib/schemas/bench";
import { route } from "@/lib/route";
import { ids } from "@/lib/server/access";
import { tickTeardownStep } from "@/lib/server/bench";
import { idempotentRoute } from "@/lib/server/idempotency";

/** POST /api/jobs/:job/reassembly-ticks — a checklist item marked done (`value` "1") or not ("0"), replayable with an `Idempotency-Key` (see torque-records). */
export const POST = route({ params: z.object({ job: ids.job }), body: stepFlagSchema, resource: "job", permission: "bench:record" }, ({ body, found, actor, req }) =>
  idempotentRoute(req, actor.userId, body, async () => {
    const made = await tickTeardownStep(actor, found, body);
    return { step: body.step, done: body.value, jobMovedTo: made.jobMovedTo };
  }),
);
