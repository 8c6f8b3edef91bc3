// What the browser declares before a clip upload and when it marks a moment (lib/clips.ts holds
// the limits and pure helpers): kept apart so client components can import lib/clips.ts without zod.
import { z } from "zod";
import { clipFileProblem } from "@/lib/file-kinds";

export const newClipSchema = z.object({
  name: z.string().trim().max(255).optional(),
  size: z.number({ message: "Say how large the clip is." }).int().positive("The clip is empty."),
  /** Read by the browser from the file before sending; the processed asset is checked again. */
  durationSeconds: z.number().nonnegative().finite().optional(),
  type: z.string().max(100).optional(),
  caption: z
    .string()
    .trim()
    .max(500, "Keep the caption under 500 characters.")
    .optional()
    .transform((s) => s || null),
  visibility: z.enum(["shop", "shared"]).default("shop"),
}).superRefine((clip, ctx) => {
  // Named, with what is accepted (issue 20 §3), beside the file's type.
  const problem = clip.type ? clipFileProblem({ name: clip.name ?? "", type: clip.type }) : null;
  if (problem) ctx.addIssue({ code: "custom", path: ["type"], message: problem });
});
export type NewClip = z.output<typeof newClipSchema>;

export const newMomentSchema = z.object({
  atSeconds: z.number({ message: "Say where in the clip." }).nonnegative().max(24 * 3600),
  label: z.string().trim().min(1, "Say what is seen at that moment.").max(120, "Keep it under 120 characters."),
});
