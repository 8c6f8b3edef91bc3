import { z } from "zod";
import { stepTorqueSchema } from "@/lib/schemas/bench";
import { route } from "@/lib/route";
import { ids } from "@/lib/server/access";
import { setTeardownTorque } from "@/lib/server/bench";
import { idempotentRoute } from "@/lib/server/idempotency";

/** POST /api/jobs/:job/step-torques — the torque a teardown step (`step` in the body) goes back on with, replayable with an `Idempotency-Key` (see torque-records). */
export const POST = route({ params: z.object({ job: ids.job }), body: stepTorqueSchema, resource: "job", permission: "bench:record" }, ({ body, found, actor, req }) =>
  idempotentRoute(req, actor.userId, body, async () => {
    await setTeardownTorque(actor, found, body);
    return { step: body.step };
  }),
);
