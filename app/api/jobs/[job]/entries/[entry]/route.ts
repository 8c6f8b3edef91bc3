import { z } from "zod";
import { entryChangeSchema, entryDeleteSchema } from "@/lib/journal";
import { route } from "@/lib/route";
import { ids } from "@/lib/server/access";
import { editEntry } from "@/lib/server/journal";

const params = z.object({ job: ids.job, entry: ids.row });

/** PATCH /api/jobs/:job/entries/:entry {version, note?, caption?, visibility?} — edit or share; the old state goes to history. */
export const PATCH = route({ params, body: entryChangeSchema, resource: "job", permission: "journal:post" }, ({ body, params, found, actor }) =>
  editEntry(actor, found, params.entry, body),
);

/** DELETE /api/jobs/:job/entries/:entry {version} — hidden from everyone, kept in history. */
export const DELETE = route({ params, body: entryDeleteSchema, resource: "job", permission: "journal:post" }, ({ body, params, found, actor }) =>
  editEntry(actor, found, params.entry, { version: body.version, delete: true }),
);
