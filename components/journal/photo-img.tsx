import { type TimelinePhoto, photoSrcSet } from "@/lib/journal";

// One photo as an <img> with a srcset of our own renditions and copies (lib/journal.ts,
// photoSrcSet) and the `sizes` the caller lays it out at, so a phone fetches a photo near the
// size it shows. Photos are served by our own authorised routes (each copy checked like the
// original), so next/image's optimiser, which fetches without the reader's session, isn't used.
// No "use client": it renders the same on the server and inside client components.

type Props = {
  photo: Pick<TimelinePhoto, "width" | "height" | "thumbUrl" | "displayUrl">;
  /** How wide the image is laid out, as the `sizes` attribute says it ("(min-width: 768px) 768px, 100vw"). */
  sizes: string;
  alt: string;
  className?: string;
  /** The page's main image (a story's cover): fetched first, not lazily. */
  priority?: boolean;
};

export function PhotoImg({ photo, sizes, alt, className, priority = false }: Props) {
  return (
    // eslint-disable-next-line @next/next/no-img-element -- see above: our own routes, our own srcset
    <img
      src={priority ? photo.displayUrl : photo.thumbUrl}
      srcSet={photoSrcSet(photo)}
      sizes={sizes}
      alt={alt}
      width={photo.width}
      height={photo.height}
      loading={priority ? "eager" : "lazy"}
      fetchPriority={priority ? "high" : undefined}
      decoding={priority ? undefined : "async"}
      className={className}
    />
  );
}
