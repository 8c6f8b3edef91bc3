"use client";
import useSWRInfinite from "swr/infinite";
import type { TimelineAudience, TimelinePage } from "@/lib/journal";
import { jsonFetcher } from "./fetcher";

export type TimelineResponse = TimelinePage & { audience: TimelineAudience };

/** How often an open timeline asks for new entries (besides on focus). */
export const TIMELINE_REFRESH_MS = 15_000;
/** Faster while a clip on the page is still on its way, so it turns playable soon after it is ready. */
export const TIMELINE_PROCESSING_REFRESH_MS = 3_000;

const clipPending = (pages: TimelineResponse[] | undefined) =>
  !!pages?.some((p) => p.entries.some((e) => e.clip && (e.clip.status === "uploading" || e.clip.status === "processing")));

/** The job's timeline, page by page, kept fresh while the page is open. */
export function useJobTimeline(jobPublicId: string, order: "asc" | "desc", initial?: TimelineResponse, as?: "owner") {
  const base = `/api/jobs/${encodeURIComponent(jobPublicId)}/timeline?order=${order}${as ? `&as=${as}` : ""}`;
  const swr = useSWRInfinite<TimelineResponse>(
    (index, previous: TimelineResponse | null) => {
      if (index === 0) return base;
      if (!previous?.next) return null;
      return `${base}&after=${previous.next}`;
    },
    jsonFetcher,
    {
      fallbackData: initial ? [initial] : undefined,
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
