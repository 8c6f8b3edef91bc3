import { z } from "zod";
import { measurementSetSchema } from "@/lib/schemas/measurements";
import { route } from "@/lib/route";
import { ids } from "@/lib/server/access";
import { idempotentRoute } from "@/lib/server/idempotency";
import { recordMeasurementSet } from "@/lib/server/measurements";

/** POST /api/jobs/:job/measurement-sets — the measurement set form's fields (numbered rows) as JSON, replayable with an `Idempotency-Key` (see torque-records). */
export const POST = route({ params: z.object({ job: ids.job }), body: measurementSetSchema, resource: "job", permission: "bench:record" }, ({ body, found, actor, req }) =>
  idempotentRoute(req, actor.userId, body, async () => {
    const made = await recordMeasurementSet(actor, found, body);
    return { id: made.id, out: made.out };
  }),
);
