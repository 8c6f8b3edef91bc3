import "server-only";
import { type CoreRow, listCores } from "@/db/queries/part-orders";
import type { Tx } from "@/db/transaction";
import type { InvoiceLine } from "@/lib/invoices";
import { BILLABLE_PART } from "@/lib/server/authorised-work";

// The invoice lines a job's cores make (issue 19): apart from the part orders' actions so the
// invoice code can read them without importing deposits and payments (no import cycle).

/**
 * The invoice's core lines for a job: the core charge of each part in the machine (fitted, or fitted
 * and its old one handed back: billed like the part itself), and a credit line of the same amount
 * once the old core went back to the supplier (the whole charge comes back: common trade practice,
 * no published source). Taxed as the shop's parts are by default: a core charge is part of the
 * part's price where the part is taxed (from memory, unverified; the desk can untick it).
 */
export async function coreLinesOf(key: { shopId: number; jobId: number }, taxable: boolean, k?: Tx): Promise<InvoiceLine[]> {
  const line = (c: CoreRow, source: "core_charge" | "core_credit", description: string): InvoiceLine => ({
    kind: "fee",
    description,
    partNumber: null,
    qtyThousandths: null,
    unitPriceMinor: null,
    hoursTenths: null,
    rateMinor: null,
    amountMinor: c.chargeMinor,
    taxable,
    source,
    requestPublicId: null,
    requestLineNo: null,
    partId: c.partId,
  });
  return (await listCores(key, k))
    .filter((c) => BILLABLE_PART.includes(c.status))
    .flatMap((c) => [line(c, "core_charge", `Core charge: ${c.description}`), ...(c.returned ? [line(c, "core_credit", `Core returned: ${c.description}`)] : [])]);
}
