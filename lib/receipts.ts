import { formatJobNumber } from "@/lib/schemas/jobs";

// The shop's own numbers for money that moved. Payments have no number column, so one is derived:
// the job's number and the payment's place among that job's payments, deposits and refunds in the
// order they were recorded (row id). Rows are never deleted or renumbered, so a number, once shown
// or mailed, stays the same. The payments service's ids (pi_…, ch_…, re_…, cs_…) stay for staff.

/** "J-0005-R2": the second sum of money recorded on job J-0005. */
export function formatReceiptNumber(jobNumber: number, sequence: number): string {
  if (!Number.isInteger(sequence) || sequence < 1) throw new RangeError(`receipt sequence must be a whole number from 1, got ${sequence}`);
  return `${formatJobNumber(jobNumber)}-R${sequence}`;
}

/** Every payment of one job → its receipt number. Pass all of the job's payments, in any order. */
export function receiptNumbers(jobNumber: number, payments: readonly { id: number }[]): Map<number, string> {
  const ids = [...new Set(payments.map((p) => p.id))].sort((a, b) => a - b);
  return new Map(ids.map((id, i) => [id, formatReceiptNumber(jobNumber, i + 1)]));
}

// Ids the payments service makes: a short lower-case prefix, an underscore (cs_ may add test_/live_)
// and a long run of letters and digits. Staff-typed references ("cheque 1042") don't look like this.
const SERVICE_ID = /\b(?:pi|ch|re|py|pyr|cs|txn|in|evt|seti|src|card|pm)_(?:test_|live_)?[A-Za-z0-9]{8,}\b/;

/** True when a reference holds one of the payments service's raw ids. */
export function holdsServiceId(reference: string): boolean {
  return SERVICE_ID.test(reference);
}

/**
 * The reference a job's owner may read: a staff-typed one (cheque number, refund reason) as it
 * is; nothing when it is, or holds, an id of the payments service.
 */
export function ownerReference(p: { reference: string | null; providerPaymentId?: string | null; providerRefundId?: string | null }): string | null {
  const ref = p.reference?.trim();
  if (!ref) return null;
  if (ref === p.providerPaymentId || ref === p.providerRefundId || holdsServiceId(ref)) return null;
  return ref;
}
