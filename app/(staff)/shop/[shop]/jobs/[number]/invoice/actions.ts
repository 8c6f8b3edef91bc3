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

// The desk's invoice forms. Each one declares what it acts on and the permission it needs
// (lib/action.ts), then lib/server changes the invoice, its payments, entry and e-mail in one
// transaction, then the desk's and owner's pages are refreshed.

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

export const createInvoiceAction = formAction({ input: jobRefSchema, resource: "jobMoney", permission: "invoice:create" }, ({ actor, found }) => done(createInvoice(actor, found)));

const draft = { resource: "invoice", permission: "invoice:create" } as const;
export const syncAuthorisedAction = formAction({ input: invoiceRefSchema, ...draft }, ({ input, found }) => done(syncAuthorised(found, input.version)));
export const addLineAction = formAction({ input: addLineSchema, ...draft }, ({ input, found }) => done(addLine(found, input)));
export const removeLineAction = formAction({ input: removeLineSchema, ...draft }, ({ input, found }) => done(removeLine(found, input)));
export const draftDetailsAction = formAction({ input: draftDetailsSchema, ...draft }, ({ input, found }) => done(updateDraft(found, input)));
export const issueInvoiceAction = formAction({ input: issueSchema, ...draft }, ({ input, actor, found }) => done(issueInvoice(actor, found, input.version)));
export const voidInvoiceAction = formAction({ input: voidSchema, ...draft }, ({ input, actor, found }) => done(voidInvoice(actor, found, input)));

export const recordPaymentAction = formAction({ input: recordPaymentSchema, resource: "invoice", permission: "invoice:record-payment" }, ({ input, actor, found }) =>
  done(recordCounterPayment(actor, found, input)),
);
export const requestDepositAction = formAction({ input: requestDepositSchema, resource: "jobMoney", permission: "invoice:create" }, ({ input, actor, found }) => done(requestDeposit(actor, found, input)));
export const recordDepositAction = formAction({ input: recordDepositSchema, resource: "deposit", permission: "invoice:record-payment" }, ({ input, actor, found }) => done(recordDeposit(actor, found, input)));
export const refundAction = formAction({ input: refundSchema, resource: "jobMoney", permission: "invoice:refund" }, ({ input, actor, found }) => done(refundPayment(actor, found, input)));
