"use client";
import useSWR, { useSWRConfig } from "swr";
import { useCallback } from "react";
import type { InboxPage } from "@/lib/inbox";
import { jsonFetcher } from "./fetcher";
import { useFallbackRefreshInterval } from "./use-live-events";

// The live stream (components/live-updates.tsx) refetches every key under /api/shops/<shop>/ as
// events arrive; while it is down, useFallbackRefreshInterval() makes these poll instead.

export const inboxKey = (shopSlug: string, search: string) => `/api/shops/${encodeURIComponent(shopSlug)}/inbox${search ? `?${search}` : ""}`;
export const unreadKey = (shopSlug: string) => `/api/shops/${encodeURIComponent(shopSlug)}/inbox/unread`;

/** One page of the inbox (search: inboxQueryToSearch), starting from what the server rendered. */
export function useInbox(shopSlug: string, search: string, initial?: InboxPage) {
  const refreshInterval = useFallbackRefreshInterval();
  return useSWR<InboxPage>(inboxKey(shopSlug, search), jsonFetcher, {
    fallbackData: initial,
    revalidateOnMount: !initial,
    keepPreviousData: true,
    refreshInterval,
    revalidateOnFocus: true,
  });
}

/** The header badge's count. */
export function useInboxUnread(shopSlug: string, initial: number) {
  const refreshInterval = useFallbackRefreshInterval();
  return useSWR<{ unread: number }>(unreadKey(shopSlug), jsonFetcher, {
    fallbackData: { unread: initial },
    revalidateOnMount: false,
    refreshInterval,
    revalidateOnFocus: true,
  });
}

/** After marking read: every inbox key of the shop (list pages and badge) asks again. */
export function useRefreshInbox(shopSlug: string) {
  const { mutate } = useSWRConfig();
  return useCallback(() => {
    const prefix = inboxKey(shopSlug, "");
    return mutate((key) => typeof key === "string" && key.startsWith(prefix));
  }, [mutate, shopSlug]);
}
