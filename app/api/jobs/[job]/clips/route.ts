import { z } from "zod";
import { newClipSchema } from "@/lib/schemas/clips";
import { route } from "@/lib/route";
import { ids } from "@/lib/server/access";
import { startClipUpload } from "@/lib/server/clips";

/**
 * POST /api/jobs/:job/clips {name, size, durationSeconds, type, caption, visibility} — checks the
 * clip against the shop's limits and answers the upload URL the browser sends it to in chunks.
 */
export const POST = route({ params: z.object({ job: ids.job }), body: newClipSchema, resource: "job", permission: "journal:post" }, ({ body, found, actor }) =>
  startClipUpload(actor, found, body),
);
