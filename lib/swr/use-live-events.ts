"use client";
import { createContext, useContext, useEffect, useRef, useState } from "react";
import { useRouter } from "next/navigation";
import { useSWRConfig } from "swr";
import { type LiveEvent, swrKeyMatches } from "@/lib/live-events";
import { INBOX_KINDS, LIVE_KINDS } from "@/lib/shop-events";

// A page hears what happens in its shop or job over Server-Sent Events (the stream routes,
// lib/server/event-stream.ts) and refetches: every SWR key under the view's prefixes, and the
// server-rendered parts through router.refresh(). While the stream is down, views poll instead
// (useFallbackRefreshInterval).

/** How often a view polls while the stream is down. */
export const LIVE_FALLBACK_REFRESH_MS = 15_000;
/** Several events in a burst (a status move writes two) cause one server render. */
const REFRESH_DEBOUNCE_MS = 300;
/** After the server refused or the network failed for good, try again after these waits. */
const RECONNECT_MS = [3_000, 10_000, 30_000, 60_000];
const KINDS = [...INBOX_KINDS, ...LIVE_KINDS];

export type LiveOptions = {
  /** SWR keys to refetch on an event: fixed prefixes, or worked out from the event. */
  prefixes: readonly string[] | ((e: LiveEvent) => readonly string[]);
  onEvent?: (e: LiveEvent) => void;
  /** The newest event id when the page was rendered: events between render and connect aren't lost. */
  since?: number | null;
  /** Re-render the page's server components on an event (default true). */
  refresh?: boolean;
};

/** Listens to the stream at `url` (null: not at all); `connected` is false until it is up and whenever it drops. */
export function useLiveEvents(url: string | null, options: LiveOptions): { connected: boolean } {
  const { cache, mutate } = useSWRConfig();
  const router = useRouter();
  const [connected, setConnected] = useState(false);
  const latest = useRef({ options, cache, mutate, router });
  useEffect(() => {
    latest.current = { options, cache, mutate, router };
  });
  const lastId = useRef<number | null>(options.since ?? null);

  useEffect(() => {
    if (!url) return;
    let source: EventSource | null = null;
    let failures = 0;
    let reconnect: ReturnType<typeof setTimeout> | undefined;
    let refresh: ReturnType<typeof setTimeout> | undefined;

    const remember = (m: MessageEvent<string>) => {
      if (/^\d+$/.test(m.lastEventId)) lastId.current = Number(m.lastEventId);
    };
    const onLive = (m: MessageEvent<string>) => {
      remember(m);
      let e: LiveEvent;
      try {
        e = JSON.parse(m.data) as LiveEvent;
      } catch {
        return;
      }
      const { options: o, cache: c, mutate: revalidate, router: r } = latest.current;
      const prefixes = typeof o.prefixes === "function" ? o.prefixes(e) : o.prefixes;
      for (const key of c.keys()) if (swrKeyMatches(key, prefixes)) void revalidate(key);
      if (o.refresh !== false) {
        clearTimeout(refresh);
        refresh = setTimeout(() => r.refresh(), REFRESH_DEBOUNCE_MS);
      }
      o.onEvent?.(e);
    };
    const connect = () => {
      const at = lastId.current;
      // EventSource sends Last-Event-ID itself on its own reconnects; a first connect says it in the query.
      source = new EventSource(at === null ? url : `${url}${url.includes("?") ? "&" : "?"}lastEventId=${at}`);
      source.addEventListener("ready", (m) => {
        remember(m);
        failures = 0;
        setConnected(true);
      });
      for (const kind of KINDS) source.addEventListener(kind, onLive);
      source.onerror = () => {
        setConnected(false);
        // CONNECTING: the browser tries again by itself. CLOSED: it gave up (an error answer,
        // signed out, database away): try again later, with longer waits.
        if (source?.readyState !== EventSource.CLOSED) return;
        source.close();
        reconnect = setTimeout(connect, RECONNECT_MS[Math.min(failures++, RECONNECT_MS.length - 1)]);
      };
    };
    connect();
    return () => {
      source?.close();
      clearTimeout(reconnect);
      clearTimeout(refresh);
      setConnected(false);
    };
  }, [url]);

  return { connected };
}

/** Whether the live stream of the enclosing view is up (provided by components/live-updates.tsx). */
export const LiveStatusContext = createContext<{ connected: boolean }>({ connected: false });

/** An SWR `refreshInterval`: none while the stream is up, polling while it is down (or absent). */
export function useFallbackRefreshInterval(): number {
  return useContext(LiveStatusContext).connected ? 0 : LIVE_FALLBACK_REFRESH_MS;
}
