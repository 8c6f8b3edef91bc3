import { z } from "zod";
import { chainReadingSchema } from "@/lib/schemas/bench";
import { route } from "@/lib/route";
import { ids } from "@/lib/server/access";
import { recordChainReading } from "@/lib/server/bench";
import { idempotentRoute } from "@/lib/server/idempotency";

/** POST /api/jobs/:job/chain-readings — the chain wear form's fields as JSON, replayable with an `Idempotency-Key` (see torque-records). */
export const POST = route({ params: z.object({ job: ids.job }), body: chainReadingSchema, resource: "job", permission: "bench:record" }, ({ body, found, actor, req }) =>
  idempotentRoute(req, actor.userId, body, async () => {
    const made = await recordChainReading(actor, found, body);
    return { id: made.id, verdict: made.check.verdict };
  }),
);
