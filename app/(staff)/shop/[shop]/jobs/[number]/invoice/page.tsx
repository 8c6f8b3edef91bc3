import type { Metadata } from "next";
import { AuthorisationRecord } from "@/components/invoices/authorisation-record";
import { InvoiceDocument } from "@/components/invoices/invoice-document";
import { InvoiceActions } from "@/components/invoices/invoice-actions";
import { Alert, Card, EmptyState, PageHeader } from "@/components/ui";
import { amountText } from "@/lib/invoices";
import { PART_STATUS_LABEL } from "@/lib/bench";
import { formatMoney } from "@/lib/money";
import { can } from "@/lib/permissions";
import { formatJobNumber, jobNumberParamSchema } from "@/lib/schemas/jobs";
import { invoiceView } from "@/lib/server/invoice-views";
import { labourRateChoices } from "@/lib/server/shop-settings";
import { staffJobPage } from "@/lib/server/page-access";
import { AddLineForm, CreateInvoiceButton, DetailsForm, IssueForm, RemoveLineButton, SyncButton, VoidForm } from "./_components/draft-forms";
import { DepositsCard } from "./_components/deposits-card";
import { RecordPaymentForm, RefundForm } from "./_components/payment-forms";

type Props = { params: Promise<{ shop: string; number: string }> };

export async function generateMetadata({ params }: Props): Promise<Metadata> {
  const n = jobNumberParamSchema.safeParse((await params).number);
  return { title: n.success ? `Invoice · ${formatJobNumber(n.data)}` : "Invoice" };
}

export default async function StaffInvoicePage({ params }: Props) {
  const { shop: slug, number } = await params;
  // Technicians see no money: the desk and the shop owner do.
  const { actor, shop, job, resource } = await staffJobPage(slug, number, "invoice:view", "/invoice");
  const may = { create: can(actor, "invoice:create", resource), record: can(actor, "invoice:record-payment", resource), refund: can(actor, "invoice:refund", resource) };
  const view = await invoiceView(job.id, "shop");
  const inv = view.invoice;
  const m = (minor: number) => formatMoney(minor, view.currency);
  const refs = inv ? { invoice: inv.publicId, version: inv.version } : null;
  const jobPath = `/shop/${shop.slug}/jobs/${job.number}`;

  return (
    <div className="space-y-6">
      <PageHeader
        title={inv ? `Invoice ${inv.label}` : "Invoice"}
        description={`${view.job.label} · ${view.job.machine} · owner ${view.job.customerName}`}
        back={{ href: jobPath, label: `Back to ${view.job.label}` }}
        actions={inv ? <InvoiceActions invoicePublicId={inv.publicId} /> : null}
      />
      {view.openRequests.length ? (
        <Alert tone="warning" title="Still waiting on the owner">
          {view.openRequests.map((r) => `“${r.title}”`).join(", ")} {view.openRequests.length === 1 ? "is" : "are"} not answered yet: those lines aren&apos;t authorised and can&apos;t be invoiced.
        </Alert>
      ) : null}

      {view.partsNotFitted.length > 0 && (!inv || inv.status === "draft") ? (
        <Alert tone="info" title="Parts not billed yet">
          {view.partsNotFitted.map((p) => `${p.description} (${PART_STATUS_LABEL[p.status].toLowerCase()})`).join(", ")}: approved, but a part is billed only once it is fitted. Mark it fitted on the bench page, then bring it onto the invoice.
        </Alert>
      ) : null}
      {!inv ? (
        <Card as="section" title="No invoice yet" headingId="no-invoice">
          <div className="space-y-4">
            {view.record.length ? (
              <>
                <p>The invoice is made from the lines the owner approved; you can add lines within the shop&apos;s tolerance afterwards.</p>
                {may.create ? <CreateInvoiceButton jobPublicId={job.publicId} /> : null}
                <AuthorisationRecord record={view.record} timeZone={view.shop.timezone} headingLevel={3} />
              </>
            ) : (
              <EmptyState title="Nothing authorised yet" description="Send the owner an approval request from the job page; once they approve lines, make the invoice here." />
            )}
          </div>
        </Card>
      ) : (
        <InvoiceDocument view={view} lineAction={inv.status === "draft" && may.create && refs ? (l) => <RemoveLineButton refs={refs} lineId={l.id} description={l.description} /> : undefined} />
      )}

      {inv && refs && inv.status === "draft" && may.create ? (
        <Card as="section" title="Finish the draft" headingId="draft-heading" description="The owner sees the invoice once it is issued.">
          <div className="space-y-6">
            {inv.flaggedCount ? (
              <Alert tone="warning" title={`${inv.flaggedCount === 1 ? "A line goes" : `${inv.flaggedCount} lines go`} past what was authorised`}>
                The owner authorised {m(inv.authorisedPreTaxMinor)} before tax; with the shop&apos;s tolerance of {m(inv.toleranceMinor)} up to {m(inv.ceilingMinor)} may be charged. Remove the flagged
                line or send the owner an approval request for it first.
              </Alert>
            ) : null}
            {view.missingAuthorised ? <SyncButton refs={refs} count={view.missingAuthorised} /> : null}
            <IssueForm refs={refs} blocked={inv.flaggedCount ? "Remove the flagged lines (or get them approved) before issuing." : null} to="The owner gets it by e-mail and can pay online." />
            <section aria-labelledby="add-line-heading" className="space-y-2">
              <h3 id="add-line-heading" className="text-lg font-bold text-ink">Add a line</h3>
              <AddLineForm refs={refs} currency={view.currency} rates={await labourRateChoices(shop.id, view.currency)} />
            </section>
            <section aria-labelledby="details-heading" className="space-y-2">
              <h3 id="details-heading" className="text-lg font-bold text-ink">Discount and notes</h3>
              <DetailsForm
                refs={refs}
                currency={view.currency}
                discount={inv.discount ? { kind: inv.discount.kind, value: inv.discount.kind === "amount" ? amountText(inv.discount.amountMinor, view.currency) : inv.discount.percent.replace(/\.?0+$/, "") } : { kind: "none", value: "" }}
                returnedPartsNote={inv.returnedPartsNote}
                note={inv.note}
              />
            </section>
          </div>
        </Card>
      ) : null}

      {inv && inv.status !== "draft" ? (
        <Card as="section" title="Take or refund a payment" headingId="payments-card">
          <div className="space-y-4">
            <p>
              Paid {m(inv.paidMinor)} of {m(inv.totalMinor)}.{" "}
              {inv.balanceMinor > 0 ? <strong>Balance due {m(inv.balanceMinor)}.</strong> : inv.balanceMinor < 0 ? <strong>{m(-inv.balanceMinor)} was paid over the total: refund it.</strong> : "Nothing left to pay."}
            </p>
            {inv.balanceMinor > 0 && may.record ? <RecordPaymentForm invoice={inv.publicId} balance={amountText(inv.balanceMinor, view.currency)} currency={view.currency} /> : null}
            {may.refund && view.payments.some((p) => p.refundableMinor > 0) ? (
              <ul className="space-y-2" aria-label="Refund a payment">
                {view.payments
                  .filter((p) => p.refundableMinor > 0)
                  .map((p) => (
                    <li key={p.id} className="flex flex-wrap items-center justify-between gap-2">
                      <span>
                        {m(p.amountMinor)} on {new Date(p.receivedAt).toLocaleDateString("en-US", { timeZone: view.shop.timezone })} ({p.method === "online" ? "online" : p.method.replace("_", " ")})
                      </span>
                      <RefundForm job={job.publicId} payment={p.id} left={m(p.refundableMinor)} leftValue={amountText(p.refundableMinor, view.currency)} label={`the ${m(p.amountMinor)} payment`} online={p.method === "online"} />
                    </li>
                  ))}
              </ul>
            ) : null}
          </div>
        </Card>
      ) : null}

      <DepositsCard view={view} jobPublicId={job.publicId} mayRequest={may.create} mayRecord={may.record} />

      {inv && refs && may.create ? <VoidForm refs={refs} /> : null}
      {view.voided.length ? (
        <p className="text-sm text-ink-muted">Cancelled invoices: {view.voided.map((v) => `${v.label}${v.note ? ` (${v.note})` : ""}`).join("; ")}.</p>
      ) : null}
    </div>
  );
}
