"use client";
import type MuxPlayerElement from "@mux/mux-player";
import MuxPlayer from "@mux/mux-player-react/lazy";
import { CircleAlert, LoaderCircle, MapPin } from "lucide-react";
import { useRef, useState } from "react";
import { formatDuration } from "@/lib/clips";
import type { TimelineClip } from "@/lib/journal";

/**
 * A clip on the timeline. The player's code and the video load only when the clip scrolls into
 * view (the lazy build of the player), so a journal with fifty clips stays light; until then a
 * poster-sized placeholder holds its place.
 */
export function ClipPlayer({ clip, title, startTime }: { clip: TimelineClip; title: string; startTime?: number }) {
  const player = useRef<MuxPlayerElement | null>(null);
  const [start, setStart] = useState(startTime);
  /** A moment opens the clip at its second: seek the loaded player, or start the lazy one there. */
  const openAt = (ms: number) => {
    const el = player.current;
    if (el) {
      el.currentTime = ms / 1000;
      void el.play()?.catch(() => undefined);
    } else {
      setStart(ms / 1000);
    }
  };
  if (clip.status === "ready" && clip.src) {
    const [w, h] = (clip.aspectRatio ?? "16:9").split(":").map(Number);
    return (
      <figure className="space-y-1">
        <MuxPlayer
          ref={player}
          loading="viewport"
          src={clip.src}
          poster={clip.poster ?? undefined}
          streamType="on-demand"
          disableTracking
          disableCookies
          preload="metadata"
          title={title}
          startTime={start}
          accentColor="rgb(var(--oil))"
          style={{ aspectRatio: `${w || 16} / ${h || 9}`, width: "100%", borderRadius: "0.5rem", overflow: "hidden" }}
        />
        {clip.durationSeconds != null ? <figcaption className="text-sm text-ink-muted">Clip, {formatDuration(clip.durationSeconds)}</figcaption> : null}
        {clip.moments?.length ? (
          <ol aria-label="Moments in this clip" className="flex flex-wrap gap-2">
            {clip.moments.map((m) => (
              <li key={`${m.atMs}-${m.label}`}>
                <a
                  href={`#clip-${clip.id}-${Math.floor(m.atMs / 1000)}`}
                  onClick={(e) => {
                    e.preventDefault();
                    openAt(m.atMs);
                  }}
                  className="inline-flex min-h-tap items-center gap-1.5 rounded-full border border-dusk/30 bg-dusk-soft px-3 text-sm font-semibold text-dusk"
                >
                  <MapPin aria-hidden className="size-4" />
                  {formatDuration(m.atMs / 1000)} {m.label}
                </a>
              </li>
            ))}
          </ol>
        ) : null}
      </figure>
    );
  }
  if (clip.status === "errored" || clip.status === "deleted") {
    return (
      <p className="flex items-start gap-2 rounded-lg border border-rust/40 bg-rust-soft p-3 text-ink">
        <CircleAlert aria-hidden className="mt-0.5 size-5 shrink-0 text-rust" />
        <span>{clip.status === "deleted" ? "This clip was removed." : (clip.error ?? "This clip couldn't be processed.")}</span>
      </p>
    );
  }
  return (
    <p role="status" className="flex aspect-video w-full items-center justify-center gap-2 rounded-lg border border-dashed border-line-strong bg-sunken text-ink-muted">
      <LoaderCircle aria-hidden className="size-5 motion-safe:animate-spin" />
      {clip.status === "uploading" ? "Uploading from the bench…" : "Processing the clip…"}
    </p>
  );
}
