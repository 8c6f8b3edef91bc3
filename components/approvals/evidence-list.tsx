import { Film, Gauge } from "lucide-react";
import { ClipPlayer } from "@/components/journal/clip-player";
import { PhotoGrid } from "@/components/journal/photo-grid";
import type { EvidenceView } from "@/lib/server/approval-views";

const clock = (ms: number) => {
  const s = Math.floor(ms / 1000);
  return `${Math.floor(s / 60)}:${String(s % 60).padStart(2, "0")}`;
};

/**
 * A finding's evidence: photos as thumbnails (tap for full size), readings as words, and clip
 * moments as a player that starts at the marked moment.
 */
export function EvidenceList({ evidence }: { evidence: EvidenceView }) {
  if (!evidence.photos.length && !evidence.others.length) return null;
  return (
    <div className="space-y-2">
      <h3 className="font-semibold text-ink">What the shop saw</h3>
      {evidence.photos.length ? <PhotoGrid photos={evidence.photos} label="Photos of what was found" /> : null}
      {evidence.others.length ? (
        <ul className="space-y-1">
          {evidence.others.map((e) => (
            <li key={`${e.kind}:${e.ref}:${e.momentMs ?? ""}`} className="flex items-start gap-2">
              {e.kind === "reading" ? <Gauge aria-hidden className="mt-0.5 size-5 shrink-0 text-dusk" /> : <Film aria-hidden className="mt-0.5 size-5 shrink-0 text-dusk" />}
              <div className="min-w-0 flex-1 space-y-2">
                <p>
                  {e.kind === "reading" ? "Reading: " : `Clip${e.momentMs != null ? ` at ${clock(e.momentMs)}` : ""}: `}
                  {e.label}
                </p>
                {e.clip ? <ClipPlayer clip={e.clip} title={e.label} startTime={e.momentMs != null ? e.momentMs / 1000 : undefined} /> : null}
              </div>
            </li>
          ))}
        </ul>
      ) : null}
    </div>
  );
}
