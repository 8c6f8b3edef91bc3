"use client";
import { useState } from "react";
import { useSWRConfig } from "swr";
import useSWRInfinite, { unstable_serialize } from "swr/infinite";
import type { TimelineAudience, TimelinePage } from "@/lib/journal";
import { TIMELINE_PAGE_SIZE } from "@/lib/timeline-paging";
import { jsonFetcher } from "./fetcher";

export type TimelineResponse = TimelinePage & { audience: TimelineAudience };

/** How often an open timeline asks for new entries (besides on focus). */
export const TIMELINE_REFRESH_MS = 15_000;
/** Faster while a clip on the page is still on its way, so it turns playable soon after it is ready. */
export const TIMELINE_PROCESSING_REFRESH_MS = 3_000;

const clipPending = (pages: TimelineResponse[] | undefined) =>
  !!pages?.some((p) => p.entries.some((e) => e.clip && (e.clip.status === "uploading" || e.clip.status === "processing")));

/**
 * The job's timeline, page by page, kept fresh while the page is open. `initial` is the first
 * page the server rendered (TIMELINE_PAGE_SIZE entries, newest first): on a first visit SWR shows
 * it without asking for it again; on a return visit, when SWR already holds older pages of this
 * timeline, it asks at once.
 */
export function useJobTimeline(jobPublicId: string, order: "asc" | "desc", initial?: TimelineResponse, as?: "owner") {
  const base = `/api/jobs/${encodeURIComponent(jobPublicId)}/timeline?order=${order}&limit=${TIMELINE_PAGE_SIZE}${as ? `&as=${as}` : ""}`;
  const pageKey = (index: number, previous: TimelineResponse | null) => {
    if (index === 0) return base;
    if (!previous?.next) return null;
    return `${base}&after=${previous.next}`;
  };
  const { cache } = useSWRConfig();
  const [handedOver] = useState(() => initial !== undefined && cache.get(unstable_serialize(pageKey)) === undefined);
  const swr = useSWRInfinite<TimelineResponse>(
    pageKey,
    jsonFetcher,
    {
      fallbackData: initial ? [initial] : undefined,
      // Only the first mount: a new order, a live event, focus and the interval still refetch.
      revalidateOnMount: handedOver ? false : undefined,
      revalidateOnFocus: true,
      refreshInterval: (pages) => (clipPending(pages) ? TIMELINE_PROCESSING_REFRESH_MS : TIMELINE_REFRESH_MS),
      // Oldest-first timelines grow at the end: every loaded page is asked again.
      revalidateAll: order === "asc",
    },
  );
  const pages = swr.data ?? [];
  return {
    ...swr,
    entries: pages.flatMap((p) => p.entries),
    hasMore: pages.at(-1)?.next != null,
  };
}
