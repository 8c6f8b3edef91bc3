import { BoltPattern } from "@/components/bench/bolt-pattern";
import { TorqueValue } from "@/components/bench/torque-value";
import { ClipPlayer } from "@/components/journal/clip-player";
import { PhotoGrid } from "@/components/journal/photo-grid";
import { PhotoImg } from "@/components/journal/photo-img";
import { ReassemblyProgress } from "@/components/journal/reassembly-progress";
import { NoteView } from "@/components/rich-text/note-view";
import { Caution } from "@/components/ui";
import { sentenceCase } from "@/lib/bench";
import { CAUTIONS } from "@/lib/cautions";
import type { PublicStory, PublicStoryItem } from "@/lib/portfolio";
import { crossPatternOrder } from "@/lib/tightening-order";

// One published story as the public reads it, phone first: title, machine, cover, write-up, then
// the curated items in order. Everything comes from a PublicStory (lib/portfolio.ts), which holds
// nothing private; this component only lays it out. Clips load lazily (ClipPlayer); photos open
// in the viewer.

/** coverInline: the cover at 1× phone width inside the page (lib/server/photos.ts photoInlineCopy), shown until the full-density cover arrives. */
export function StoryView({ story, coverInline = null }: { story: PublicStory; coverInline?: { uri: string } | null }) {
  const published = new Intl.DateTimeFormat("en-US", { year: "numeric", month: "long", day: "numeric", timeZone: "UTC" }).format(new Date(story.publishedAt));
  return (
    <article aria-labelledby="story-title" className="space-y-6">
      <header className="space-y-2">
        <p className="text-sm font-semibold uppercase tracking-wide text-oil">{story.machine.kindLabel}</p>
        <h1 id="story-title" className="text-3xl font-extrabold leading-tight text-ink sm:text-4xl">
          {story.title}
        </h1>
        <p className="text-ink-muted">
          {story.machine.label} · worked on at {story.shop.name} · published <time dateTime={story.publishedAt}>{published}</time>
        </p>
      </header>
      {story.cover ? (
        <figure className="relative overflow-hidden rounded-xl border border-line bg-sunken">
          {coverInline ? (
            // A few kB inside the page: the cover itself at the phone's 1× width, painted with the
            // first screen even on a slow line; the full-density photo covers it once it has arrived.
            // eslint-disable-next-line @next/next/no-img-element -- an inline data: URI, nothing to optimise
            <img src={coverInline.uri} alt="" aria-hidden decoding="sync" className="absolute inset-0 size-full object-cover" />
          ) : null}
          {/* The page's largest image: fetched first, at the width of the column (768 px less its padding). */}
          <PhotoImg
            photo={story.cover}
            priority
            sizes="(min-width: 768px) 736px, calc(100vw - 2rem)"
            alt={`${story.machine.label}, the machine in this story`}
            className="relative h-auto w-full object-cover"
          />
        </figure>
      ) : null}
      {story.writeUp ? <NoteView doc={story.writeUp} headingLevel={2} className="max-w-prose text-lg" /> : null}
      {story.items.length ? (
        <ol className="space-y-6" aria-label="From the bench">
          {story.items.map((item, i) => (
            <li key={i}>
              <StoryItem item={item} index={i} machine={story.machine.label} />
            </li>
          ))}
        </ol>
      ) : null}
      <p className="border-t border-line pt-4 text-sm text-ink-muted">Shown with the machine owner&apos;s consent. Names, serial numbers and prices are never published.</p>
    </article>
  );
}

function Caption({ text }: { text: string | null }) {
  return text ? <p className="whitespace-pre-line text-ink">{text}</p> : null;
}

function StoryItem({ item, index, machine }: { item: PublicStoryItem; index: number; machine: string }) {
  const box = "space-y-3 rounded-xl border border-line bg-surface p-4 shadow-sm";
  switch (item.kind) {
    case "photos":
      return (
        <section className={box} aria-label={`Photos, part ${index + 1}`}>
          <Caption text={item.caption} />
          <PhotoGrid photos={item.photos} label={item.caption ? `Photos: ${item.caption}` : `Photos of the ${machine}`} />
        </section>
      );
    case "photo":
      return (
        <section className={box} aria-label={`Photo, part ${index + 1}`}>
          <Caption text={item.caption} />
          <PhotoGrid photos={[item.photo]} label={item.caption ? `Photo: ${item.caption}` : `Photo of the ${machine}`} />
        </section>
      );
    case "clip":
      return (
        <section className={box} aria-label={`Clip, part ${index + 1}`}>
          <Caption text={item.caption} />
          <ClipPlayer clip={item.clip} title={item.caption ?? `Clip from the bench: ${machine}`} startTime={item.startSeconds ?? undefined} />
        </section>
      );
    case "torque": {
      const t = item.torque;
      return (
        <section className={box} aria-label={`Torque record, part ${index + 1}`}>
          <h2 className="text-lg font-bold text-ink">Torque record: {t.fastener}</h2>
          <Caption text={item.caption} />
          <TorqueValue value={t.specValue} unit={t.unit} displayUnit={t.displayUnit} />
          <p>{sentenceCase(t.proof)}.</p>
          {t.pattern === "cross" && t.boltCount ? <BoltPattern count={t.boltCount} order={crossPatternOrder(t.boltCount)} size={200} /> : null}
          <Caution title="A record of this job, not instructions">
            Values are for this machine as the shop recorded them. {CAUTIONS.torque.text}
          </Caution>
        </section>
      );
    }
    case "checklist":
      return (
        <div className="space-y-2">
          <Caption text={item.caption} />
          <ReassemblyProgress {...item.progress} headingId={`reassembly-${index}`} />
        </div>
      );
  }
}
