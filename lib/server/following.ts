import "server-only";
import {
  getOwnSubscription,
  inviteFollower,
  listSubscribers,
  removeFollower,
  setFrequency,
  subscribeOwner,
  unsubscribe,
} from "@/db/queries/following";
import { AppError } from "@/lib/errors";
import type { Frequency } from "@/lib/following";
import { type Actor, type Resource, can, rolesFor } from "@/lib/permissions";
import type { JobAccess } from "@/lib/server/access";
import { recordInboxEvent } from "@/lib/server/inbox";
import { readUnsubscribeToken } from "@/lib/server/signed-token";

type JobKey = { id: number; shopId: number; customerUserId: number | null };

/** The owner invites someone by e-mail; the invitation goes out through the outbox at the next sweep. */
export async function inviteFollowerAs(actor: Actor, { job }: JobAccess, email: string) {
  if (email.toLowerCase() === actor.email.toLowerCase()) {
    throw new AppError("conflict", "That's your own address: you already follow this job.", { email: ["That's your own address."] });
  }
  const id = await inviteFollower({ shopId: job.shopId, jobId: job.id, email, invitedBy: actor.userId }, (tx, subscriber) =>
    recordInboxEvent(tx, {
      shopId: job.shopId,
      jobId: job.id,
      kind: "follower_added",
      actorUserId: actor.userId,
      summary: `${actor.name} invited ${email.toLowerCase()} to follow the job`,
      extra: { subscriber, name: actor.name },
    }),
  );
  return { job, id };
}

export async function removeFollowerAs({ job }: JobAccess, subscriberId: number) {
  if (!(await removeFollower({ shopId: job.shopId, jobId: job.id, subscriberId }))) throw new AppError("not_found", "That follower isn't on this job any more.");
  return { job };
}

/**
 * Sets how often this person hears about the job, and starts e-mail again if it was stopped.
 * An owner whose job predates following (no row yet) gets one now.
 */
export async function setOwnFrequency(actor: Actor, { job, resource }: JobAccess, frequency: Frequency) {
  let own = await getOwnSubscription({ jobId: job.id, userId: actor.userId, email: actor.email });
  if (!own && rolesFor(actor, resource).includes("customer")) {
    await subscribeOwner({ shopId: job.shopId, jobId: job.id, email: actor.email, userId: actor.userId });
    own = await getOwnSubscription({ jobId: job.id, userId: actor.userId, email: actor.email });
  }
  if (!own) throw new AppError("not_found", "You don't follow this job.");
  await setFrequency({ subscriberId: own.id, frequency });
  return { job };
}

/** What the following card shows this person: their own e-mail setting, and the followers if they may see them. */
export async function followingView(actor: Actor, job: JobKey, resource: Resource) {
  const mayManage = can(actor, "job:follow-manage", resource);
  // Whoever may see the followers reads every subscription once and finds their own in it, as
  // getOwnSubscription would: by account first, then by the (lower-case) address it was made for.
  const all = can(actor, "job:view-followers", resource) ? await listSubscribers({ shopId: job.shopId, jobId: job.id }) : null;
  const email = actor.email.toLowerCase();
  const own = all
    ? (all.find((s) => s.userId === actor.userId) ?? all.find((s) => s.email === email) ?? null)
    : await getOwnSubscription({ jobId: job.id, userId: actor.userId, email: actor.email });
  const followers = all ? all.filter((s) => s.role === "follower") : [];
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
