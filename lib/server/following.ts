import "server-only";
import {
  followerUserIds,
  getOwnSubscription,
  inviteFollower,
  listSubscribers,
  removeFollower,
  setFrequency,
  subscribeOwner,
  unsubscribe,
} from "@/db/queries/following";
import { getJobByPublicId } from "@/db/queries/jobs";
import { AppError } from "@/lib/errors";
import type { Frequency } from "@/lib/following";
import { JOB_PUBLIC_ID_PATTERN, type TimelineAudience } from "@/lib/journal";
import { type Action, type Actor, type Resource, can, rolesFor } from "@/lib/permissions";
import { authorize } from "@/lib/server/authorize";
import { db } from "@/lib/server/db";
import { readUnsubscribeToken } from "@/lib/server/signed-token";

type JobKey = { id: number; shopId: number; customerUserId: number | null };

/**
 * The job as a permission resource. Followers are looked up only for someone who is neither
 * the shop's staff nor the owner, so their pages pay no extra query.
 */
export async function jobResource(actor: Actor | null, job: JobKey): Promise<Resource> {
  const base: Resource = { shopId: job.shopId, customerUserId: job.customerUserId };
  if (!actor || can(actor, "job:view", base)) return base;
  return { ...base, followerUserIds: await followerUserIds({ jobId: job.id }) };
}

/** Which timeline this person reads: the shop's, the owner's, or a follower's (no money, no decisions). */
export function audienceFor(actor: Actor, resource: Resource): TimelineAudience {
  if (can(actor, "journal:view-shop-only", resource)) return "shop";
  return rolesFor(actor, resource).includes("customer") ? "owner" : "follower";
}

/** The job and the resource, or the same 404 for an unknown job and someone else's. */
export async function followingAccess(actor: Actor, publicId: string, action: Action) {
  const job = JOB_PUBLIC_ID_PATTERN.test(publicId) ? await getJobByPublicId({ publicId }) : null;
  const resource = job && (await jobResource(actor, job));
  if (!job || !resource || !can(actor, "job:view", resource)) throw new AppError("not_found", "No such job, or it isn't yours to see.");
  authorize(actor, action, resource);
  return { job, resource };
}

/** The owner invites someone by e-mail; the invitation goes out through the outbox at the next sweep. */
export async function inviteFollowerAs(actor: Actor, publicId: string, email: string) {
  const { job } = await followingAccess(actor, publicId, "job:follow-manage");
  if (email.toLowerCase() === actor.email.toLowerCase()) {
    throw new AppError("conflict", "That's your own address: you already follow this job.", { email: ["That's your own address."] });
  }
  const id = await inviteFollower({ shopId: job.shopId, jobId: job.id, email, invitedBy: actor.userId });
  return { job, id };
}

export async function removeFollowerAs(actor: Actor, publicId: string, subscriberId: number) {
  const { job } = await followingAccess(actor, publicId, "job:follow-manage");
  if (!(await removeFollower({ shopId: job.shopId, jobId: job.id, subscriberId }))) throw new AppError("not_found", "That follower isn't on this job any more.");
  return { job };
}

/**
 * Sets how often this person hears about the job, and starts e-mail again if it was stopped.
 * An owner whose job predates following (no row yet) gets one now.
 */
export async function setOwnFrequency(actor: Actor, publicId: string, frequency: Frequency) {
  const { job, resource } = await followingAccess(actor, publicId, "job:follow");
  let own = await getOwnSubscription({ jobId: job.id, userId: actor.userId, email: actor.email });
  if (!own && rolesFor(actor, resource).includes("customer")) {
    await subscribeOwner(db(), { shopId: job.shopId, jobId: job.id, email: actor.email, userId: actor.userId });
    own = await getOwnSubscription({ jobId: job.id, userId: actor.userId, email: actor.email });
  }
  if (!own) throw new AppError("not_found", "You don't follow this job.");
  await setFrequency({ subscriberId: own.id, frequency });
  return { job };
}

/** What the following card shows this person: their own e-mail setting, and the followers if they may see them. */
export async function followingView(actor: Actor, job: JobKey, resource: Resource) {
  const own = await getOwnSubscription({ jobId: job.id, userId: actor.userId, email: actor.email });
  const mayManage = can(actor, "job:follow-manage", resource);
  const followers = can(actor, "job:view-followers", resource) ? (await listSubscribers({ shopId: job.shopId, jobId: job.id })).filter((s) => s.role === "follower") : [];
  return { own, mayManage, mayFollow: can(actor, "job:follow", resource), followers };
}

/**
 * One-click unsubscribe (RFC 8058): the token alone decides, no session. "invalid" for a forged or
 * damaged token (nothing changes), "gone" for a subscriber since removed.
 */
export async function unsubscribeWithToken(token: string): Promise<"done" | "invalid" | "gone"> {
  const subscriberId = readUnsubscribeToken(token);
  if (subscriberId == null) return "invalid";
  return (await unsubscribe({ subscriberId })) ? "done" : "gone";
}
