"use client";
import { Camera, RotateCcw, X } from "lucide-react";
import { useId, useRef, useState } from "react";
import { PickedFileRow, ShareWithOwner } from "@/components/journal/picked-file";
import { Alert, Button, Field, Input } from "@/components/ui";
import { runLimited, uploadFile } from "@/lib/client/upload";
import { browserOffline, enqueue } from "@/lib/client/bench-outbox";
import { photoFileProblem } from "@/lib/file-kinds";
import { MAX_PHOTOS_PER_SET, type TimelinePhoto } from "@/lib/journal";
import { sendJson } from "@/lib/swr/fetcher";

// Mirrors the server's limit (lib/server/photos.ts) so a phone doesn't send 50 MB for nothing.
const MAX_MB = 20;

// queued: no network when it was picked (or it dropped); the set then waits in the phone's outbox.
type Item = { key: string; file: File; progress: number; state: "waiting" | "uploading" | "done" | "failed" | "queued"; message?: string; photo?: TimelinePhoto };

/**
 * A photo set: pick several from the camera or gallery, each uploads with its own bar, then
 * post the ones that arrived as one entry. A failed photo says why and can be retried or
 * left out; the others are not lost.
 */
export function PhotoComposer({ jobPublicId, onPosted, defaultCaption = "" }: { jobPublicId: string; onPosted: () => void; defaultCaption?: string }) {
  const [items, setItems] = useState<Item[]>([]);
  const [caption, setCaption] = useState(defaultCaption);
  const [share, setShare] = useState(false);
  const [posting, setPosting] = useState(false);
  const [error, setError] = useState<string | null>(null);
  const [posted, setPosted] = useState<string | null>(null);
  const input = useRef<HTMLInputElement>(null);
  const id = useId();

  const patch = (key: string, change: Partial<Item>) => setItems((list) => list.map((it) => (it.key === key ? { ...it, ...change } : it)));

  async function upload(list: Item[]) {
    await runLimited(
      list.map((item) => async () => {
        if (item.file.size > MAX_MB * 1024 * 1024) {
          patch(item.key, { state: "failed", message: `${item.file.name} is larger than ${MAX_MB} MB.` });
          return;
        }
        if (browserOffline()) return patch(item.key, { state: "queued", progress: 0 });
        patch(item.key, { state: "uploading", progress: 0, message: undefined });
        const result = await uploadFile<{ photo: TimelinePhoto }>(`/api/jobs/${jobPublicId}/photos`, "photo", item.file, (f) => patch(item.key, { progress: f }));
        if (result.ok) patch(item.key, { state: "done", progress: 1, photo: result.data.photo });
        else if (result.status === 0) patch(item.key, { state: "queued", progress: 0 });
        else patch(item.key, { state: "failed", message: result.message });
      }),
      2,
    );
  }

  function pick(files: FileList | null) {
    if (!files?.length) return;
    setError(null);
    setPosted(null);
    const room = MAX_PHOTOS_PER_SET - items.length;
    const added = Array.from(files)
      .slice(0, Math.max(0, room))
      .map((file, i): Item => {
        // The wrong kind of file is named at once, with what a set takes; it is never sent.
        const problem = photoFileProblem(file);
        return { key: `${Date.now()}-${i}-${file.name}`, file, progress: 0, state: problem ? "failed" : "waiting", message: problem ?? undefined };
      });
    if (files.length > room) setError(`A set holds at most ${MAX_PHOTOS_PER_SET} photos; post these, then add more.`);
    setItems((list) => [...list, ...added]);
    if (input.current) input.current.value = "";
    void upload(added.filter((it) => it.state === "waiting"));
  }

  const done = items.filter((it) => it.state === "done" && it.photo);
  const queued = items.filter((it) => it.state === "queued");
  const busy = items.some((it) => it.state === "uploading" || it.state === "waiting");
  const failed = items.filter((it) => it.state === "failed");

  /** The set goes into the outbox: photos already uploaded by their id, the others as files kept on the phone. */
  async function keep() {
    const set = items.filter((it) => (it.state === "done" && it.photo) || it.state === "queued");
    await enqueue({
      kind: "photos",
      job: jobPublicId,
      label: `${set.length} photo${set.length === 1 ? "" : "s"}${caption ? `: ${caption}` : ""}`,
      payload: { caption, visibility: share ? "shared" : "shop" },
      files: set.map((it) => ({ name: it.file.name, type: it.file.type, size: it.file.size, blob: it.file, sentAs: it.photo?.id })),
    });
    setPosted(`Kept on this phone: ${set.length} photo${set.length === 1 ? "" : "s"}, sent by themselves when the connection is back (see “Waiting to send”).`);
    setItems([]);
    setCaption("");
    setShare(false);
  }

  async function post() {
    setPosting(true);
    setError(null);
    if (queued.length || browserOffline()) {
      await keep().catch((e: unknown) => setError(`Couldn't keep the set on this phone: ${(e as Error).message}`));
      setPosting(false);
      return;
    }
    try {
      await sendJson(`/api/jobs/${jobPublicId}/entries`, "POST", { kind: "photos", photoIds: done.map((it) => it.photo!.id), caption, visibility: share ? "shared" : "shop" });
      setPosted(`${done.length} photo${done.length === 1 ? "" : "s"} posted${failed.length ? `; ${failed.length} did not upload and ${failed.length === 1 ? "was" : "were"} left out` : ""}.`);
      setItems([]);
      setCaption("");
      setShare(false);
      onPosted();
    } catch (e) {
      setError((e as Error).message);
    } finally {
      setPosting(false);
    }
  }

  return (
    <div className="space-y-4">
      <div>
        <input
          ref={input}
          id={`${id}-files`}
          type="file"
          accept="image/jpeg,image/png,image/webp,image/*"
          multiple
          className="sr-only"
          onChange={(e) => pick(e.target.files)}
        />
        <label htmlFor={`${id}-files`} className="inline-flex min-h-14 w-full cursor-pointer items-center justify-center gap-2 rounded-lg bg-oil px-6 py-3 text-lg font-semibold text-oil-on hover:bg-oil/90 focus-within:outline focus-within:outline-2">
          <Camera aria-hidden className="size-6" />
          {items.length ? "Add more photos" : "Take or choose photos"}
        </label>
      </div>

      {items.length ? (
        <ul className="space-y-2" aria-label="Photos in this set">
          {items.map((it) => (
            <PickedFileRow
              key={it.key}
              name={it.file.name}
              outcome={it.state === "done" ? "good" : it.state === "failed" ? "failed" : null}
              actions={
                <>
                  {it.state === "failed" && !photoFileProblem(it.file) ? (
                    <Button variant="ghost" icon={<RotateCcw aria-hidden className="size-5" />} onClick={() => void upload([it])} aria-label={`Try ${it.file.name} again`}>
                      Retry
                    </Button>
                  ) : null}
                  {it.state !== "uploading" ? (
                    <Button variant="ghost" onClick={() => setItems((l) => l.filter((x) => x.key !== it.key))} aria-label={`Leave ${it.file.name} out`} icon={<X aria-hidden className="size-5" />} />
                  ) : null}
                </>
              }
            >
              <progress className="mt-2 h-3 w-full accent-oil" max={1} value={it.progress} aria-label={`Upload of ${it.file.name}`} />
              <p className="text-sm text-ink-muted" aria-live="polite">
                {it.state === "failed" ? (
                  <span className="text-rust">{it.message}</span>
                ) : it.state === "done" ? (
                  "Uploaded"
                ) : it.state === "queued" ? (
                  "No network: kept on this phone, sent with the set"
                ) : it.state === "uploading" ? (
                  `${Math.round(it.progress * 100)} %`
                ) : (
                  "Waiting…"
                )}
              </p>
            </PickedFileRow>
          ))}
        </ul>
      ) : null}

      <Field id={`${id}-caption`} label="Caption (optional)">
        <Input value={caption} onChange={(e) => setCaption(e.target.value)} maxLength={500} />
      </Field>
      <ShareWithOwner share={share} onChange={setShare} />
      {error ? <Alert tone="error">{error}</Alert> : null}
      {posted ? <Alert tone="success">{posted}</Alert> : null}
      <Button size="lg" fullWidth disabled={!(done.length + queued.length) || busy} loading={posting} onClick={() => void post()}>
        {busy ? "Uploading…" : done.length + queued.length ? `Post ${done.length + queued.length} photo${done.length + queued.length === 1 ? "" : "s"}` : "Post photos"}
      </Button>
    </div>
  );
}
