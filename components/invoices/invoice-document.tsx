import { CircleAlert, CircleCheck, Receipt } from "lucide-react";
import type { ReactNode } from "react";
import { Badge, type BadgeTone } from "@/components/ui";
import { LINE_KIND_LABEL } from "@/lib/approvals";
import { INVOICE_STATUS_LABEL, type InvoiceStatus, LINE_SOURCE_LABEL, PAYMENT_KIND_LABEL, PAYMENT_METHOD_LABEL, withdrawnText } from "@/lib/invoices";
import { formatHours, formatMoney, formatQuantity } from "@/lib/money";
import type { InvoiceView, ViewLine } from "@/lib/server/invoice-views";
import { AuthorisationRecord, formatWhen } from "./authorisation-record";

// The invoice as a document: the same on the desk's page, the owner's page and on paper. The print
// rules show only this element, in black on white, so "Print" gives a clean invoice.

const PRINT_CSS = `@media print {
  body { background: #fff !important; }
  body * { visibility: hidden !important; }
  #invoice-document, #invoice-document * { visibility: visible !important; }
  #invoice-document { position: absolute; inset: 0 auto auto 0; width: 100%; border: 0 !important; box-shadow: none !important; padding: 0 !important; color: #000 !important; background: #fff !important; }
  #invoice-document .print-hide { display: none !important; }
  @page { margin: 14mm; }
}`;

const STATUS_TONE: Record<InvoiceStatus, BadgeTone> = { draft: "neutral", issued: "signal", paid: "moss", void: "rust" };

function lineDetail(l: ViewLine, currency: string): { qty: string; price: string } {
  if (l.kind === "part") return { qty: formatQuantity(l.qtyThousandths ?? 0), price: formatMoney(l.unitPriceMinor ?? 0, currency) };
  if (l.kind === "labour") return { qty: `${formatHours(l.hoursTenths ?? 0)} h`, price: `${formatMoney(l.rateMinor ?? 0, currency)}/h` };
  return { qty: "", price: "" };
}

export function InvoiceDocument({ view, children, lineAction }: { view: InvoiceView; children?: ReactNode; lineAction?: (line: ViewLine) => ReactNode }) {
  const inv = view.invoice;
  if (!inv) return null;
  const m = (n: number) => formatMoney(n, inv.currency);
  const tz = view.shop.timezone;
  const rows: [string, string, boolean?][] = [["Work and parts", m(inv.subtotalMinor)]];
  if (inv.discountMinor) rows.push(["Discount", `−${m(inv.discountMinor)}`]);
  if (inv.suppliesMinor) rows.push(["Shop supplies", m(inv.suppliesMinor)]);
  rows.push([inv.taxLabel, m(inv.taxMinor)], ["Total", m(inv.totalMinor), true]);
  if (inv.paidMinor) rows.push(["Paid (deposits and payments, less refunds)", `−${m(inv.paidMinor)}`]);
  rows.push([inv.balanceMinor < 0 ? "Owed back to you" : "Balance due", m(Math.abs(inv.balanceMinor)), true]);
  return (
    <article id="invoice-document" aria-labelledby="invoice-title" className="space-y-6 rounded-xl border border-line bg-surface p-4 shadow-sm sm:p-6">
      <style>{PRINT_CSS}</style>
      <header className="flex flex-wrap items-start justify-between gap-4">
        <div>
          <p className="text-xl font-extrabold text-ink">{view.shop.name}</p>
          {view.shop.phone ? <p>{view.shop.phone}</p> : null}
          {view.shop.email ? <p>{view.shop.email}</p> : null}
        </div>
        <div className="text-right">
          <h2 id="invoice-title" className="text-2xl font-extrabold text-ink">
            Invoice {inv.label}
          </h2>
          <p className="mt-1">
            <Badge tone={STATUS_TONE[inv.status]} icon={inv.status === "paid" ? CircleCheck : inv.status === "issued" ? Receipt : CircleAlert}>
              {INVOICE_STATUS_LABEL[inv.status]}
            </Badge>
          </p>
          <p className="mt-1 text-sm text-ink-muted">{inv.issuedAt ? `Issued ${formatWhen(inv.issuedAt, tz)}` : `Drafted ${formatWhen(inv.createdAt, tz)}`}</p>
        </div>
      </header>

      <dl className="grid gap-x-6 gap-y-1 sm:grid-cols-[auto_1fr]">
        <dt className="font-semibold">Owner</dt>
        <dd>{view.job.customerName}</dd>
        <dt className="font-semibold">Job</dt>
        <dd>{view.job.label}</dd>
        <dt className="font-semibold">Machine</dt>
        <dd>
          {view.job.machine}
          {view.job.serial ? ` · serial ${view.job.serial}` : ""}
        </dd>
      </dl>

      <div className="overflow-x-auto">
        <table className="w-full border-collapse text-left">
          <caption className="sr-only">Lines of invoice {inv.label}</caption>
          <thead className="border-b-2 border-line-strong">
            <tr>
              <th scope="col" className="py-2 pr-3 font-semibold">What</th>
              <th scope="col" className="py-2 pr-3 text-right font-semibold">Qty / hours</th>
              <th scope="col" className="py-2 pr-3 text-right font-semibold">Price</th>
              <th scope="col" className="py-2 text-right font-semibold">Amount</th>
              {lineAction ? (
                <th scope="col" className="print-hide py-2 pl-2">
                  <span className="sr-only">Change</span>
                </th>
              ) : null}
            </tr>
          </thead>
          <tbody className="divide-y divide-line">
            {inv.lines.map((l) => {
              const d = lineDetail(l, inv.currency);
              return (
                <tr key={l.id} data-testid="invoice-line" className="align-top">
                  <td className="py-2 pr-3">
                    <span className="font-medium text-ink">{l.description}</span>
                    <span className="block text-sm text-ink-muted">
                      {LINE_KIND_LABEL[l.kind]}
                      {l.partNumber ? ` · part ${l.partNumber}` : ""}
                      {l.taxable ? " · taxed" : ""}
                      {l.source === "added" ? " · added on the invoice" : ""}
                      {l.source === "core_charge" || l.source === "core_credit" ? ` · ${LINE_SOURCE_LABEL[l.source].toLowerCase()}` : ""}
                    </span>
                    {l.flagged ? (
                      <Badge tone="signal" icon={CircleAlert} className="mt-1">
                        Over what was authorised: not charged
                      </Badge>
                    ) : null}
                  </td>
                  <td className="py-2 pr-3 text-right tabular-nums">{d.qty}</td>
                  <td className="py-2 pr-3 text-right tabular-nums">{d.price}</td>
                  <td className="py-2 text-right tabular-nums">{l.flagged ? <s aria-label={`${m(l.grossMinor)}, not charged`}>{m(l.grossMinor)}</s> : m(l.netMinor)}</td>
                  {lineAction ? <td className="print-hide py-1 pl-2 text-right">{lineAction(l)}</td> : null}
                </tr>
              );
            })}
          </tbody>
        </table>
      </div>
      {view.linesWithdrawn.length ? (
        <p className="print-hide text-sm" data-testid="lines-withdrawn">
          <span className="font-semibold">Approved but not billed, its part gone from this job:</span> {view.linesWithdrawn.map((w) => withdrawnText(w, formatWhen(w.at, tz))).join(" ")}
        </p>
      ) : null}

      <table className="ml-auto w-full max-w-sm border-collapse" data-testid="invoice-totals">
        <caption className="sr-only">Totals</caption>
        <tbody>
          {rows.map(([label, value, strong]) => (
            <tr key={label} className={strong ? "border-t border-line-strong font-bold text-ink" : undefined}>
              <th scope="row" className={`py-1 pr-3 text-left ${strong ? "font-bold" : "font-normal"}`}>
                {label}
              </th>
              <td className="whitespace-nowrap py-1 text-right tabular-nums" data-testid={label === "Balance due" ? "balance-due" : label === "Total" ? "invoice-total" : undefined}>
                {value}
              </td>
            </tr>
          ))}
        </tbody>
      </table>

      {view.payments.length ? (
        <section aria-labelledby="payments-heading" className="break-inside-avoid">
          <h3 id="payments-heading" className="text-lg font-bold text-ink">Payments</h3>
          <ul className="mt-2 divide-y divide-line">
            {view.payments.map((p) => (
              <li key={p.id} className="flex flex-wrap justify-between gap-2 py-2">
                <span>
                  <span className="font-semibold tabular-nums">{p.receipt}</span> · {PAYMENT_KIND_LABEL[p.kind]}
                  {p.forPart ? ` for ${p.forPart}` : ""} · {PAYMENT_METHOD_LABEL[p.method]}
                  {p.reference ? ` · ${p.reference}` : ""} · <time dateTime={p.receivedAt}>{formatWhen(p.receivedAt, tz)}</time>
                </span>
                <span className="tabular-nums">{p.kind === "refund" ? `−${m(p.amountMinor)}` : m(p.amountMinor)}</span>
              </li>
            ))}
          </ul>
        </section>
      ) : null}

      {inv.returnedPartsNote ? (
        <section aria-labelledby="parts-heading" className="break-inside-avoid">
          <h3 id="parts-heading" className="text-lg font-bold text-ink">Replaced parts</h3>
          <p className="whitespace-pre-line">{inv.returnedPartsNote}</p>
        </section>
      ) : null}
      {inv.note ? <p className="whitespace-pre-line">{inv.note}</p> : null}

      <AuthorisationRecord record={view.record} timeZone={tz} headingLevel={3} />
      {children ? <div className="print-hide">{children}</div> : null}
    </article>
  );
}
