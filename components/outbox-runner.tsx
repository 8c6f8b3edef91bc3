"use client";
import { useEffect } from "react";
import { setOutboxUser } from "@/lib/client/bench-outbox";
import { startRunner } from "@/lib/client/use-outbox";

/**
 * Sends the phone's outbox (issue 20 §2) from every staff page of the shop, the board the
 * installed app opens on included, not only where the "Waiting to send" panel shows: on load, when
 * the network is back and when the page comes back into view (lib/client/use-outbox.ts). Posts are
 * sent as `userId` only, the person this page is signed in as (until it is known nothing is sent,
 * and setting it wakes the runner); one runner per tab however many parts of the page start it.
 * Renders nothing.
 */
export function OutboxRunner({ userId }: { userId: number }) {
  useEffect(() => {
    setOutboxUser(userId);
    startRunner();
  }, [userId]);
  return null;
}
