import "server-only";
import { getEvidencePhoto, getRequestIdByTokenHash } from "@/db/queries/approvals";
import { AppError } from "@/lib/errors";
import { PHOTO_ID_PATTERN, PHOTO_SIZES, type PhotoSize } from "@/lib/journal";
import type { Actor } from "@/lib/permissions";
import { REQUEST_PUBLIC_ID_PATTERN } from "@/lib/schemas/approvals";
import { sha256Hex } from "@/lib/server/approval-hash";
import { requestAccess } from "@/lib/server/approvals";
import { storage } from "@/lib/server/storage";

// Evidence photos of a request. Sending a request shows its evidence to the owner, so the owner
// sees these photos even when their journal entry is shop-only. In the e-mail the request's token
// stands in for a session (mail clients fetch images without our cookies): it opens thumbnails of
// that request's evidence only, for MAIL_THUMB_DAYS after sending — no prices, no answering.

export const MAIL_THUMB_DAYS = 30;

export async function evidencePhoto(p: { actor: Actor | null; requestPublicId: string; photoPublicId: string; size: string; token: string | null }) {
  const notFound = new AppError("not_found", "No such photo.");
  if (!REQUEST_PUBLIC_ID_PATTERN.test(p.requestPublicId) || !PHOTO_ID_PATTERN.test(p.photoPublicId) || !(PHOTO_SIZES as readonly string[]).includes(p.size)) throw notFound;
  let requestId: number;
  if (p.token) {
    if (p.size !== "thumb" || !/^[A-Za-z0-9_-]{43}$/.test(p.token)) throw notFound;
    const byToken = await getRequestIdByTokenHash({ tokenHash: sha256Hex(p.token) });
    const fresh = byToken && byToken.sentAt.getTime() + MAIL_THUMB_DAYS * 86_400_000 > Date.now();
    if (!byToken || !fresh || byToken.publicId !== p.requestPublicId) throw notFound;
    requestId = byToken.id;
  } else {
    if (!p.actor) throw new AppError("unauthenticated", "Sign in first.");
    requestId = (await requestAccess(p.actor, p.requestPublicId)).request.id;
  }
  const photo = await getEvidencePhoto({ requestId, photoPublicId: p.photoPublicId });
  if (!photo) throw notFound;
  const object = await storage().get((p.size as PhotoSize) === "thumb" ? photo.thumbKey : photo.displayKey);
  if (!object) throw notFound;
  return object;
}
