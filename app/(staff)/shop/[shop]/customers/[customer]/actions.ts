"use server";
import { revalidatePath } from "next/cache";
import { formAction } from "@/lib/action";
import { contactFormSchema, mergeFormSchema } from "@/lib/schemas/customers";
import { mergeDuplicate, saveContact } from "@/lib/server/customers";

/** The customer's name, e-mail, phone and the way they like to be reached. */
export const saveContactAction = formAction(
  {
    input: contactFormSchema,
    resource: "customer",
    permission: "customer:edit",
  },
  async ({ input, found }) => {
    await saveContact(found, input.contact);
    revalidatePath(`/shop/${found.shop.slug}/customers`, "layout");
    return { saved: true };
  },
);

/** Folds a duplicate record of the same person into this one: every job and machine moves, in one transaction. */
export const mergeCustomerAction = formAction(
  {
    input: mergeFormSchema,
    resource: "customer",
    permission: "customer:merge",
  },
  async ({ actor, input, found }) => {
    const { moved } = await mergeDuplicate(actor, found, input.duplicate);
    revalidatePath(`/shop/${found.shop.slug}/customers`, "layout");
    return { jobs: moved.jobIds.length, machines: moved.machineIds.length };
  },
);
