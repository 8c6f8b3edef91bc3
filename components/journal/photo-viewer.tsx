"use client";
import Lightbox from "yet-another-react-lightbox";
import Zoom from "yet-another-react-lightbox/plugins/zoom";
import "yet-another-react-lightbox/styles.css";
import type { TimelinePhoto } from "@/lib/journal";

export default function PhotoViewer({ photos, index, onClose }: { photos: TimelinePhoto[]; index: number; onClose: () => void }) {
  return (
    <Lightbox
      open
      index={index}
      close={onClose}
      plugins={[Zoom]}
      slides={photos.map((p) => ({ src: p.displayUrl, width: p.width, height: p.height, alt: `Photo ${photos.indexOf(p) + 1} of ${photos.length}` }))}
      carousel={{ finite: photos.length <= 1 }}
      controller={{ closeOnBackdropClick: true }}
    />
  );
}
