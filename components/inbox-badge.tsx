"use client";
import { unreadBadge } from "@/lib/inbox";
import { useInboxUnread } from "@/lib/swr/use-inbox";

/**
 * The unread count beside "Inbox" in the shop's navigation: rendered by the server, then kept
 * fresh by SWR (and by the live stream, which revalidates every key of the shop). Read out as
 * "Inbox, 3 unread"; nothing when there is nothing new.
 */
export function InboxBadge({ shopSlug, initial }: { shopSlug: string; initial: number }) {
  const { data } = useInboxUnread(shopSlug, initial);
  const n = data?.unread ?? initial;
  if (!n) return null;
  return (
    <>
      <span className="sr-only">, </span>
      <span aria-hidden className="ml-2 inline-flex min-w-6 items-center justify-center rounded-full bg-oil px-1.5 text-sm font-bold leading-6 text-oil-on" data-testid="inbox-unread">
        {unreadBadge(n)}
      </span>
      <span className="sr-only"> unread</span>
    </>
  );
}
