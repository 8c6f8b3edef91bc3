"use client";
import { CircleCheck, CircleX, Pause, Play, Video, WifiOff, X } from "lucide-react";
import { useEffect, useId, useRef, useState } from "react";
import type { UpChunk } from "@mux/upchunk";
import { Alert, Button } from "@/components/ui";
import { CLIP_CHUNK_KIB, type FailedClip, clipLimitProblem } from "@/lib/clips";
import { sendJson } from "@/lib/swr/fetcher";

type Limits = { maxSeconds: number; maxBytes: number };
type State = "checking" | "waiting" | "uploading" | "paused" | "offline" | "done" | "failed" | "rejected";
type Item = { key: string; file: File; state: State; progress: number; message?: string; clipId?: string };

/** Reads a clip's length from the file itself, before anything is sent. */
function readDuration(file: File): Promise<number | undefined> {
  return new Promise((resolve) => {
    const video = document.createElement("video");
    const url = URL.createObjectURL(file);
    const done = (value?: number) => {
      URL.revokeObjectURL(url);
      resolve(value);
    };
    video.preload = "metadata";
    video.onloadedmetadata = () => done(Number.isFinite(video.duration) ? video.duration : undefined);
    video.onerror = () => done(undefined);
    setTimeout(() => done(undefined), 5000);
    video.src = url;
  });
}

/**
 * Clips from the bench: record or pick several, each goes up in resumable chunks straight to
 * the video service with its own bar, pause/resume, and an automatic resume when the network
 * comes back. The entry shows on the timeline at once and turns ready by itself.
 */
export function ClipComposer({ jobPublicId, limits, onStarted, rejected }: { jobPublicId: string; limits: Limits; onStarted: () => void; rejected?: FailedClip[] }) {
  const [items, setItems] = useState<Item[]>([]);
  const [share, setShare] = useState(false);
  const uploads = useRef(new Map<string, UpChunk>());
  const queue = useRef<Promise<void>>(Promise.resolve());
  const id = useId();

  useEffect(() => {
    const live = uploads.current;
    return () => live.forEach((u) => u.abort());
  }, []);

  // A clip the video service turned down after it was sent: the reason comes from the job's list
  // of failed clips, and stays on the item even once that list is cleared.
  useEffect(() => {
    if (!rejected?.length) return;
    const reasons = new Map(rejected.map((r) => [r.id, r.error]));
    const turnedDown = (it: Item) => !!it.clipId && it.state !== "rejected" && reasons.has(it.clipId);
    setItems((list) =>
      list.some(turnedDown)
        ? list.map((it) => (turnedDown(it) ? { ...it, state: "rejected", message: `The video service couldn't use it: ${reasons.get(it.clipId!)} It was not added to the journal.` } : it))
        : list,
    );
  }, [rejected]);

  const patch = (key: string, change: Partial<Item>) => setItems((list) => list.map((it) => (it.key === key ? { ...it, ...change } : it)));

  async function send(item: Item, visibility: "shop" | "shared") {
    patch(item.key, { state: "checking" });
    const durationSeconds = await readDuration(item.file);
    const problem = clipLimitProblem({ size: item.file.size, durationSeconds, name: item.file.name }, limits);
    if (problem) return patch(item.key, { state: "failed", message: problem });
    let uploadUrl: string;
    try {
      let clipId: string;
      ({ uploadUrl, clipId } = await sendJson<{ uploadUrl: string; clipId: string }>(`/api/jobs/${jobPublicId}/clips`, "POST", {
        name: item.file.name,
        size: item.file.size,
        type: item.file.type || undefined,
        durationSeconds,
        visibility,
      }));
      patch(item.key, { clipId });
    } catch (e) {
      return patch(item.key, { state: "failed", message: (e as Error).message });
    }
    onStarted();
    const { createUpload } = await import("@mux/upchunk");
    await new Promise<void>((resolve) => {
      // A dropped connection reaches upchunk as status 0: retry it like a gateway error.
      const upload = createUpload({ endpoint: uploadUrl, file: item.file, chunkSize: CLIP_CHUNK_KIB, attempts: 10, delayBeforeAttempt: 2, retryCodes: [0, 408, 502, 503, 504] });
      uploads.current.set(item.key, upload);
      patch(item.key, { state: "uploading" });
      upload.on("progress", (e) => patch(item.key, { progress: Number(e.detail) / 100 }));
      upload.on("offline", () => patch(item.key, { state: "offline" }));
      upload.on("online", () => patch(item.key, { state: "uploading" }));
      upload.on("success", () => {
        patch(item.key, { state: "done", progress: 1 });
        uploads.current.delete(item.key);
        onStarted();
        resolve();
      });
      upload.on("error", (e) => {
        patch(item.key, { state: "failed", message: `Upload stopped: ${(e.detail as { message?: string })?.message ?? "the connection failed"}.` });
        uploads.current.delete(item.key);
        resolve();
      });
    });
  }

  function pick(files: FileList | null, input: HTMLInputElement) {
    if (!files?.length) return;
    const added = Array.from(files).map((file, i): Item => ({ key: `${Date.now()}-${i}-${file.name}`, file, state: "waiting", progress: 0 }));
    input.value = "";
    setItems((list) => [...list, ...added]);
    const visibility = share ? "shared" : "shop";
    // One clip at a time: a phone on garage Wi-Fi does better with a single stream.
    for (const item of added) queue.current = queue.current.then(() => send(item, visibility));
  }

  function togglePause(key: string) {
    const upload = uploads.current.get(key);
    if (!upload) return;
    if (upload.paused) {
      upload.resume();
      patch(key, { state: "uploading" });
    } else {
      upload.pause();
      patch(key, { state: "paused" });
    }
  }

  const inputClass = "inline-flex min-h-14 flex-1 cursor-pointer items-center justify-center gap-2 rounded-lg px-4 py-3 text-lg font-semibold focus-within:outline focus-within:outline-2";
  return (
    <div className="space-y-4">
      <div className="flex flex-wrap gap-2">
        <label className={`${inputClass} bg-oil text-oil-on hover:bg-oil/90`}>
          <Video aria-hidden className="size-6" />
          Record a clip
          <input type="file" accept="video/*" capture="environment" className="sr-only" onChange={(e) => pick(e.target.files, e.target)} />
        </label>
        <label htmlFor={`${id}-pick`} className={`${inputClass} border border-line-strong bg-surface text-ink hover:bg-sunken`}>
          Choose clips
        </label>
        <input id={`${id}-pick`} type="file" accept="video/*" multiple className="sr-only" onChange={(e) => pick(e.target.files, e.target)} />
      </div>
      <p className="text-sm text-ink-muted">
        Up to {Math.round(limits.maxSeconds / 60)} minutes and {Math.round(limits.maxBytes / 1024 ** 3)} GB per clip. Clips keep going if the Wi-Fi drops.
      </p>
      <label className="flex min-h-tap items-center gap-3">
        <input type="checkbox" checked={share} onChange={(e) => setShare(e.target.checked)} className="size-6 accent-oil" />
        <span>Share new clips with the owner (otherwise shop only)</span>
      </label>
      {items.length ? (
        <ul className="space-y-2" aria-label="Clips on their way">
          {items.map((it) => (
            <li key={it.key} className="rounded-lg border border-line p-3">
              <div className="flex items-center gap-2">
                {it.state === "done" ? <CircleCheck aria-hidden className="size-5 shrink-0 text-moss" /> : null}
                {it.state === "failed" || it.state === "rejected" ? <CircleX aria-hidden className="size-5 shrink-0 text-rust" /> : null}
                {it.state === "offline" ? <WifiOff aria-hidden className="size-5 shrink-0 text-signal" /> : null}
                <span className="min-w-0 flex-1 truncate font-semibold">{it.file.name}</span>
                {it.state === "uploading" || it.state === "paused" ? (
                  <Button variant="secondary" onClick={() => togglePause(it.key)} icon={it.state === "paused" ? <Play aria-hidden className="size-5" /> : <Pause aria-hidden className="size-5" />}>
                    {it.state === "paused" ? "Resume" : "Pause"}
                  </Button>
                ) : null}
                {it.state === "done" || it.state === "failed" || it.state === "rejected" ? (
                  <Button variant="ghost" aria-label={`Clear ${it.file.name} from the list`} onClick={() => setItems((l) => l.filter((x) => x.key !== it.key))} icon={<X aria-hidden className="size-5" />} />
                ) : null}
              </div>
              <progress className="mt-2 h-3 w-full accent-oil" max={1} value={it.progress} aria-label={`Upload of ${it.file.name}`} />
              <p className="text-sm text-ink-muted" aria-live="polite">
                {it.state === "failed" || it.state === "rejected" ? <span className="text-rust">{it.message}</span> : null}
                {it.state === "done" ? "Sent. It shows in the journal and turns playable by itself (if the video service can't use it, you'll see why here)." : null}
                {it.state === "uploading" ? `${Math.round(it.progress * 100)} %` : null}
                {it.state === "paused" ? `Paused at ${Math.round(it.progress * 100)} %` : null}
                {it.state === "offline" ? "Waiting for the network; it resumes by itself." : null}
                {it.state === "checking" || it.state === "waiting" ? "Waiting…" : null}
              </p>
            </li>
          ))}
        </ul>
      ) : null}
      {items.some((it) => it.state === "failed" || it.state === "rejected") ? <Alert tone="warning">Clips that failed were not added. The others are safe.</Alert> : null}
    </div>
  );
}
