import { newEntrySchema } from "@/lib/schemas/journal";
import { route } from "@/lib/route";
import { ids } from "@/lib/server/access";
import { postEntry } from "@/lib/server/journal";
import { z } from "zod";

/** POST /api/jobs/:job/entries {kind:"note", note, visibility} | {kind:"photos", photoIds, caption, visibility} */
export const POST = route(
  { params: z.object({ job: ids.job }), body: newEntrySchema, resource: "job", permission: "journal:post" },
  ({ body, found, actor }) => postEntry(actor, found, body),
);
