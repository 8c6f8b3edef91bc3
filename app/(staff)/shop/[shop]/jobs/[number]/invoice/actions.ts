"use server";
import { revalidatePath } from "next/cache";
import { formAction } from "@/lib/action";
import {
  addLineSchema,
  draftDetailsSchema,
  invoiceRefSchema,
  issueSchema,
  jobRefSchema,
  recordDepositSchema,
  recordPaymentSchema,
  refundSchema,
  removeLineSchema,
  requestDepositSchema,
  voidSchema,
} from "@/lib/schemas/invoices";
import { recordCounterPayment, recordDeposit, refundPayment, requestDeposit } from "@/lib/server/invoice-payments";
import { addLine, createInvoice, issueInvoice, removeLine, syncAuthorised, updateDraft, voidInvoice } from "@/lib/server/invoices";

// The desk's invoice forms. Each one: zod schema → lib/server (authorises on the job, changes the
// invoice, its payments, entry and e-mail in one transaction) → refresh the desk's and owner's pages.

function refresh(job: { shopSlug: string; number: number; publicId: string }) {
  revalidatePath(`/shop/${job.shopSlug}/jobs/${job.number}/invoice`);
  revalidatePath(`/shop/${job.shopSlug}/jobs/${job.number}`);
  revalidatePath(`/my/jobs/${job.publicId}/invoice`);
  revalidatePath(`/my/jobs/${job.publicId}`);
}

async function done<T extends { job: { shopSlug: string; number: number; publicId: string } }>(work: Promise<T>) {
  const { job } = await work;
  refresh(job);
  return { saved: true };
}

export const createInvoiceAction = formAction({ input: jobRefSchema, run: ({ input, actor }) => done(createInvoice(actor, input.job)) });

export const syncAuthorisedAction = formAction({ input: invoiceRefSchema, run: ({ input, actor }) => done(syncAuthorised(actor, input.invoice, input.version)) });
export const addLineAction = formAction({ input: addLineSchema, run: ({ input, actor }) => done(addLine(actor, input.invoice, input)) });
export const removeLineAction = formAction({ input: removeLineSchema, run: ({ input, actor }) => done(removeLine(actor, input.invoice, input)) });
export const draftDetailsAction = formAction({ input: draftDetailsSchema, run: ({ input, actor }) => done(updateDraft(actor, input.invoice, input)) });
export const issueInvoiceAction = formAction({ input: issueSchema, run: ({ input, actor }) => done(issueInvoice(actor, input.invoice, input.version)) });
export const voidInvoiceAction = formAction({ input: voidSchema, run: ({ input, actor }) => done(voidInvoice(actor, input.invoice, input)) });
export const recordPaymentAction = formAction({ input: recordPaymentSchema, run: ({ input, actor }) => done(recordCounterPayment(actor, input)) });
export const requestDepositAction = formAction({ input: requestDepositSchema, run: ({ input, actor }) => done(requestDeposit(actor, input)) });
export const recordDepositAction = formAction({ input: recordDepositSchema, run: ({ input, actor }) => done(recordDeposit(actor, input)) });
export const refundAction = formAction({ input: refundSchema, run: ({ input, actor }) => done(refundPayment(actor, input)) });
