"use client";
// The outbox's runner and its view for React (issue 20 §2). One runner per tab, started by the
// staff shop layout (components/outbox-runner.tsx, so it runs on every staff page, the board the
// app opens on included) and again, harmlessly, by the outbox panel: it sends on load (so a
// closed tab or a slept phone carries on at the next open), when the browser says it is online
// again, when the page comes back into view (a phone woken up, the app brought to the front),
// when a post is queued, and on a timer while posts wait. Only the signed-in person's posts are
// sent (bench-outbox.ts, `by`). Within a tab one run at a time (`running`); across tabs a Web
// Lock lets one of them send at a time, so no post is ever being sent twice at once.
import { useEffect, useState } from "react";
import { type OutboxItem, drainOutbox, listOutbox, onOutboxChange, outboxUser } from "./bench-outbox";
import { sendQueued } from "./outbox-senders";

const progress = new Map<number, number>();
const progressEvents = new EventTarget();
let started = false;
let running = false;
let again = false;
let timer: ReturnType<typeof setTimeout> | undefined;
const sentListeners = new Set<() => void>();

async function withTabLock(work: () => Promise<void>) {
  const locks = typeof navigator !== "undefined" ? navigator.locks : undefined;
  if (!locks) return work();
  // ifAvailable: another tab is sending; it will get to our posts too (they share one IndexedDB).
  await locks.request("benchside-outbox", { ifAvailable: true }, async (lock) => {
    if (lock) await work();
  });
}

/** Sends what waits now; `fresh` (the network just came back) skips the pause after failures. */
export async function kickOutbox(fresh = false): Promise<void> {
  if (running) {
    again = true;
    return;
  }
  if (typeof navigator !== "undefined" && navigator.onLine === false) return;
  // Nobody known on this page yet (the layout sets it): nothing is anybody's to send.
  const userId = outboxUser();
  if (userId === null) return;
  running = true;
  try {
    await withTabLock(async () => {
      const report = await drainOutbox(sendQueued, {
        networkBack: fresh,
        userId,
        onProgress: (seq, fraction) => {
          progress.set(seq, fraction);
          progressEvents.dispatchEvent(new Event("progress"));
        },
      });
      if (report.sent) sentListeners.forEach((l) => l());
      clearTimeout(timer);
      if (report.nextAttemptAt !== null) timer = setTimeout(() => void kickOutbox(), Math.max(1000, report.nextAttemptAt - Date.now()));
    });
  } catch (error) {
    console.warn("outbox: sending stopped", error);
  } finally {
    running = false;
    progress.clear();
    progressEvents.dispatchEvent(new Event("progress"));
    if (again) {
      again = false;
      void kickOutbox();
    }
  }
}

/** Starts this tab's runner once; later calls (the layout, then a panel) do nothing. */
export function startRunner() {
  if (started || typeof window === "undefined") return;
  started = true;
  window.addEventListener("online", () => void kickOutbox(true));
  // Back in view after the phone slept or the app sat in the background: the network may be
  // back without an `online` event, so what waits goes now rather than after its pause.
  document.addEventListener("visibilitychange", () => {
    if (document.visibilityState === "visible") void kickOutbox(true);
  });
  onOutboxChange(() => void kickOutbox());
  // The safety net: whatever a missed event left waiting goes within half a minute.
  setInterval(() => void kickOutbox(), 30_000);
  void kickOutbox();
}

/**
 * The queued posts (of one job, and how many of other jobs), each one's progress, whether the
 * browser is offline, and who is signed in (`me`: whose posts this page sends).
 */
export function useOutbox(job: string, onSent?: () => void) {
  const [items, setItems] = useState<OutboxItem[]>([]);
  const [me, setMe] = useState<number | null>(null);
  const [others, setOthers] = useState(0);
  const [fractions, setFractions] = useState<Record<number, number>>({});
  const [offline, setOffline] = useState(false);
  useEffect(() => {
    let live = true;
    const load = () =>
      void listOutbox().then((all) => {
        if (!live) return;
        setMe(outboxUser());
        setItems(all.filter((i) => i.job === job));
        setOthers(all.filter((i) => i.job !== job).length);
      });
    const showProgress = () => setFractions(Object.fromEntries(progress));
    const network = () => setOffline(!navigator.onLine);
    load();
    network();
    const stop = onOutboxChange(load);
    progressEvents.addEventListener("progress", showProgress);
    window.addEventListener("online", network);
    window.addEventListener("offline", network);
    startRunner();
    return () => {
      live = false;
      stop();
      progressEvents.removeEventListener("progress", showProgress);
      window.removeEventListener("online", network);
      window.removeEventListener("offline", network);
    };
  }, [job]);
  useEffect(() => {
    if (!onSent) return;
    sentListeners.add(onSent);
    return () => void sentListeners.delete(onSent);
  }, [onSent]);
  return { items, others, fractions, offline, me };
}
