import "server-only";
import { getEvidencePhoto, getRequestIdByTokenHash } from "@/db/queries/approvals";
import { AppError } from "@/lib/errors";
import type { PhotoRouteSize } from "@/lib/journal";
import type { Actor } from "@/lib/permissions";
import { access } from "@/lib/server/access";
import { sha256Hex } from "@/lib/server/approval-hash";
import { photoRendition } from "@/lib/server/photos";

// Evidence photos of a request. Sending a request shows its evidence to the owner, so the owner
// sees these photos even when their journal entry is shop-only. In the e-mail the request's token
// stands in for a session (mail clients fetch images without our cookies): it opens thumbnails of
// that request's evidence only, for MAIL_THUMB_DAYS after sending — no prices, no answering.

export const MAIL_THUMB_DAYS = 30;

/**
 * The ids come checked from the route's params. With a token, no session is needed; without one,
 * it is the request's own rule (the job's staff and owner; others get a 404).
 */
export async function evidencePhoto(p: { actor: Actor | null; requestPublicId: string; photoPublicId: string; size: PhotoRouteSize; token: string | null }) {
  const notFound = new AppError("not_found", "No such photo.");
  let requestId: number;
  if (p.token) {
    if (p.size !== "thumb" || !/^[A-Za-z0-9_-]{43}$/.test(p.token)) throw notFound;
    const byToken = await getRequestIdByTokenHash({ tokenHash: sha256Hex(p.token) });
    const fresh = byToken && byToken.sentAt.getTime() + MAIL_THUMB_DAYS * 86_400_000 > Date.now();
    if (!byToken || !fresh || byToken.publicId !== p.requestPublicId) throw notFound;
    requestId = byToken.id;
  } else {
    if (!p.actor) throw new AppError("unauthenticated", "Sign in first.");
    requestId = (await access(p.actor, "request", p.requestPublicId, "job:view")).request.id;
  }
  const photo = await getEvidencePhoto({ requestId, photoPublicId: p.photoPublicId });
  if (!photo) throw notFound;
  const object = await photoRendition(photo, p.size);
  if (!object) throw notFound;
  return object;
}
