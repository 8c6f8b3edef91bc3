import type { Metadata } from "next";
import { InvoiceDocument } from "@/components/invoices/invoice-document";
import { InvoiceActions } from "@/components/invoices/invoice-actions";
import { Alert, type AlertTone, Card, EmptyState, PageHeader } from "@/components/ui";
import { describeMachine } from "@/lib/machine";
import { formatMoney } from "@/lib/money";
import { can } from "@/lib/permissions";
import { invoiceReturnSchema } from "@/lib/schemas/invoices";
import { formatJobNumber } from "@/lib/schemas/jobs";
import { invoiceView } from "@/lib/server/invoice-views";
import { loadPage } from "@/lib/server/page-access";
import { type ReturnState, confirmReturn } from "@/lib/server/payment-webhook";
import { PayButton } from "./_components/pay-button";

export const metadata: Metadata = { title: "Your invoice" };

const RETURN_MESSAGE: Record<ReturnState | "cancelled", { tone: AlertTone; title: string; text: string }> = {
  paid: { tone: "success", title: "Payment received", text: "Thank you: your payment went through. A receipt is on its way by e-mail." },
  open: { tone: "warning", title: "Not paid", text: "Your payment didn't go through, so nothing was charged. You can try again, with another card if the bank declined it." },
  expired: { tone: "warning", title: "Not paid", text: "The payment page expired before a payment was made. Nothing was charged; start again below." },
  unknown: { tone: "info", title: "Checking your payment", text: "We couldn't confirm the payment just yet. If you paid, it shows here within a few minutes; reload the page to check." },
  cancelled: { tone: "warning", title: "Not paid", text: "You left the payment page before paying. Nothing was charged; the balance is still due." },
};

type Props = { params: Promise<{ job: string }>; searchParams: Promise<Record<string, string | string[] | undefined>> };

export default async function OwnerInvoicePage({ params, searchParams }: Props) {
  const { job: publicId } = await params;
  // Money is for the desk and the machine's owner: a technician is refused, a follower or stranger gets a 404.
  const { actor, job, resource } = await loadPage("jobMoney", { job: publicId }, "invoice:view", `/my/jobs/${publicId}/invoice`);
  const query = invoiceReturnSchema.parse(await searchParams);
  // Back from the payment page: confirm with the payments service before showing the invoice.
  const returned: ReturnState | "cancelled" | null = query.paid ? await confirmReturn(job, query.paid) : query.cancelled ? "cancelled" : null;
  const view = await invoiceView(job.id, "owner");
  const inv = view.invoice;
  const mayPay = can(actor, "invoice:pay", resource);
  const openDeposits = view.deposits.filter((d) => d.status === "open");
  const message = returned ? RETURN_MESSAGE[returned] : null;

  return (
    <div className="space-y-4">
      <PageHeader
        title={inv ? `Invoice ${inv.label}` : "Invoice"}
        description={`${job.shopName} · ${formatJobNumber(job.number)} · ${describeMachine(job.machine)}`}
        back={{ href: `/my/jobs/${publicId}`, label: "Back to your job" }}
        actions={inv ? <InvoiceActions invoicePublicId={inv.publicId} /> : null}
      />
      {message ? (
        <Alert tone={message.tone} title={message.title}>
          <span data-testid="payment-outcome">{message.text}</span>
        </Alert>
      ) : null}

      {openDeposits.map((d) => (
        <Card key={d.publicId} as="section" title="Parts deposit requested" headingId={`deposit-${d.publicId}`}>
          <div className="space-y-3">
            <p>
              {job.shopName} asks for a deposit of <strong>{formatMoney(d.amountMinor, d.currency)}</strong> before ordering parts. It counts towards your invoice.
            </p>
            {d.note ? <p className="whitespace-pre-line">{d.note}</p> : null}
            {mayPay ? <PayButton target={{ deposit: d.publicId }} label={`Pay the ${formatMoney(d.amountMinor, d.currency)} deposit`} /> : null}
          </div>
        </Card>
      ))}

      {inv && inv.status !== "void" && inv.balanceMinor > 0 && mayPay ? (
        <Card as="section" title="Pay online" headingId="pay-heading">
          <div className="space-y-3">
            <p>
              Balance due: <strong data-testid="owner-balance">{formatMoney(inv.balanceMinor, inv.currency)}</strong>. You pay on the payment service&apos;s page and come straight back here.
            </p>
            <PayButton target={{ invoice: inv.publicId }} label={`Pay ${formatMoney(inv.balanceMinor, inv.currency)}`} />
          </div>
        </Card>
      ) : null}
      {inv?.status === "paid" ? (
        <Alert tone="success" title="Paid in full">
          Thank you. {view.payments.some((p) => p.kind !== "refund") ? "A receipt for each payment was e-mailed to you; the payments are listed on the invoice." : ""}
        </Alert>
      ) : null}

      {inv ? (
        <InvoiceDocument view={view} />
      ) : (
        <EmptyState title="No invoice yet" description={`${job.shopName} sends the invoice when the work is done; you'll get it by e-mail and find it here.`} />
      )}
    </div>
  );
}
