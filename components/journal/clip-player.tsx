"use client";
import { CircleAlert, LoaderCircle } from "lucide-react";
import { lazy, Suspense } from "react";
import type { TimelineClip } from "@/lib/journal";

// The player's code comes in its own chunk, fetched only where a ready clip is shown.
const ClipVideo = lazy(() => import("./clip-video"));

/**
 * A clip on the timeline: the player (clip-video.tsx, a plain <video> with our controls) once it
 * is ready, or where it stands (uploading, processing, failed). Until the player's code is in,
 * the clip's poster holds its place.
 */
export function ClipPlayer({ clip, title, startTime }: { clip: TimelineClip; title: string; startTime?: number }) {
  if (clip.status === "ready" && clip.src) {
    return (
      <Suspense fallback={<ClipPoster clip={clip} />}>
        <ClipVideo clip={clip} src={clip.src} title={title} startTime={startTime} />
      </Suspense>
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

function ClipPoster({ clip }: { clip: TimelineClip }) {
  const [w, h] = (clip.aspectRatio ?? "16:9").split(":").map(Number);
  return (
    <div aria-hidden className="w-full overflow-hidden rounded-lg bg-black" style={{ aspectRatio: `${w || 16} / ${h || 9}` }}>
      {/* eslint-disable-next-line @next/next/no-img-element -- our own clip route, shown for a moment */}
      {clip.poster ? <img src={clip.poster} alt="" className="size-full object-contain" /> : null}
    </div>
  );
}
