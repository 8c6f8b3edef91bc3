"use client";
import Lightbox from "yet-another-react-lightbox";
import Zoom from "yet-another-react-lightbox/plugins/zoom";
import "yet-another-react-lightbox/styles.css";
// Our look over the library's default skin (after its stylesheet, so ours wins).
import "./photo-viewer.css";
import { type TimelinePhoto, photoSrcSet } from "@/lib/journal";

/** The viewer picks among our renditions and copies by the size it shows a slide at (photoSrcSet). */
function srcSetOf(photo: TimelinePhoto): { src: string; width: number; height: number }[] {
  return photoSrcSet(photo)
    .split(", ")
    .map((candidate) => {
      const [src = "", w = ""] = candidate.split(" ");
      const width = Number.parseInt(w, 10);
      return { src, width, height: Math.round((photo.height * width) / photo.width) };
    });
}

export default function PhotoViewer({ photos, index, onClose }: { photos: TimelinePhoto[]; index: number; onClose: () => void }) {
  return (
    <Lightbox
      open
      index={index}
      close={onClose}
      plugins={[Zoom]}
      slides={photos.map((p, i) => ({ src: p.displayUrl, width: p.width, height: p.height, srcSet: srcSetOf(p), alt: `Photo ${i + 1} of ${photos.length}` }))}
      carousel={{ finite: photos.length <= 1 }}
      controller={{ closeOnBackdropClick: true }}
      className="bs-photo-viewer"
      labels={{ Previous: "Previous photo", Next: "Next photo", Close: "Close the photo", "Zoom in": "Zoom in", "Zoom out": "Zoom out" }}
    />
  );
}
