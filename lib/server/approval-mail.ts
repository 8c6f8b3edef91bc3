import "server-only";
import type { Tx } from "@/db/transaction";
import { cancelQueuedMail } from "@/db/queries/approvals";
import { cancelQueuedText } from "@/db/queries/texts";
import { enqueueMail } from "@/db/queries/outbox";
import type { RequestSnapshot } from "@/lib/approvals";
import { appUrl } from "@/lib/server/config";
import { reminderTextKey } from "@/lib/texts";
import { renderApprovalMail } from "@/lib/server/emails/approval-request";

// The request e-mail and its one reminder, queued in the outbox inside the send's transaction:
// both exist exactly when the request does. The reminder waits the shop's delay and is dropped
// when the request is answered, withdrawn or replaced.

const HOUR = 3_600_000;
export const requestMailKey = (requestPublicId: string) => `approval:${requestPublicId}`;
export const reminderMailKey = (requestPublicId: string) => `approval-reminder:${requestPublicId}`;

/** Where the owner answers; signed-out visitors are sent to sign in and brought back here. */
export function answerPath(jobPublicId: string, requestPublicId: string): string {
  return `/my/jobs/${jobPublicId}/approvals/${requestPublicId}`;
}

/**
 * Thumbnail address for the e-mail: the request's mail token stands in for a session, and it
 * opens only the thumbnails that are evidence of this request (see the evidence route).
 */
export function mailThumbUrl(requestPublicId: string, photoPublicId: string, token: string): string {
  return `${appUrl()}/api/approvals/${requestPublicId}/evidence/${photoPublicId}/thumb?t=${token}`;
}

export async function queueRequestMail(
  tx: Tx,
  m: {
    shop: { id: number; name: string };
    to: string;
    ownerName: string;
    machine: string;
    jobNumber: string;
    jobPublicId: string;
    snapshot: RequestSnapshot;
    token: string;
    reminderDelayHours: number;
    now?: Date;
  },
): Promise<{ mailId: number; reminderId: number }> {
  const request = m.snapshot.request;
  const base = {
    shopName: m.shop.name,
    ownerName: m.ownerName,
    machine: m.machine,
    jobNumber: m.jobNumber,
    snapshot: m.snapshot,
    answerUrl: `${appUrl()}${answerPath(m.jobPublicId, request)}`,
    thumbnails: m.snapshot.evidence.filter((e) => e.kind === "photo").map((e, i) => ({ url: mailThumbUrl(request, e.ref, m.token), alt: e.label ?? `Photo ${i + 1} of what was found` })),
  };
  const first = await renderApprovalMail({ ...base, reminder: false });
  const mailId = await enqueueMail(tx, { shopId: m.shop.id, jobPublicId: m.jobPublicId, kind: "approval", to: m.to, ...first, dedupeKey: requestMailKey(request) });
  const again = await renderApprovalMail({ ...base, reminder: true });
  const sendAfter = new Date((m.now ?? new Date()).getTime() + m.reminderDelayHours * HOUR);
  const reminderId = await enqueueMail(tx, { shopId: m.shop.id, jobPublicId: m.jobPublicId, kind: "approval-reminder", to: m.to, ...again, sendAfter, dedupeKey: reminderMailKey(request) });
  return { mailId, reminderId };
}

/** The request is settled one way or another: its reminders (e-mail and text) must not go out. */
export async function cancelReminder(tx: Tx, { shopId, requestPublicId }: { shopId: number; requestPublicId: string }) {
  const text = await cancelQueuedText(tx, { shopId, dedupeKey: reminderTextKey(requestPublicId) });
  return (await cancelQueuedMail(tx, { shopId, dedupeKey: reminderMailKey(requestPublicId) })) || text;
}
