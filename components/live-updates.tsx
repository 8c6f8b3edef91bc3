"use client";
import { type ReactNode, useMemo } from "react";
import type { LiveEvent } from "@/lib/live-events";
import { LiveStatusContext, useLiveEvents } from "@/lib/swr/use-live-events";

// The live stream, mounted once per view: the staff shop layout (every staff page of the shop)
// and the owner's job page. One EventSource per tab: a browser allows only six connections to
// one origin over HTTP/1.1, so views never open one each.

/**
 * Staff of a shop: every event of the shop refetches the shop's SWR keys (board, inbox, unread
 * count) and, for an event about a job, that job's (timeline, approvals), and re-renders the page.
 */
export function LiveShopUpdates({ shopSlug, since, children }: { shopSlug: string; since: number | null; children: ReactNode }) {
  const shop = encodeURIComponent(shopSlug);
  const { connected } = useLiveEvents(`/api/shops/${shop}/events`, {
    since,
    prefixes: (e: LiveEvent) => [`/api/shops/${shop}/`, ...(e.job ? [`/api/jobs/${encodeURIComponent(e.job)}/`] : [])],
  });
  const status = useMemo(() => ({ connected }), [connected]);
  return <LiveStatusContext.Provider value={status}>{children}</LiveStatusContext.Provider>;
}

/** A job's owner or follower (or staff on the owner's page): that job's events they may hear. */
export function LiveJobUpdates({ jobPublicId, since, children }: { jobPublicId: string; since: number | null; children?: ReactNode }) {
  const job = encodeURIComponent(jobPublicId);
  const { connected } = useLiveEvents(`/api/jobs/${job}/events`, { since, prefixes: [`/api/jobs/${job}/`] });
  const status = useMemo(() => ({ connected }), [connected]);
  return <LiveStatusContext.Provider value={status}>{children}</LiveStatusContext.Provider>;
}
