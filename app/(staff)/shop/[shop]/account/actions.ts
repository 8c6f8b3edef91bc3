"use server";
import { formAction } from "@/lib/action";
import { changePasswordSchema } from "@/lib/schemas/staff";
import { currentSessionId } from "@/lib/server/actor";
import { changeOwnPassword } from "@/lib/server/password-reset";

/** A new password for the signed-in person (current one required); their other sessions end, this one stays. */
export const changeOwnPasswordAction = formAction({ input: changePasswordSchema, permission: "signed-in" }, async ({ input, actor }) => {
  const ended = await changeOwnPassword({ userId: actor.userId, sessionId: await currentSessionId(), current: input.current, next: input.password });
  return { otherSessionsEnded: ended };
});
