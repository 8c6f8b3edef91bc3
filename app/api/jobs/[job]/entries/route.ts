import { newEntrySchema } from "@/lib/journal";
import { route } from "@/lib/route";
import { postEntry } from "@/lib/server/journal";

/** POST /api/jobs/:job/entries {kind:"note", note, visibility} | {kind:"photos", photoIds, caption, visibility} */
export const POST = route<typeof newEntrySchema, { job: string }>({
  input: newEntrySchema,
  run: ({ input, params, actor }) => postEntry(actor, params.job, input),
});
