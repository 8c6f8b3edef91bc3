"use client";
import { MapPin, Maximize, Pause, Play, Volume2, VolumeX } from "lucide-react";
import { type KeyboardEvent, useEffect, useRef, useState } from "react";
import { formatDuration } from "@/lib/clips";
import type { TimelineClip } from "@/lib/journal";

// The player of a ready clip (ClipPlayer, clip-player.tsx, loads this module only when a ready
// clip is on the page). Clips are MP4 files served by our own routes, so the browser's own <video>
// plays them: no streaming engine, no analytics, no script from another host. The controls are
// ours (buttons and a slider, all keyboard reachable). The video's address is set only when the
// clip comes near the screen, so a journal with fifty clips loads fifty posters and nothing more.

const SKIP_SECONDS = 5;
const control =
  "inline-flex size-tap shrink-0 items-center justify-center rounded-full text-white hover:bg-white/15 focus-visible:outline focus-visible:outline-2 focus-visible:outline-offset-1 focus-visible:outline-brass";

export default function ClipVideo({ clip, src, title, startTime }: { clip: TimelineClip; src: string; title: string; startTime?: number }) {
  const frame = useRef<HTMLDivElement | null>(null);
  const video = useRef<HTMLVideoElement | null>(null);
  /** Where to start once the metadata is in: the moment the clip was opened at, if any. */
  const pendingStart = useRef<number | undefined>(startTime);
  const playWhenLoaded = useRef(false);
  const [near, setNear] = useState(false);
  const [playing, setPlaying] = useState(false);
  const [muted, setMuted] = useState(false);
  const [time, setTime] = useState(0);
  const [duration, setDuration] = useState(clip.durationSeconds ?? 0);
  const [failed, setFailed] = useState(false);
  const [w, h] = (clip.aspectRatio ?? "16:9").split(":").map(Number);

  // Give the video its address when it comes within a screen of the viewport.
  useEffect(() => {
    const el = frame.current;
    if (!el || near) return;
    const observer = new IntersectionObserver((seen) => seen.some((s) => s.isIntersecting) && setNear(true), { rootMargin: "100% 0px" });
    observer.observe(el);
    return () => observer.disconnect();
  }, [near]);

  const onLoadedMetadata = () => {
    const el = video.current;
    if (!el) return;
    setDuration(el.duration);
    if (pendingStart.current != null) {
      el.currentTime = Math.min(pendingStart.current, el.duration || pendingStart.current);
      setTime(el.currentTime);
      pendingStart.current = undefined;
    }
    if (playWhenLoaded.current) {
      playWhenLoaded.current = false;
      void el.play().catch(() => undefined);
    }
  };

  const toggle = () => {
    const el = video.current;
    if (!el) {
      playWhenLoaded.current = true;
      setNear(true);
      return;
    }
    if (el.paused) void el.play().catch(() => undefined);
    else el.pause();
  };
  const seek = (seconds: number) => {
    const el = video.current;
    if (!el || el.readyState < 1) {
      pendingStart.current = seconds;
      return;
    }
    el.currentTime = Math.max(0, Math.min(seconds, el.duration || seconds));
    setTime(el.currentTime);
  };
  /** A moment opens the clip at its second and plays from there. */
  const openAt = (ms: number) => {
    const el = video.current;
    if (el && el.readyState >= 1) {
      seek(ms / 1000);
      void el.play().catch(() => undefined);
    } else {
      pendingStart.current = ms / 1000;
      playWhenLoaded.current = true;
      setNear(true);
    }
  };
  const toggleMute = () => {
    const el = video.current;
    if (el) el.muted = !el.muted;
  };
  const fullScreen = () => {
    const box = frame.current;
    const el = video.current as (HTMLVideoElement & { webkitEnterFullscreen?: () => void }) | null;
    if (document.fullscreenElement) void document.exitFullscreen().catch(() => undefined);
    else if (box?.requestFullscreen) void box.requestFullscreen().catch(() => undefined);
    else el?.webkitEnterFullscreen?.(); // iPhone Safari: only the video itself goes full screen
  };
  // The usual player keys, when focus is on the player and not on one of its controls' own keys.
  const onKeyDown = (e: KeyboardEvent<HTMLDivElement>) => {
    const onSlider = (e.target as HTMLElement).tagName === "INPUT";
    const onButton = (e.target as HTMLElement).tagName === "BUTTON";
    const key = e.key.toLowerCase();
    if (key === "k" || (key === " " && !onButton && !onSlider)) toggle();
    else if (key === "m") toggleMute();
    else if (key === "f") fullScreen();
    else if (!onSlider && key === "arrowleft") seek(time - SKIP_SECONDS);
    else if (!onSlider && key === "arrowright") seek(time + SKIP_SECONDS);
    else return;
    e.preventDefault();
  };

  return (
    <figure className="space-y-1">
      <div
        ref={frame}
        role="group"
        aria-label={`Clip: ${title}`}
        onKeyDown={onKeyDown}
        className="relative w-full overflow-hidden rounded-lg bg-black"
        style={{ aspectRatio: `${w || 16} / ${h || 9}` }}
      >
        <video
          ref={video}
          data-clip-player=""
          src={near ? src : undefined}
          poster={clip.poster ?? undefined}
          preload="metadata"
          playsInline
          // No cast button on the picture: the clip plays here, from our origin, and nowhere else.
          disableRemotePlayback
          title={title}
          onClick={toggle}
          onLoadedMetadata={onLoadedMetadata}
          onDurationChange={(e) => Number.isFinite(e.currentTarget.duration) && setDuration(e.currentTarget.duration)}
          onTimeUpdate={(e) => setTime(e.currentTarget.currentTime)}
          onPlay={() => setPlaying(true)}
          onPause={() => setPlaying(false)}
          onEnded={() => setPlaying(false)}
          onVolumeChange={(e) => setMuted(e.currentTarget.muted)}
          onError={() => setFailed(near)}
          className="size-full cursor-pointer object-contain"
        />
        {failed ? (
          <p role="alert" className="absolute inset-x-0 top-0 bg-rust-soft p-2 text-sm text-ink">
            The clip couldn&apos;t be loaded. Check the connection and try again.
          </p>
        ) : null}
        <div className="absolute inset-x-0 bottom-0 flex items-center gap-1 bg-gradient-to-t from-black/80 to-black/0 px-1 pb-1 pt-4 text-white">
          <button type="button" className={control} onClick={toggle} aria-label={playing ? "Pause" : "Play"}>
            {playing ? <Pause aria-hidden className="size-5" /> : <Play aria-hidden className="size-5" />}
          </button>
          <span className="shrink-0 text-xs tabular-nums" aria-hidden>
            {formatDuration(time)} / {formatDuration(duration)}
          </span>
          <input
            type="range"
            min={0}
            max={duration || 0}
            step={0.1}
            value={Math.min(time, duration || 0)}
            onChange={(e) => seek(Number(e.target.value))}
            aria-label="Position in the clip"
            aria-valuetext={`${formatDuration(time)} of ${formatDuration(duration)}`}
            className="h-tap min-w-0 flex-1 cursor-pointer accent-oil"
          />
          <button type="button" className={control} onClick={toggleMute} aria-label={muted ? "Sound on" : "Mute"}>
            {muted ? <VolumeX aria-hidden className="size-5" /> : <Volume2 aria-hidden className="size-5" />}
          </button>
          <button type="button" className={control} onClick={fullScreen} aria-label="Full screen">
            <Maximize aria-hidden className="size-5" />
          </button>
        </div>
      </div>
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
