import "server-only";
import {
  backOrderPart,
  createPartOrder,
  getPartPrice,
  linkPartDeposit,
  listPartsOnOrder,
  lockPartForDeposit,
  ownerPartWaits,
  receivePartOrder,
  returnCore,
  setCoreCharge,
  setSpecialOrder,
} from "@/db/queries/part-orders";
import { type AfterMove, movePartToJob } from "@/db/queries/part-moves";
import { listNeededParts } from "@/db/queries/parts-needed";
import { getShopCurrency } from "@/db/queries/shops";
import { AppError } from "@/lib/errors";
import { currencyDigits, inputText, lineTotal } from "@/lib/money";
import { isLate, partWaitLines } from "@/lib/part-orders";
import type { Actor } from "@/lib/permissions";
import { formatJobNumber } from "@/lib/schemas/jobs";
import type { JobAccess, Resolved } from "@/lib/server/access";
import { positiveAmount, requestDeposit } from "@/lib/server/invoice-payments";
import { shopToday } from "@/lib/jobs-view";

// Ordering parts (issue 19): supplier orders across the shop's jobs, back-orders, moving a part
// that arrived to another job, core charges and the special-order deposit. Who may: "parts:manage"
// on the shop or job for parts; the deposit is money, so the caller checks "invoice:create".

export const PARTS_ON_ORDER_PAGE_SIZE = 25;


/** `jobId` limits the order to one job's parts (the bench page's form); null takes parts of any job of the shop. */
export async function orderParts(
  actor: Actor,
  scope: { shopId: number; jobId: number | null },
  input: { supplier: string; reference: string | null; orderedOn: string; expectedOn: string | null; parts: number[] },
) {
  if (input.expectedOn && input.expectedOn < input.orderedOn) throw new AppError("invalid", "The expected date can't be before the order date.", { expectedOn: ["Give a date on or after the order date."] });
  return createPartOrder({ ...scope, userId: actor.userId, supplier: input.supplier, reference: input.reference, orderedOn: input.orderedOn, expectedOn: input.expectedOn, partIds: input.parts });
}

export async function receiveOrder(actor: Actor, { shop }: Resolved<"shop">, input: { order: number }) {
  return { ...(await receivePartOrder({ shopId: shop.id, userId: actor.userId, orderId: input.order })), shop };
}

export async function backOrder(actor: Actor, { job }: JobAccess, input: { part: number; expectedOn: string | null }) {
  await backOrderPart({ shopId: job.shopId, jobId: job.id, userId: actor.userId, partId: input.part, expectedOn: input.expectedOn });
  return { job };
}

/** `to` is resolved by the caller with "parts:manage" too: both jobs must be the actor's shop's. */
export async function movePart(actor: Actor, from: JobAccess, to: JobAccess, input: { part: number; forWork: { findingId: number | null; noOkNeeded: boolean }; thisJob: AfterMove }) {
  if (from.job.shopId !== to.job.shopId) throw new AppError("invalid", "A part can only go to another job of the same shop.", { toJob: ["Choose a job of this shop."] });
  const made = await movePartToJob({
    shopId: from.job.shopId,
    userId: actor.userId,
    partId: input.part,
    fromJobId: from.job.id,
    toJobId: to.job.id,
    forWork: input.forWork,
    thisJob: input.thisJob,
    fromNumber: formatJobNumber(from.job.number),
    toNumber: formatJobNumber(to.job.number),
  });
  return { ...made, job: from.job };
}

export async function chargeCore(actor: Actor, { job }: JobAccess, input: { part: number; charge: string | null }) {
  const currency = await getShopCurrency({ shopId: job.shopId });
  const chargeMinor = input.charge ? positiveAmount(input.charge, currency, "charge") : null;
  await setCoreCharge({ shopId: job.shopId, jobId: job.id, userId: actor.userId, partId: input.part, chargeMinor });
  return { job };
}

export async function coreReturned(actor: Actor, { job }: JobAccess, input: { part: number }) {
  await returnCore({ shopId: job.shopId, jobId: job.id, userId: actor.userId, partId: input.part });
  return { job };
}

export async function markSpecialOrder(_actor: Actor, { job }: JobAccess, input: { part: number; special: boolean }) {
  await setSpecialOrder({ shopId: job.shopId, jobId: job.id, partId: input.part, special: input.special });
  return { job };
}

/**
 * A deposit asked before a special-order part is ordered, through the job's deposit requests: the
 * amount typed, or (left blank) the part's sell price × quantity, rounded as an invoice line is.
 */
export async function askPartDeposit(actor: Actor, access: JobAccess, input: { part: number; amount: string | null; note: string | null }) {
  const key = { shopId: access.job.shopId, jobId: access.job.id, partId: input.part };
  let amount = input.amount;
  if (amount === null) {
    const price = await getPartPrice(key);
    if (!price) throw new AppError("not_found", "That part isn't on this job.");
    if (price.sellMinor === null) throw new AppError("invalid", "This part has no sell price yet: type the deposit amount.", { amount: ["Type the amount: the part has no sell price yet."] });
    const currency = await getShopCurrency({ shopId: key.shopId });
    const minor = lineTotal({ kind: "part", qtyThousandths: price.qtyThousandths, unitPriceMinor: price.sellMinor, taxable: false });
    const digits = currencyDigits(currency);
    amount = inputText((minor / 10 ** digits).toFixed(digits), currency);
  }
  let description = "";
  const made = await requestDeposit(actor, access, { job: access.job.publicId, amount, note: input.note, request: null }, async (tx, depositId) => {
    ({ description } = await lockPartForDeposit(tx, key));
    await linkPartDeposit(tx, { shopId: key.shopId, partId: key.partId, depositId });
  });
  return { ...made, part: description };
}

/** What the owner's page says about parts on the way for their cleared work. */
export async function ownerPartWaitLines(key: { shopId: number; jobId: number }): Promise<string[]> {
  return partWaitLines(await ownerPartWaits(key));
}

/** The most parts one order form offers (the order schema takes at most 100). */
export const ORDER_FORM_MAX_PARTS = 100;

/** What the parts page's order form offers: needed parts of any of the shop's jobs, oldest first. */
export async function neededPartsToOrder(shop: { id: number; timezone: string | null }) {
  return { ...(await listNeededParts({ shopId: shop.id, limit: ORDER_FORM_MAX_PARTS })), today: shopToday(shop.timezone ?? "UTC") };
}

export async function partsOnOrderPage(shop: { id: number; timezone: string | null }, page: number) {
  const today = shopToday(shop.timezone ?? "UTC");
  const found = await listPartsOnOrder({ shopId: shop.id, today, page, pageSize: PARTS_ON_ORDER_PAGE_SIZE });
  return { ...found, today, rows: found.rows.map((r) => ({ ...r, late: isLate(r.expectedOn, today) })) };
}
