"use server";
import { revalidatePath } from "next/cache";
import { headers } from "next/headers";
import { formAction } from "@/lib/action";
import { dropoffSignatureFields } from "@/lib/schemas/dropoff";
import { ids } from "@/lib/server/access";
import { clientIp } from "@/lib/server/client-ip";
import { signDropoffOnline } from "@/lib/server/dropoff";

/** The machine's owner signs the drop-off authorisation online: typed name, time, address and browser recorded. */
export const signDropoffOnlineAction = formAction(
  { input: dropoffSignatureFields.extend({ job: ids.job }), resource: "job", permission: "approvals:answer" },
  async ({ input, actor, found }) => {
    const h = await headers();
    const { job } = await signDropoffOnline(actor, found, input, { ip: clientIp(h), userAgent: h.get("user-agent") });
    revalidatePath(`/my/jobs/${job.publicId}`, "layout");
    revalidatePath(`/shop/${job.shopSlug}/jobs/${job.number}`, "layout");
    return { signed: true };
  },
);
