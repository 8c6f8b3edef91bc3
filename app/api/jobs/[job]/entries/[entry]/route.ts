import { entryChangeSchema, entryDeleteSchema } from "@/lib/journal";
import { route } from "@/lib/route";
import { editEntry, entryIdParam } from "@/lib/server/journal";

type Params = { job: string; entry: string };

/** PATCH /api/jobs/:job/entries/:entry {version, note?, caption?, visibility?} — edit or share; the old state goes to history. */
export const PATCH = route<typeof entryChangeSchema, Params>({
  input: entryChangeSchema,
  run: ({ input, params, actor }) => editEntry(actor, params.job, entryIdParam(params.entry), input),
});

/** DELETE /api/jobs/:job/entries/:entry {version} — hidden from everyone, kept in history. */
export const DELETE = route<typeof entryDeleteSchema, Params>({
  input: entryDeleteSchema,
  run: ({ input, params, actor }) => editEntry(actor, params.job, entryIdParam(params.entry), { version: input.version, delete: true }),
});
