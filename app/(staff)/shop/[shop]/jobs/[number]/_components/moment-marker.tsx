"use client";
import { MapPin } from "lucide-react";
import { useId, useState } from "react";
import { Alert, Button, Input } from "@/components/ui";
import { sendJson } from "@/lib/swr/fetcher";

/** The video of this entry's clip player (components/journal/clip-player.tsx), and where it is now. */
export function playerTime(entryId: number): number {
  const player = document.querySelector<HTMLMediaElement>(`[data-entry-id="${entryId}"] video[data-clip-player]`);
  return player?.currentTime ?? 0;
}

/** Marks the moment the clip is paused at, with a few words on what is seen there. */
export function MomentMarker({ jobPublicId, entryId, clipId, onMarked }: { jobPublicId: string; entryId: number; clipId: string; onMarked: () => void }) {
  const [label, setLabel] = useState("");
  const [busy, setBusy] = useState(false);
  const [error, setError] = useState<string | null>(null);
  const id = useId();

  async function mark() {
    setBusy(true);
    setError(null);
    const at = playerTime(entryId);
    try {
      await sendJson(`/api/jobs/${jobPublicId}/clips/${clipId}/moments`, "POST", { atSeconds: at, label });
      setLabel("");
      onMarked();
    } catch (e) {
      setError((e as Error).message);
    } finally {
      setBusy(false);
    }
  }

  return (
    <div className="flex w-full flex-wrap items-end gap-2">
      <label htmlFor={id} className="sr-only">
        What is seen at this moment
      </label>
      <Input id={id} value={label} onChange={(e) => setLabel(e.target.value)} maxLength={120} placeholder="What is seen here, e.g. slider wear" className="min-w-0 flex-1" />
      <Button variant="secondary" loading={busy} disabled={!label.trim()} onClick={() => void mark()} icon={<MapPin aria-hidden className="size-5" />}>
        Mark this moment
      </Button>
      {error ? <Alert tone="error">{error}</Alert> : null}
      <p className="w-full text-sm text-ink-muted">Pause the clip where it shows, then mark it.</p>
    </div>
  );
}
