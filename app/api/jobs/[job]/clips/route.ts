import { z } from "zod";
import { newClipSchema } from "@/lib/schemas/clips";
import { route } from "@/lib/route";
import { ids } from "@/lib/server/access";
import { startClipUpload } from "@/lib/server/clips";
import { idempotentRoute } from "@/lib/server/idempotency";

/**
 * POST /api/jobs/:job/clips {name, size, durationSeconds, type, caption, visibility} — checks the
 * clip against the shop's limits and answers the upload URL the browser sends it to in chunks.
 * With an `Idempotency-Key`, a replay answers the same clip and upload URL (the outbox resumes it).
 */
export const POST = route({ params: z.object({ job: ids.job }), body: newClipSchema, resource: "job", permission: "journal:post" }, ({ body, found, actor, req }) =>
  idempotentRoute(req, actor.userId, body, () => startClipUpload(actor, found, body)),
);
