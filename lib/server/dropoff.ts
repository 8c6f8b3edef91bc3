import "server-only";
import { type DropoffRow, getDropoff, markDropoffSent, newDropoffPublicId, saveDropoff, signDropoff } from "@/db/queries/dropoff";
import { getMoneySettings } from "@/db/queries/findings";
import { lockJobForRequest } from "@/db/queries/jobs";
import { enqueueMail } from "@/db/queries/outbox";
import { lockJobRow } from "@/db/queries/workflow";
import { getDropoffStandard } from "@/db/queries/shop-settings";
import { type Tx, transaction } from "@/db/transaction";
import type { ShopMoneySettings } from "@/lib/approvals";
import { DEFAULT_DIAGNOSIS_DESCRIPTION, type DiagnosisCharge, type DropoffMethod, buildDropoffSnapshot, dropoffCanonical } from "@/lib/dropoff";
import { AppError } from "@/lib/errors";
import { describeMachine } from "@/lib/machine";
import { parseHours, parseMoney } from "@/lib/money";
import type { Actor } from "@/lib/permissions";
import type { DropoffFieldsInput, DropoffSignatureInput } from "@/lib/schemas/dropoff";
import { formatJobNumber } from "@/lib/schemas/jobs";
import type { JobAccess } from "@/lib/server/access";
import { sha256Hex } from "@/lib/server/approval-hash";
import { appUrl } from "@/lib/server/config";
import { renderDropoffMail } from "@/lib/server/emails/dropoff-authorisation";
import { recordInboxEvent } from "@/lib/server/inbox";

// The authorisation signed at drop-off (REFERENCES §6: a written estimate, and consent before
// work and before any charge above it). The desk prepares it; the owner signs it once, at the
// counter (typed name on the desk's screen) or online from the e-mailed link. Every change locks
// the job row, then the authorisation row, in that order (as invoices do), and signing is one
// conditional UPDATE: a second or concurrent answer finds it signed and is refused.

export const dropoffPath = (jobPublicId: string) => `/my/jobs/${jobPublicId}/authorisation`;

/** A field's text as money or hours, with the message beside that field when it can't be read. */
function read<T>(field: string, parse: () => T): T {
  try {
    return parse();
  } catch (error) {
    const message = error instanceof Error ? error.message : "This can't be read.";
    throw new AppError("invalid", message, { [field]: [message] });
  }
}

/** Whether the stored text still hashes to the stored hash and the snapshot still gives that text. */
export function dropoffIntact(row: Pick<DropoffRow, "snapshot" | "canonical" | "hash">): boolean {
  return sha256Hex(row.canonical) === row.hash && dropoffCanonical(row.snapshot) === row.canonical;
}

/** The desk writes (or, while unsigned, redoes) the job's drop-off authorisation. */
export async function prepareDropoff(actor: Actor, { job }: JobAccess, input: DropoffFieldsInput) {
  return writeDropoff(actor, job, async ({ locked, settings }) => {
    const currency = locked.currency;
    let diagnosis: DiagnosisCharge;
    if (input.chargeKind === "amount") {
      const amountMinor = read("chargeAmount", () => parseMoney(input.chargeAmount || "0", currency));
      diagnosis = { kind: "fee", description: input.description, amountMinor, taxable: settings.taxable.fee };
    } else {
      const hoursTenths = read("chargeHours", () => parseHours(input.chargeHours, currency));
      if (hoursTenths <= 0) throw new AppError("invalid", "Enter the labour time.", { chargeHours: ["Enter the time in hours, e.g. 0.5."] });
      if (settings.labourRateMinor == null) throw new AppError("invalid", "The shop has no labour rate yet.", { chargeHours: ["The shop has no labour rate set: enter an amount instead."] });
      diagnosis = { kind: "labour", description: input.description, hoursTenths, rateMinor: settings.labourRateMinor, taxable: settings.taxable.labour };
    }
    const authorisedUpToMinor = read("authorisedUpTo", () => parseMoney(input.authorisedUpTo, currency));
    return { diagnosis, authorisedUpToMinor, terms: input.terms };
  });
}

/**
 * Anyone at the counter (a technician checking a machine in included) puts the shop's standard
 * terms (shop settings) up for the owner to sign: nothing typed, so no money is chosen by them.
 */
export async function prepareStandardDropoff(actor: Actor, { job }: JobAccess) {
  return writeDropoff(actor, job, async ({ tx, settings }) => {
    const standard = await getDropoffStandard({ shopId: job.shopId }, tx);
    if (!standard) throw new AppError("invalid", "The shop has no standard drop-off terms yet: the shop owner sets them in the shop settings, or the desk types them for this job.");
    const diagnosis: DiagnosisCharge = { kind: "fee", description: DEFAULT_DIAGNOSIS_DESCRIPTION, amountMinor: standard.chargeMinor, taxable: settings.taxable.fee };
    return { diagnosis, authorisedUpToMinor: standard.upToMinor, terms: null };
  });
}

type Terms = { diagnosis: DiagnosisCharge; authorisedUpToMinor: number; terms: string | null };
type Locked = NonNullable<Awaited<ReturnType<typeof lockJobForRequest>>>;

/** Locks the job, refuses a signed authorisation, and seals the terms `make` gives as the new version. */
async function writeDropoff(actor: Actor, job: JobAccess["job"], make: (c: { tx: Tx; locked: Locked; settings: ShopMoneySettings }) => Promise<Terms>) {
  return transaction(async (tx) => {
    const key = { shopId: job.shopId, jobId: job.id };
    const locked = await lockJobForRequest(tx, key);
    if (!locked) throw new AppError("not_found", "No such job.");
    const existing = await getDropoff(key, tx, true);
    if (existing?.signature) throw new AppError("conflict", "The owner has already signed the drop-off authorisation; it can't be changed. Further work needs an approval request.");
    const settings = await getMoneySettings({ shopId: job.shopId }, tx);
    const { diagnosis, authorisedUpToMinor, terms } = await make({ tx, locked, settings });
    const publicId = existing?.publicId ?? newDropoffPublicId();
    const snapshot = buildDropoffSnapshot({
      authorisation: publicId,
      job: job.publicId,
      shop: locked.shopName,
      machine: describeMachine(job.machine),
      owner: locked.customerName,
      currency: locked.currency,
      diagnosis,
      authorisedUpToMinor,
      terms,
    });
    const canonical = dropoffCanonical(snapshot);
    await saveDropoff(tx, { ...key, publicId, snapshot, canonical, hash: sha256Hex(canonical), userId: actor.userId }, existing?.id ?? null);
    return { job, hash: sha256Hex(canonical) };
  });
}

/** Mails the owner a link to sign online. */
export async function sendDropoffLink(actor: Actor, { job }: JobAccess) {
  return transaction(async (tx) => {
    const key = { shopId: job.shopId, jobId: job.id };
    const locked = await lockJobForRequest(tx, key);
    const row = await getDropoff(key, tx, true);
    if (!locked || !row) throw new AppError("invalid", "Prepare the drop-off authorisation first.");
    if (row.signature) throw new AppError("conflict", "The owner has already signed it.");
    if (!locked.customerEmail) throw new AppError("invalid", "This owner has no e-mail address: have them sign at the counter, or add their address first.");
    const mail = await renderDropoffMail({ snapshot: row.snapshot, jobNumber: formatJobNumber(job.number), signUrl: `${appUrl()}${dropoffPath(job.publicId)}` });
    // One mail per version of the text: sending the same version twice queues it once.
    await enqueueMail(tx, { shopId: job.shopId, jobPublicId: job.publicId, kind: "dropoff-authorisation", to: locked.customerEmail, ...mail, dedupeKey: `dropoff:${row.publicId}:${row.hash.slice(0, 16)}` });
    await markDropoffSent(tx, { shopId: job.shopId, id: row.id, to: locked.customerEmail });
    return { job, to: locked.customerEmail };
  });
}

type Sign = DropoffSignatureInput & { method: DropoffMethod; ip: string | null; userAgent: string | null };

async function sign(actor: Actor, { job }: JobAccess, s: Sign): Promise<DropoffRow> {
  const key = { shopId: job.shopId, jobId: job.id };
  await transaction(async (tx) => {
    await lockJobRow(tx, key);
    const row = await getDropoff(key, tx, true);
    if (!row) throw new AppError("not_found", "There is no drop-off authorisation on this job yet.");
    if (row.signature) throw new AppError("conflict", `This authorisation was already signed by ${row.signature.signatureName}; the first signature stands.`);
    if (!dropoffIntact(row)) throw new AppError("conflict", "This authorisation's record no longer matches what was prepared. Ask the shop to prepare it again.");
    if (row.hash !== s.shownHash) throw new AppError("conflict", "The shop changed the authorisation since it was opened. Read the new version and sign again.");
    const signed = await signDropoff(tx, {
      shopId: job.shopId,
      id: row.id,
      shownHash: s.shownHash,
      method: s.method,
      signatureName: s.signature,
      wantsPartsBack: s.wantsPartsBack,
      ip: s.ip,
      userAgent: s.userAgent,
      recordedByUserId: actor.userId,
    });
    if (!signed) throw new AppError("conflict", "This authorisation was signed meanwhile; the first signature stands.");
    if (s.method === "online") {
      await recordInboxEvent(tx, {
        shopId: job.shopId,
        jobId: job.id,
        kind: "owner_answered",
        actorUserId: actor.userId,
        summary: `${s.signature} signed the drop-off authorisation`,
        amountMinor: row.authorisedUpToMinor,
        currency: row.currency,
        extra: { dropoff: row.publicId, method: s.method, by: s.signature },
      });
    }
  });
  return (await getDropoff(key))!;
}

/** The owner signs on the desk's screen; the staff member at the desk is recorded with it. */
export async function signDropoffAtCounter(actor: Actor, found: JobAccess, input: DropoffSignatureInput) {
  return { job: found.job, dropoff: await sign(actor, found, { ...input, method: "in_person", ip: null, userAgent: null }) };
}

/** The owner signs online, signed in, from the e-mailed link. */
export async function signDropoffOnline(actor: Actor, found: JobAccess, input: DropoffSignatureInput, meta: { ip: string | null; userAgent: string | null }) {
  return { job: found.job, dropoff: await sign(actor, found, { ...input, method: "online", ...meta }) };
}
