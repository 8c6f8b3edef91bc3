import { z } from "zod";
import { route } from "@/lib/route";
import { ids } from "@/lib/server/access";
import { failedClips } from "@/lib/server/clips";

/**
 * GET /api/jobs/:job/clips/failed — the job's clips the video service rejected (not a video, an
 * upload that failed, longer than the shop allows), with the reason. They are not on the
 * timeline; the shop's staff see them here until they clear them.
 */
export const GET = route({ params: z.object({ job: ids.job }), resource: "job", permission: "journal:view-shop-only" }, async ({ found }) => ({
  clips: await failedClips(found),
}));
