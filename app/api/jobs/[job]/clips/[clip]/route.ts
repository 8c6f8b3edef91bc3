import { z } from "zod";
import { route } from "@/lib/route";
import { ids } from "@/lib/server/access";
import { clearFailedClipOfJob } from "@/lib/server/clips";

/** DELETE /api/jobs/:job/clips/:clip — clears a failed clip from the job's list (a clip on the timeline is deleted through its entry). */
export const DELETE = route({ params: z.object({ job: ids.job, clip: ids.media }), resource: "job", permission: "journal:post" }, ({ params, found }) =>
  clearFailedClipOfJob(found, params.clip),
);
