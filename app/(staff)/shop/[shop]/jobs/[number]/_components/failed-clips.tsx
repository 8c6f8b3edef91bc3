"use client";
import { X } from "lucide-react";
import { useState } from "react";
import { Alert, Button } from "@/components/ui";
import type { FailedClip } from "@/lib/clips";
import { sendJson } from "@/lib/swr/fetcher";

/**
 * Clips the video service rejected (not a video, a failed upload, too long once processed). They
 * are not in the journal; this says which and why until someone clears them.
 */
export function FailedClips({ jobPublicId, clips, onCleared }: { jobPublicId: string; clips: FailedClip[]; onCleared: () => void }) {
  const [clearing, setClearing] = useState<string | null>(null);
  const [error, setError] = useState<string | null>(null);
  if (!clips.length) return null;

  async function clear(id: string) {
    setClearing(id);
    setError(null);
    try {
      await sendJson(`/api/jobs/${encodeURIComponent(jobPublicId)}/clips/${encodeURIComponent(id)}`, "DELETE", undefined);
      onCleared();
    } catch (e) {
      setError((e as Error).message);
    } finally {
      setClearing(null);
    }
  }

  return (
    <Alert tone="warning" title={clips.length === 1 ? "A clip couldn't be used" : `${clips.length} clips couldn't be used`}>
      <p className="mb-2">They were not added to the journal and their video was not kept. Check the file plays on the phone, then send it again.</p>
      <ul className="space-y-2" aria-label="Clips that couldn't be used">
        {clips.map((clip) => (
          <li key={clip.id} className="flex items-start gap-2">
            <span className="min-w-0 flex-1">
              <span className="font-semibold">{clip.name || "A clip"}</span>: {clip.error}
            </span>
            <Button
              variant="ghost"
              loading={clearing === clip.id}
              aria-label={`Clear ${clip.name || "this clip"} from the list`}
              onClick={() => void clear(clip.id)}
              icon={<X aria-hidden className="size-5" />}
            >
              Clear
            </Button>
          </li>
        ))}
      </ul>
      {error ? <p className="mt-2 text-rust">{error}</p> : null}
    </Alert>
  );
}
