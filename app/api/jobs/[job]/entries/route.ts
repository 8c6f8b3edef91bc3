import { newEntrySchema } from "@/lib/schemas/journal";
import { route } from "@/lib/route";
import { ids } from "@/lib/server/access";
import { idempotentRoute } from "@/lib/server/idempotency";
import { postEntry } from "@/lib/server/journal";
import { z } from "zod";

/**
 * POST /api/jobs/:job/entries {kind:"note", note, visibility} | {kind:"photos", photoIds, caption, visibility}.
 * An `Idempotency-Key` header makes a replay (the phone's outbox) answer as the first send did.
 */
export const POST = route(
  { params: z.object({ job: ids.job }), body: newEntrySchema, resource: "job", permission: "journal:post" },
  ({ body, found, actor, req }) => idempotentRoute(req, actor.userId, body, () => postEntry(actor, found, body)),
);
