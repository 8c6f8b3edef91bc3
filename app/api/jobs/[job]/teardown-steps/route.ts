import { z } from "zod";
import { teardownStepSchema } from "@/lib/schemas/bench";
import { route } from "@/lib/route";
import { ids } from "@/lib/server/access";
import { addTeardownStep } from "@/lib/server/bench";
import { idempotentRoute } from "@/lib/server/idempotency";

/**
 * POST /api/jobs/:job/teardown-steps — logs the next step, replayable with an `Idempotency-Key`
 * (see torque-records). Edits and deletes of a logged step stay with the bench page's actions:
 * they are checked against the version on screen, so they are made online only.
 */
export const POST = route({ params: z.object({ job: ids.job }), body: teardownStepSchema, resource: "job", permission: "bench:record" }, ({ body, found, actor, req }) =>
  idempotentRoute(req, actor.userId, body, async () => {
    const made = await addTeardownStep(actor, found, body);
    return { id: made.id, seq: made.seq };
  }),
);
