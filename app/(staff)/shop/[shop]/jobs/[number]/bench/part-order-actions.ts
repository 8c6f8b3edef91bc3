"use server";
import { revalidatePath } from "next/cache";
import { formAction } from "@/lib/action";
import { backOrderSchema, coreChargeSchema, coreReturnedSchema, movePartSchema, orderPartsSchema, partDepositSchema, specialOrderSchema } from "@/lib/schemas/part-orders";
import { resolve } from "@/lib/server/access";
import { askPartDeposit, backOrder, chargeCore, coreReturned, markSpecialOrder, movePart, orderParts } from "@/lib/server/part-orders";

// The bench page's ordering forms (issue 19): zod → lib/server/part-orders (the job named by the
// form, authorised by the declaration) → refresh the job's pages and the shop's parts list.

function refresh(job: { shopSlug: string; number: number }) {
  revalidatePath(`/shop/${job.shopSlug}/jobs/${job.number}/bench`);
  revalidatePath(`/shop/${job.shopSlug}/jobs/${job.number}`);
  revalidatePath(`/shop/${job.shopSlug}/parts`);
}

export const orderPartsAction = formAction({ input: orderPartsSchema, resource: "job", permission: "parts:manage" }, async ({ input, actor, found }) => {
  const made = await orderParts(actor, { shopId: found.job.shopId, jobId: found.job.id }, input);
  refresh(found.job);
  return { order: made.id };
});

export const backOrderAction = formAction({ input: backOrderSchema, resource: "job", permission: "parts:manage" }, async ({ input, actor, found }) => {
  await backOrder(actor, found, input);
  refresh(found.job);
  return { part: input.part };
});

export const movePartAction = formAction({ input: movePartSchema, resource: "job", permission: "parts:manage" }, async ({ input, actor, found }) => {
  // The other job: the same shop's, and the same permission on it.
  const to = await resolve(actor, "shopJob", { shop: found.job.shopSlug, number: String(input.toJob) }, "parts:manage");
  const made = await movePart(actor, found, to, { part: input.part, forWork: { findingId: null, noOkNeeded: true }, thisJob: input.thisJob });
  refresh(found.job);
  refresh(to.job);
  return { part: input.part, toJob: to.job.number, newPart: made.newPartId };
});

// The amount is money (the desk's); marking the old part as gone back is whoever ships it.
export const coreChargeAction = formAction({ input: coreChargeSchema, resource: "job", permission: "invoice:create" }, async ({ input, actor, found }) => {
  await chargeCore(actor, found, input);
  refresh(found.job);
  return { part: input.part };
});

export const coreReturnedAction = formAction({ input: coreReturnedSchema, resource: "job", permission: "parts:manage" }, async ({ input, actor, found }) => {
  await coreReturned(actor, found, input);
  refresh(found.job);
  return { part: input.part };
});

export const specialOrderAction = formAction({ input: specialOrderSchema, resource: "job", permission: "parts:manage" }, async ({ input, actor, found }) => {
  await markSpecialOrder(actor, found, input);
  refresh(found.job);
  return { part: input.part };
});

// Money: asked by the desk, as the job's other deposits are.
export const partDepositAction = formAction({ input: partDepositSchema, resource: "job", permission: "invoice:create" }, async ({ input, actor, found }) => {
  const made = await askPartDeposit(actor, found, input);
  refresh(found.job);
  return { deposit: made.deposit.publicId };
});
