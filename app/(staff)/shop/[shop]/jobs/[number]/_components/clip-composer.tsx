"use client";
import { Send, Video, X } from "lucide-react";
import { useId, useState } from "react";
import { PickedFileRow, ShareWithOwner } from "@/components/journal/picked-file";
import { Alert, Button } from "@/components/ui";
import { enqueue } from "@/lib/client/bench-outbox";
import { clipLimitProblem } from "@/lib/clips";
import { clipFileProblem } from "@/lib/file-kinds";

type Limits = { maxSeconds: number; maxBytes: number };
type Item = { key: string; file: File; state: "checking" | "ready" | "failed"; message?: string; durationSeconds?: number };

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
 * Clips from the bench: record or pick several, check them here (a file that isn't a video is
 * named with what clips take; length and size against the shop's limits), then post them. Like a
 * photo set, the share choice is read when "Post" is pressed, whenever it was ticked (issue 20
 * §3). Posted clips go into the phone's outbox (lib/client/bench-outbox.ts), which sends them one
 * at a time in resumable chunks and carries on after a dropped connection or a reload; their
 * progress shows under "Waiting to send". A clip the video service turns down later is listed
 * with its reason in the journal (FailedClips).
 */
export function ClipComposer({ jobPublicId, limits, onStarted }: { jobPublicId: string; limits: Limits; onStarted: () => void }) {
  const [items, setItems] = useState<Item[]>([]);
  const [share, setShare] = useState(false);
  const [posting, setPosting] = useState(false);
  const [posted, setPosted] = useState<string | null>(null);
  const [error, setError] = useState<string | null>(null);
  const id = useId();

  const patch = (key: string, change: Partial<Item>) => setItems((list) => list.map((it) => (it.key === key ? { ...it, ...change } : it)));

  async function check(item: Item) {
    const wrongKind = clipFileProblem(item.file);
    if (wrongKind) return patch(item.key, { state: "failed", message: wrongKind });
    const durationSeconds = await readDuration(item.file);
    const problem = clipLimitProblem({ size: item.file.size, durationSeconds, name: item.file.name }, limits);
    patch(item.key, problem ? { state: "failed", message: problem } : { state: "ready", durationSeconds });
  }

  function pick(files: FileList | null, input: HTMLInputElement) {
    if (!files?.length) return;
    setPosted(null);
    setError(null);
    const added = Array.from(files).map((file, i): Item => ({ key: `${Date.now()}-${i}-${file.name}`, file, state: "checking" }));
    input.value = "";
    setItems((list) => [...list, ...added]);
    for (const item of added) void check(item);
  }

  const ready = items.filter((it) => it.state === "ready");
  const checking = items.some((it) => it.state === "checking");

  async function post() {
    setPosting(true);
    setError(null);
    const visibility = share ? "shared" : "shop";
    try {
      for (const it of ready) {
        await enqueue({
          kind: "clip",
          job: jobPublicId,
          label: `Clip: ${it.file.name}`,
          payload: { name: it.file.name, size: it.file.size, type: it.file.type || undefined, durationSeconds: it.durationSeconds, visibility },
          files: [{ name: it.file.name, type: it.file.type, size: it.file.size, blob: it.file }],
        });
      }
      setPosted(`${ready.length} clip${ready.length === 1 ? "" : "s"} on the way${share ? ", shared with the owner" : ", shop only"}. Progress shows under “Waiting to send”; it carries on if the Wi-Fi drops.`);
      setItems((list) => list.filter((it) => it.state !== "ready"));
      setShare(false);
      onStarted();
    } catch (e) {
      setError(`Couldn't keep the clips on this phone to send: ${(e as Error).message}`);
    } finally {
      setPosting(false);
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
      {items.length ? (
        <ul className="space-y-2" aria-label="Clips to post">
          {items.map((it) => (
            <PickedFileRow
              key={it.key}
              name={it.file.name}
              outcome={it.state === "ready" ? "good" : it.state === "failed" ? "failed" : null}
              actions={<Button variant="ghost" aria-label={`Leave ${it.file.name} out`} onClick={() => setItems((l) => l.filter((x) => x.key !== it.key))} icon={<X aria-hidden className="size-5" />} />}
            >
              <p className="text-sm text-ink-muted" aria-live="polite">
                {it.state === "failed" ? <span className="text-rust">{it.message}</span> : it.state === "ready" ? "Ready to post" : "Checking…"}
              </p>
            </PickedFileRow>
          ))}
        </ul>
      ) : null}
      <ShareWithOwner share={share} onChange={setShare} />
      {error ? <Alert tone="error">{error}</Alert> : null}
      {posted ? <Alert tone="success">{posted}</Alert> : null}
      <Button size="lg" fullWidth disabled={!ready.length || checking} loading={posting} onClick={() => void post()} icon={<Send aria-hidden className="size-5" />}>
        {checking ? "Checking…" : ready.length ? `Post ${ready.length} clip${ready.length === 1 ? "" : "s"}` : "Post clips"}
      </Button>
    </div>
  );
}
