import { ActionButton } from "@/components/bench/action-form";
import { Card } from "@/components/ui";
import type { PartRow } from "@/db/queries/bench-parts";
import { listPartOrderFacts } from "@/db/queries/part-orders";
import { PART_STATUS_LABEL } from "@/lib/bench";
import { currencyDigits, formatMoney } from "@/lib/money";
import { coreReturnedAction, specialOrderAction } from "../part-order-actions";
import { BackOrderForm, CoreChargeForm, MovePartForm, OrderPartsForm, PartDepositForm } from "./part-order-forms";

/** mayMoney: the desk (invoice:create): core charge amounts and deposits; technicians see that a core is owed, not what. */
type Props = { jobPublicId: string; shopId: number; jobId: number; parts: PartRow[]; currency: string; today: string; mayMoney: boolean };

/** "25.00": the amount as typed back into the form. */
const plain = (minor: number, currency: string) => (minor / 10 ** currencyDigits(currency)).toFixed(currencyDigits(currency));

const DEPOSIT_TEXT = { open: "Deposit asked, not paid yet", paid: "Deposit paid", cancelled: "Deposit cancelled" } as const;

/**
 * Ordering for this job's parts (issue 19): put needed parts on a supplier order, back-orders,
 * moving a part that arrived to another job, core charges and special-order deposits. Shown to
 * those who manage parts; one query beside the parts list.
 */
export async function PartOrdering({ jobPublicId, shopId, jobId, parts, currency, today, mayMoney }: Props) {
  if (!parts.length) return null;
  const facts = new Map((await listPartOrderFacts({ shopId, jobId })).map((f) => [f.partId, f]));
  const needed = parts.filter((p) => p.status === "needed");
  return (
    <Card as="section" title="Ordering" headingId="ordering" description="Supplier orders, back-orders, cores and special-order deposits. The shop's whole list is under Parts on order.">
      <div className="space-y-4">
        {needed.length ? <OrderPartsForm jobPublicId={jobPublicId} needed={needed.map((p) => ({ id: p.id, description: p.description }))} today={today} /> : null}
        <ul className="space-y-3" aria-label="Ordering per part">
          {parts.map((p) => {
            const f = facts.get(p.id);
            const core = f?.coreChargeMinor ?? null;
            return (
              <li key={p.id} className="space-y-2 rounded-lg border border-line p-3">
                <p className="font-semibold text-ink">
                  {p.description} <span className="font-normal text-ink-muted">· {PART_STATUS_LABEL[p.status]}</span>
                </p>
                {f?.reference ? <p className="text-sm">Order ref. {f.reference}</p> : null}
                {f?.lastNote ? <p className="text-sm text-ink-muted">{f.lastNote}</p> : null}
                {p.status === "ordered" || p.status === "back_ordered" ? <BackOrderForm jobPublicId={jobPublicId} partId={p.id} description={p.description} /> : null}
                {p.status === "received" ? <MovePartForm jobPublicId={jobPublicId} partId={p.id} description={p.description} /> : null}
                {core !== null ? (
                  <p className="text-sm">
                    {mayMoney ? `Core charge ${formatMoney(core, currency)}` : "Core charge on this part"}
                    {f?.coreReturned ? " · core returned: refunded as a credit" : " · refunded when the old part goes back"}
                  </p>
                ) : null}
                {mayMoney && !f?.coreReturned ? <CoreChargeForm jobPublicId={jobPublicId} partId={p.id} currency={currency} current={core === null ? "" : plain(core, currency)} /> : null}
                {core !== null && !f?.coreReturned ? (
                  <ActionButton action={coreReturnedAction} fields={{ job: jobPublicId, part: String(p.id) }} done="Core returned: its charge is refunded on the invoice.">
                    Core returned
                  </ActionButton>
                ) : null}
                {p.status === "needed" ? (
                  <ActionButton action={specialOrderAction} fields={{ job: jobPublicId, part: String(p.id), special: f?.specialOrder ? "0" : "1" }}>
                    {f?.specialOrder ? "Not a special order" : "Mark as special order"}
                  </ActionButton>
                ) : null}
                {f?.specialOrder ? <p className="text-sm">Special order{f.depositStatus ? ` · ${DEPOSIT_TEXT[f.depositStatus]}` : ""}</p> : null}
                {f?.specialOrder && p.status === "needed" && mayMoney && (f.depositStatus === null || f.depositStatus === "cancelled") ? (
                  <PartDepositForm jobPublicId={jobPublicId} partId={p.id} currency={currency} />
                ) : null}
              </li>
            );
          })}
        </ul>
      </div>
    </Card>
  );
}
