"use server";
import { revalidatePath } from "next/cache";
import { z } from "zod";
import { formAction } from "@/lib/action";
import { dropoffFields, dropoffSignatureFields } from "@/lib/schemas/dropoff";
import { ids } from "@/lib/server/access";
import { prepareDropoff, prepareStandardDropoff, sendDropoffLink, signDropoffAtCounter } from "@/lib/server/dropoff";

// The desk's side of the authorisation signed at drop-off (lib/server/dropoff.ts): prepare it,
// have the owner sign on this screen, or e-mail them the link. Typed terms are for money people;
// anyone at the counter may put the shop's standard terms up and witness the owner's signature.

const revalidate = (job: { shopSlug: string; number: number; publicId: string }) => {
  revalidatePath(`/shop/${job.shopSlug}/jobs/${job.number}`, "layout");
  revalidatePath(`/my/jobs/${job.publicId}`, "layout");
};

export const prepareDropoffAction = formAction(
  { input: dropoffFields.extend({ job: ids.job }), resource: "job", permission: "approvals:send" },
  async ({ input, actor, found }) => {
    const { job } = await prepareDropoff(actor, found, input);
    revalidate(job);
    return { prepared: true };
  },
);

export const prepareStandardDropoffAction = formAction(
  { input: z.object({ job: ids.job }), resource: "job", permission: "dropoff:standard" },
  async ({ actor, found }) => {
    const { job } = await prepareStandardDropoff(actor, found);
    revalidate(job);
    return { prepared: true };
  },
);

export const sendDropoffLinkAction = formAction(
  { input: z.object({ job: ids.job }), resource: "job", permission: "approvals:send" },
  async ({ actor, found }) => {
    const { job, to } = await sendDropoffLink(actor, found);
    revalidate(job);
    return { to };
  },
);

/** The owner types their name on the desk's screen; the staff member at the desk is recorded as witness. */
export const signDropoffAtCounterAction = formAction(
  { input: dropoffSignatureFields.extend({ job: ids.job }), resource: "job", permission: "dropoff:standard" },
  async ({ input, actor, found }) => {
    const { job } = await signDropoffAtCounter(actor, found, input);
    revalidate(job);
    return { signed: true };
  },
);
