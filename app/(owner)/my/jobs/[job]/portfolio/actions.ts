"use server";
import { revalidatePath, updateTag } from "next/cache";
import { headers } from "next/headers";
import { z } from "zod";
import { formAction } from "@/lib/action";
import { CONSENT_DECISIONS } from "@/lib/portfolio";
import { ids } from "@/lib/server/access";
import { clientIp } from "@/lib/server/client-ip";
import { decideConsent } from "@/lib/server/portfolio";
import { shopCacheTag, storyCacheTag } from "@/lib/server/portfolio-cache";

/**
 * The machine owner's answer on the portfolio page. Recorded with the typed name, time, address
 * and browser; a withdrawal takes the story down in the same transaction (the public page checks
 * the status on every request) and its cached copies are dropped here.
 */
export const consentAction = formAction(
  {
    input: z.object({
      job: ids.job,
      decision: z.enum(CONSENT_DECISIONS, { message: "Choose an answer." }),
      name: z.string().trim().min(1, "Type your name to sign your answer.").max(120, "Keep your name under 120 characters."),
    }),
    resource: "job",
    permission: "portfolio:consent",
  },
  async ({ input, actor, found }) => {
    const h = await headers();
    const { story, status } = await decideConsent(
      actor,
      found,
      { decision: input.decision, name: input.name },
      { ip: clientIp(h), userAgent: h.get("user-agent") },
    );
    updateTag(storyCacheTag(story.id));
    updateTag(shopCacheTag(story.shopId));
    revalidatePath(`/my/jobs/${input.job}`, "layout");
    // Every public portfolio page below /s (the shop's grid and the story itself).
    revalidatePath("/s", "layout");
    return { status, decision: input.decision };
  },
);
