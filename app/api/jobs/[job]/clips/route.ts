import { newClipSchema } from "@/lib/clips";
import { route } from "@/lib/route";
import { startClipUpload } from "@/lib/server/clips";

/**
 * POST /api/jobs/:job/clips {name, size, durationSeconds, type, caption, visibility} — checks the
 * clip against the shop's limits and answers the upload URL the browser sends it to in chunks.
 */
export const POST = route<typeof newClipSchema, { job: string }>({
  input: newClipSchema,
  run: ({ input, params, actor }) => startClipUpload(actor, params.job, input),
});
