import { Ban, CircleCheck, HandCoins, Receipt, Undo2 } from "lucide-react";
import { type PaymentMethod, isInvoiceEntryBody, isPaymentEntryBody } from "@/lib/invoices";
import type { TimelineEntry } from "@/lib/journal";

// Timeline entries of kinds "invoice" and "payment". Their bodies hold no amounts: followers never
// read them, and the amounts live on the invoice page, which only the job's owner and the desk open.

const plain = "flex items-start gap-2 font-semibold text-ink";
const icon = "mt-0.5 size-5 shrink-0";
const HOW: Record<PaymentMethod, string> = { online: "online", cash: "in cash", card_terminal: "by card at the counter", cheque: "by cheque" };

export function MoneyEntryBody({ entry }: { entry: Pick<TimelineEntry, "kind" | "body"> }) {
  const b = entry.body;
  if (entry.kind === "invoice" && isInvoiceEntryBody(b)) {
    return b.event === "issued" ? (
      <p className={plain}>
        <Receipt aria-hidden className={`${icon} text-oil`} />
        <span>Invoice {b.number} is ready: see it from the job page.</span>
      </p>
    ) : (
      <p className={plain}>
        <Ban aria-hidden className={`${icon} text-rust`} />
        <span>Invoice {b.number} was cancelled by the shop.</span>
      </p>
    );
  }
  if (entry.kind === "payment" && isPaymentEntryBody(b)) {
    const how = b.method ? ` ${HOW[b.method]}` : "";
    const words = {
      paid_in_full: { Icon: CircleCheck, tone: "text-moss", text: `${b.number ? `Invoice ${b.number}` : "The invoice"} is paid in full${how}.` },
      part_paid: { Icon: HandCoins, tone: "text-oil", text: `Part payment received${how}${b.number ? ` on invoice ${b.number}` : ""}.` },
      deposit_paid: { Icon: HandCoins, tone: "text-oil", text: `Parts deposit received${how}.` },
      deposit_requested: { Icon: HandCoins, tone: "text-brass", text: "The shop asked for a parts deposit." },
      refunded: { Icon: Undo2, tone: "text-ink-muted", text: `Refund sent${how}.` },
    }[b.event];
    return (
      <p className={plain}>
        <words.Icon aria-hidden className={`${icon} ${words.tone}`} />
        <span>{words.text}</span>
      </p>
    );
  }
  return null;
}
