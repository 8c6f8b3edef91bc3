import "server-only";
import type { Knex } from "knex";
import { db } from "@/db/client";
import type { DropoffAuthorisationsTable } from "@/db/tables";
import type { DropoffMethod, DropoffSnapshot } from "@/lib/dropoff";

// The authorisation signed at drop-off (migration 19): one row per job. Writes take the caller's
// transaction; the signature is written by one conditional UPDATE, so of two answers at once the
// database keeps exactly one.

type JobKey = { shopId: number; jobId: number };
const iso = (v: Date | null) => v?.toISOString() ?? null;
// A drop-off authorisation's public id has the same form as a request's (16 url-safe characters).
export { newRequestPublicId as newDropoffPublicId } from "@/db/queries/approvals";

export type DropoffRow = {
  id: number;
  publicId: string;
  shopId: number;
  jobId: number;
  snapshot: DropoffSnapshot;
  canonical: string;
  hash: string;
  currency: string;
  diagnosisMinor: number;
  authorisedUpToMinor: number;
  createdBy: string | null;
  createdAt: string;
  sentTo: string | null;
  sentAt: string | null;
  signature: null | {
    method: DropoffMethod;
    signatureName: string;
    wantsPartsBack: boolean;
    signedAt: string;
    shownHash: string;
    ip: string | null;
    userAgent: string | null;
    recordedBy: string | null;
  };
};

type Join = DropoffAuthorisationsTable & { created_by_name: string | null; recorded_by_name: string | null };

function toRow(r: Join): DropoffRow {
  return {
    id: Number(r.id),
    publicId: String(r.public_id),
    shopId: Number(r.shop_id),
    jobId: Number(r.job_id),
    snapshot: (typeof r.snapshot === "string" ? JSON.parse(r.snapshot) : r.snapshot) as DropoffSnapshot,
    canonical: String(r.canonical),
    hash: String(r.hash),
    currency: String(r.currency),
    diagnosisMinor: Number(r.diagnosis_minor),
    authorisedUpToMinor: Number(r.authorised_up_to_minor),
    createdBy: r.created_by_name ?? null,
    createdAt: iso(r.created_at)!,
    sentTo: r.sent_to ?? null,
    sentAt: iso(r.sent_at),
    signature:
      r.signed_at && r.method
        ? {
            method: r.method,
            signatureName: String(r.signature_name),
            wantsPartsBack: !!r.wants_parts_back,
            signedAt: iso(r.signed_at)!,
            shownHash: String(r.shown_hash),
            ip: r.ip ?? null,
            userAgent: r.user_agent ?? null,
            recordedBy: r.recorded_by_name ?? null,
          }
        : null,
  };
}

/** The job's drop-off authorisation, signed or not; `lock` takes the row for update in `k`. */
export async function getDropoff({ shopId, jobId }: JobKey, k?: Knex, lock = false): Promise<DropoffRow | null> {
  const q = (k ?? db())("dropoff_authorisations as d")
    .leftJoin("users as cu", "cu.id", "d.created_by_user_id")
    .leftJoin("users as ru", "ru.id", "d.recorded_by_user_id")
    .where({ "d.shop_id": shopId, "d.job_id": jobId })
    .first<Join | undefined>("d.*", "cu.name as created_by_name", "ru.name as recorded_by_name");
  const row = await (lock ? q.forUpdate() : q);
  return row ? toRow(row) : null;
}

export type DropoffDraft = JobKey & { publicId: string; snapshot: DropoffSnapshot; canonical: string; hash: string; userId: number };

/** Writes the unsigned authorisation: a new row, or the job's unsigned one redone (its mail state cleared). */
export async function saveDropoff(tx: Knex.Transaction, d: DropoffDraft, existingId: number | null): Promise<void> {
  const content = {
    snapshot: JSON.stringify(d.snapshot),
    canonical: d.canonical,
    hash: d.hash,
    currency: d.snapshot.currency,
    diagnosis_minor: d.snapshot.diagnosis.netMinor,
    authorised_up_to_minor: d.snapshot.authorisedUpToMinor,
    created_by_user_id: d.userId,
  };
  if (existingId == null) {
    await tx("dropoff_authorisations").insert({ ...content, public_id: d.publicId, shop_id: d.shopId, job_id: d.jobId });
    return;
  }
  await tx("dropoff_authorisations")
    .where({ shop_id: d.shopId, id: existingId })
    .whereNull("signed_at")
    .update({ ...content, sent_to: null, sent_at: null, updated_at: tx.fn.now(3) });
}

export async function markDropoffSent(tx: Knex.Transaction, { shopId, id, to }: { shopId: number; id: number; to: string }): Promise<void> {
  await tx("dropoff_authorisations").where({ shop_id: shopId, id }).update({ sent_to: to, sent_at: tx.fn.now(3) });
}

export type DropoffSignature = {
  shopId: number;
  id: number;
  shownHash: string;
  method: DropoffMethod;
  signatureName: string;
  wantsPartsBack: boolean;
  ip: string | null;
  userAgent: string | null;
  recordedByUserId: number;
};

/**
 * Signs the authorisation if it is still unsigned and still the text that was shown. Returns
 * whether this call signed it (false: signed already, or changed meanwhile).
 */
export async function signDropoff(tx: Knex.Transaction, s: DropoffSignature): Promise<boolean> {
  const n = await tx("dropoff_authorisations")
    .where({ shop_id: s.shopId, id: s.id, hash: s.shownHash })
    .whereNull("signed_at")
    .update({
      method: s.method,
      signature_name: s.signatureName,
      wants_parts_back: s.wantsPartsBack,
      signed_at: tx.fn.now(3),
      shown_hash: s.shownHash,
      ip: s.ip,
      user_agent: s.userAgent ? s.userAgent.slice(0, 500) : null,
      recorded_by_user_id: s.recordedByUserId,
    });
  return n === 1;
}
