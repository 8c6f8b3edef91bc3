"use server";
import { revalidatePath } from "next/cache";
import { headers } from "next/headers";
import { formAction } from "@/lib/action";
import { storyConsentFields } from "@/lib/portfolio";
import { ids } from "@/lib/server/access";
import { clientIp } from "@/lib/server/client-ip";
import { decideConsent } from "@/lib/server/portfolio";
import { dropPublicPages } from "@/lib/server/portfolio-cache";

/**
 * The machine owner's answer on the portfolio page. Recorded with the typed name, time, address
 * and browser; a withdrawal takes the story down in the same transaction and the shop's cached
 * public pages are dropped here, before the answer goes back.
 */
export const consentAction = formAction(
  {
    input: storyConsentFields.extend({ job: ids.job }),
    resource: "job",
    permission: "portfolio:consent",
  },
  async ({ input, actor, found }) => {
    const h = await headers();
    const { status } = await decideConsent(
      actor,
      found,
      { decision: input.decision, name: input.name, shownHash: input.shownHash ?? null },
      { ip: clientIp(h), userAgent: h.get("user-agent") },
    );
    // Every cached public page of the shop (the grid and the story itself): the next request
    // for a withdrawn story renders afresh and answers 404.
    dropPublicPages(found.job.shopSlug);
    revalidatePath(`/my/jobs/${input.job}`, "layout");
    return { status, decision: input.decision };
  },
);
