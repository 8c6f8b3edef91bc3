"use client";
import { useId, useState } from "react";
import { LazyNoteEditor as NoteEditor } from "@/components/rich-text/lazy-note-editor";
import { Alert, Button } from "@/components/ui";
import type { NoteDoc } from "@/lib/rich-text/note";
import { FetchError, sendJson } from "@/lib/swr/fetcher";
import { browserOffline, enqueue } from "@/lib/client/bench-outbox";

// The editor is the heaviest thing on the page: it is fetched on the first focus or touch of
// the note box (LazyNoteEditor), not when the page mounts.

type Props = {
  /** Where the note goes: a new entry (POST) or an existing one (PATCH with its version). */
  target: { kind: "new"; jobPublicId: string } | { kind: "edit"; jobPublicId: string; entryId: number; version: number; doc: NoteDoc };
  onDone: () => void;
  onCancel?: () => void;
};

/** Writes a note; the server checks it against the note schema and answers in plain words. */
export function NoteComposer({ target, onDone, onCancel }: Props) {
  const [doc, setDoc] = useState<unknown>(target.kind === "edit" ? target.doc : null);
  const [share, setShare] = useState(false);
  const [saving, setSaving] = useState(false);
  const [error, setError] = useState<string | null>(null);
  const [queued, setQueued] = useState(false);
  const [generation, setGeneration] = useState(0);
  const labelId = useId();

  async function save() {
    setSaving(true);
    setError(null);
    setQueued(false);
    try {
      if (target.kind === "new") {
        const post = { kind: "note", note: doc ?? { type: "doc" }, visibility: share ? "shared" : "shop" };
        // No network (or no answer at all): the note waits in the phone's outbox, share choice included.
        const keep = () => enqueue({ kind: "note", job: target.jobPublicId, label: "Note", payload: post }).then(() => setQueued(true));
        if (browserOffline()) await keep();
        else
          await sendJson(`/api/jobs/${target.jobPublicId}/entries`, "POST", post).catch((e: unknown) => {
            if (e instanceof FetchError) throw e;
            return keep();
          });
        setDoc(null);
        setShare(false);
        setGeneration((g) => g + 1); // remounts the editor empty
      } else {
        await sendJson(`/api/jobs/${target.jobPublicId}/entries/${target.entryId}`, "PATCH", { version: target.version, note: doc });
      }
      onDone();
    } catch (e) {
      setError((e as Error).message);
    } finally {
      setSaving(false);
    }
  }

  return (
    <div className="space-y-3">
      <p id={labelId} className="font-semibold text-ink">
        {target.kind === "new" ? "Note" : "Edit note"}
      </p>
      <NoteEditor key={generation} labelledBy={labelId} defaultValue={target.kind === "edit" ? target.doc : undefined} onChange={setDoc} />
      {target.kind === "new" ? (
        <label className="flex min-h-tap items-center gap-3">
          <input type="checkbox" checked={share} onChange={(e) => setShare(e.target.checked)} className="size-6 accent-oil" />
          <span>Share with the owner now (otherwise shop only)</span>
        </label>
      ) : null}
      {error ? <Alert tone="error">{error}</Alert> : null}
      {queued ? <Alert tone="info">Kept on this phone: the note is sent by itself when the connection is back (see “Waiting to send”).</Alert> : null}
      <div className="flex flex-wrap gap-2">
        <Button size="lg" className="flex-1" loading={saving} onClick={() => void save()}>
          {target.kind === "new" ? "Post note" : "Save changes"}
        </Button>
        {onCancel ? (
          <Button size="lg" variant="secondary" onClick={onCancel}>
            Cancel
          </Button>
        ) : null}
      </div>
    </div>
  );
}
