import "server-only";
import type { Tx } from "@/db/transaction";
import type { InvoiceRow } from "@/db/queries/invoices";
import { enqueueMail } from "@/db/queries/outbox";
import { getShopName } from "@/db/queries/shops";
import { PAYMENT_METHOD_LABEL, type PaymentKind, type PaymentMethod, formatInvoiceNumber } from "@/lib/invoices";
import { describeMachine, type MachineKind } from "@/lib/machine";
import { formatMoney, taxLabel } from "@/lib/money";
import { formatJobNumber } from "@/lib/schemas/jobs";
import { appUrl } from "@/lib/server/config";
import { type MoneyMailContent, renderMoneyMail } from "@/lib/server/emails/money-email";
import { queueNoticeText, textLinkTo } from "@/lib/server/texts";

// The owner's money mail, queued in the outbox inside the transaction that causes it: the invoice
// when it is issued, a deposit request, and a receipt for every payment, deposit and refund. Each
// has a dedupe key, so a change applied twice can't mail twice.

type MailJob = { shopId: number; number: number; publicId: string; machine: { kind: MachineKind; year: number | null; make: string; model: string; serial: string | null } };
type Owner = { to: string; ownerName: string };

export const ownerInvoicePath = (jobPublicId: string) => `/my/jobs/${jobPublicId}/invoice`;

const context = (job: MailJob) => `${formatJobNumber(job.number)} · ${describeMachine(job.machine)}`;
const FOOTNOTE = "The button opens your job on Benchside. If you aren't signed in, ask for a sign-in link with this e-mail address and you'll come straight back to it. Reply to this e-mail to reach the shop.";

export async function queueInvoiceMail(tx: Tx, m: Owner & { invoice: InvoiceRow; job: MailJob }) {
  const i = m.invoice;
  const money = (n: number) => formatMoney(n, i.currency);
  const name = await getShopName({ shopId: m.job.shopId }, tx);
  const number = formatInvoiceNumber(i.number);
  const rows: [string, string][] = [["Work and parts", money(i.subtotalMinor)]];
  if (i.discountMinor) rows.push(["Discount", `−${money(i.discountMinor)}`]);
  if (i.suppliesMinor) rows.push(["Shop supplies", money(i.suppliesMinor)]);
  rows.push([taxLabel(i.snapshot.pricing.tax), money(i.taxMinor)], ["Invoice total", money(i.totalMinor)]);
  if (i.paidMinor) rows.push(["Already paid (deposits and payments)", `−${money(i.paidMinor)}`]);
  rows.push([i.balanceMinor > 0 ? "Balance due" : "Balance", money(Math.max(i.balanceMinor, 0))]);
  const content: MoneyMailContent = {
    shopName: name,
    context: context(m.job),
    subject: `${name}: invoice ${number} for your ${describeMachine(m.job.machine)}`,
    preview: i.balanceMinor > 0 ? `Balance due ${money(i.balanceMinor)}. You can pay online.` : "Nothing left to pay.",
    heading: `Invoice ${number}`,
    greeting: `Hello ${m.ownerName},`,
    paragraphs: [
      `Here is the invoice for the work you authorised on your ${describeMachine(m.job.machine)}.`,
      ...(i.returnedPartsNote ? [i.returnedPartsNote] : []),
    ],
    rows,
    button: { href: `${appUrl()}${ownerInvoicePath(m.job.publicId)}`, label: i.balanceMinor > 0 ? "See the invoice and pay" : "See the invoice" },
    footnote: FOOTNOTE,
  };
  await enqueueMail(tx, { shopId: m.job.shopId, jobPublicId: m.job.publicId, kind: "invoice", to: m.to, ...(await renderMoneyMail(content)), dedupeKey: `invoice:${i.publicId}:issued` });
}

/** The invoice by text (issue 21 §3): the balance and a link that signs in onto the invoice. */
export async function queueInvoiceText(tx: Tx, m: { invoice: InvoiceRow; job: MailJob & { id: number; customerId: number }; email: string | null }) {
  const i = m.invoice;
  const total = i.balanceMinor > 0 ? `balance due ${formatMoney(i.balanceMinor, i.currency)}` : "nothing left to pay";
  const link = await textLinkTo(tx, { email: m.email, nextPath: ownerInvoicePath(m.job.publicId) });
  await queueNoticeText(tx, { shopId: m.job.shopId, jobId: m.job.id, customerId: m.job.customerId, notice: { kind: "invoice", machine: describeMachine(m.job.machine), total, link }, dedupeKey: `invoice:${i.publicId}:issued` });
}

export async function queueDepositMail(tx: Tx, m: Owner & { deposit: { publicId: string; amountMinor: number; currency: string; note: string | null }; job: MailJob }) {
  const name = await getShopName({ shopId: m.job.shopId }, tx);
  const amount = formatMoney(m.deposit.amountMinor, m.deposit.currency);
  const content: MoneyMailContent = {
    shopName: name,
    context: context(m.job),
    subject: `${name} asks for a parts deposit of ${amount}`,
    preview: `A parts deposit of ${amount} for your ${describeMachine(m.job.machine)}.`,
    heading: "Parts deposit",
    greeting: `Hello ${m.ownerName},`,
    paragraphs: ["The shop asks for a deposit before ordering parts for your machine. It counts towards your invoice.", ...(m.deposit.note ? [m.deposit.note] : [])],
    rows: [["Deposit", amount]],
    button: { href: `${appUrl()}${ownerInvoicePath(m.job.publicId)}`, label: "Pay the deposit" },
    footnote: FOOTNOTE,
  };
  await enqueueMail(tx, { shopId: m.job.shopId, jobPublicId: m.job.publicId, kind: "deposit", to: m.to, ...(await renderMoneyMail(content)), dedupeKey: `deposit:${m.deposit.publicId}` });
}

const RECEIPT_HEADING: Record<PaymentKind, string> = { payment: "Payment received", deposit: "Deposit received", refund: "Refund sent" };

/** A receipt for one payment, deposit or refund (dedupe key: the payment row). */
export async function queueReceiptMail(
  tx: Tx,
  m: Owner & {
    paymentId: number;
    /** The shop's own number for it (lib/receipts.ts). */
    receipt: string;
    kind: PaymentKind;
    method: PaymentMethod;
    amountMinor: number;
    currency: string;
    reference: string | null;
    invoice: InvoiceRow | null;
    job: MailJob;
  },
) {
  const money = (n: number) => formatMoney(n, m.currency);
  const name = await getShopName({ shopId: m.job.shopId }, tx);
  const i = m.invoice;
  const rows: [string, string][] = [[m.kind === "refund" ? "Refund no." : "Receipt no.", m.receipt], ["How", PAYMENT_METHOD_LABEL[m.method]]];
  if (m.reference) rows.push(["Reference", m.reference]);
  if (i) rows.push([`Invoice ${formatInvoiceNumber(i.number)} total`, money(i.totalMinor)], ["Paid so far", money(i.paidMinor)], [i.balanceMinor > 0 ? "Balance due" : "Balance", money(Math.max(i.balanceMinor, 0))]);
  rows.push([m.kind === "refund" ? "Refunded" : "Received", money(m.amountMinor)]);
  const refund = m.kind === "refund";
  const content: MoneyMailContent = {
    shopName: name,
    context: context(m.job),
    subject: `${name}: ${refund ? "refund" : "receipt"} for ${money(m.amountMinor)}${i ? ` (invoice ${formatInvoiceNumber(i.number)})` : ""}`,
    preview: refund ? `${money(m.amountMinor)} is on its way back to you.` : `Thank you: ${money(m.amountMinor)} received.`,
    heading: RECEIPT_HEADING[m.kind],
    greeting: `Hello ${m.ownerName},`,
    paragraphs: [
      refund
        ? `The shop has refunded ${money(m.amountMinor)}. ${m.method === "online" ? "It goes back to the card you paid with; banks can take several days to show it." : "The shop hands it back the way you paid."}`
        : `Thank you: the shop has received ${money(m.amountMinor)} for the work on your ${describeMachine(m.job.machine)}.`,
      ...(i && i.balanceMinor <= 0 && !refund ? ["Your invoice is paid in full."] : []),
    ],
    rows,
    button: { href: `${appUrl()}${ownerInvoicePath(m.job.publicId)}`, label: "See the invoice" },
    footnote: "Keep this e-mail as your receipt. Reply to it to reach the shop.",
  };
  await enqueueMail(tx, { shopId: m.job.shopId, jobPublicId: m.job.publicId, kind: "receipt", to: m.to, ...(await renderMoneyMail(content)), dedupeKey: `receipt:${m.paymentId}` });
}
