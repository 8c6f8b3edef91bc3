"use server";
import { z } from "zod";
import { formAction } from "@/lib/action";
import { AppError } from "@/lib/errors";
import { unsubscribeWithToken } from "@/lib/server/following";

/** The button on the unsubscribe page; the token is the only credential, as for the one-click POST. */
export const unsubscribeAction = formAction({ input: z.object({ token: z.string().max(200) }), permission: "public" }, async ({ input }) => {
  const result = await unsubscribeWithToken(input.token);
  if (result === "invalid") throw new AppError("bad_request", "This unsubscribe link isn't valid. Use the link from the e-mail as it is.");
  if (result === "gone") throw new AppError("not_found", "There is no subscription behind this link any more: you get no e-mail about this job.");
  return { done: true };
});
