import { z } from "zod";
import { readingSchema } from "@/lib/schemas/bench";
import { route } from "@/lib/route";
import { ids } from "@/lib/server/access";
import { recordReading } from "@/lib/server/bench";
import { idempotentRoute } from "@/lib/server/idempotency";

/** POST /api/jobs/:job/readings — the reading form's fields as JSON, replayable with an `Idempotency-Key` (see torque-records). */
export const POST = route({ params: z.object({ job: ids.job }), body: readingSchema, resource: "job", permission: "bench:record" }, ({ body, found, actor, req }) =>
  idempotentRoute(req, actor.userId, body, async () => ({ id: (await recordReading(actor, found, body)).id })),
);
