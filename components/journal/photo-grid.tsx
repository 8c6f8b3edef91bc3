"use client";
import { useState } from "react";
import dynamic from "next/dynamic";
import type { TimelinePhoto } from "@/lib/journal";
import { PhotoImg } from "./photo-img";

// The viewer's code loads only when someone opens a photo.
const PhotoViewer = dynamic(() => import("./photo-viewer"), { ssr: false });

/** A set's thumbnails; a tap opens the full-size viewer (swipe, pinch-zoom on phones). */
export function PhotoGrid({ photos, label }: { photos: TimelinePhoto[]; label: string }) {
  const [open, setOpen] = useState<number | null>(null);
  return (
    <>
      <ul className="grid grid-cols-3 gap-2 sm:grid-cols-4" aria-label={label}>
        {photos.map((photo, index) => (
          <li key={photo.id}>
            <button
              type="button"
              onClick={() => setOpen(index)}
              className="block aspect-square w-full overflow-hidden rounded-lg border border-line bg-sunken focus-visible:outline focus-visible:outline-2 focus-visible:outline-offset-2 focus-visible:outline-oil"
              aria-label={`Open photo ${index + 1} of ${photos.length}`}
            >
              {/* Three across on a phone, four from 640 px, in a column at most 768 px wide. */}
              <PhotoImg photo={photo} alt="" sizes="(min-width: 768px) 180px, (min-width: 640px) 25vw, 33vw" className="size-full object-cover" />
            </button>
          </li>
        ))}
      </ul>
      {open != null ? <PhotoViewer photos={photos} index={open} onClose={() => setOpen(null)} /> : null}
    </>
  );
}
