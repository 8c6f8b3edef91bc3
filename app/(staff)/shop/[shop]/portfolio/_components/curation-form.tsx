"use client";
import { useMemo, useState } from "react";
import type { JSONContent } from "@tiptap/react";
import { FormError, useBenchForm } from "@/components/bench/action-form";
import { PhotoImg } from "@/components/journal/photo-img";
import { NoteEditor } from "@/components/rich-text/note-editor";
import { Button, Card, Field, Input } from "@/components/ui";
import type { TimelineEntry } from "@/lib/journal";
import type { StoryItemKind } from "@/lib/portfolio";
import { curateAction } from "../actions";
import { type Checklist, Choices, type DraftItem, ItemList, entryLabel, itemLabel, newKey } from "./story-items";
import { FORM_VISIBLE } from "@/lib/form-visible";

// Curating a story: title, address, write-up, cover, and which shared entries appear in what
// order. Everything is controlled state posted in one form; the server checks it all again
// (only this job's shared entries; no owner's name, serial or price in the words).

type Props = {
  shopSlug: string;
  timeZone: string;
  story: { id: number; version: number; title: string; slug: string; writeUp: unknown; cover: string | null };
  items: { kind: StoryItemKind; entryId: number | null; photoPublicId: string | null; momentMs: number | null; caption: string | null }[];
  entries: TimelineEntry[];
  checklist: Checklist;
};

export function CurationForm({ shopSlug, timeZone, story, items: initial, entries, checklist }: Props) {
  const when = useMemo(() => new Intl.DateTimeFormat("en-US", { timeZone, month: "short", day: "numeric", hour: "numeric", minute: "2-digit" }), [timeZone]);
  const labelled = useMemo(() => entries.map((entry) => ({ entry, label: entryLabel(entry, when.format(new Date(entry.createdAt))) })), [entries, when]);
  const byId = useMemo(() => new Map(labelled.map((l) => [l.entry.id, l])), [labelled]);
  const photos = useMemo(() => labelled.flatMap(({ entry, label }) => entry.photos.map((p, i) => ({ ...p, label: `Photo ${i + 1} of: ${label}` }))), [labelled]);

  const [title, setTitle] = useState(story.title);
  const [slug, setSlug] = useState(story.slug);
  const [cover, setCover] = useState(story.cover ?? "");
  const [items, setItems] = useState<DraftItem[]>(() =>
    initial.map((it, i) => ({ key: `saved-${i}`, kind: it.kind, entryId: it.entryId, photoId: it.photoPublicId, momentSeconds: it.momentMs == null ? "" : String(it.momentMs / 1000), caption: it.caption ?? "" })),
  );
  const form = useBenchForm(curateAction, { visible: FORM_VISIBLE.storyCuration });
  const payload = JSON.stringify(
    items.map((it) => ({ kind: it.kind, entryId: it.entryId, photoId: it.photoId, momentSeconds: it.momentSeconds.trim() === "" ? null : Number(it.momentSeconds), caption: it.caption })),
  );

  return (
    <form action={form.formAction} className="space-y-6">
      <input type="hidden" name="shop" value={shopSlug} />
      <input type="hidden" name="story" value={story.id} />
      <input type="hidden" name="version" value={story.version} />
      <input type="hidden" name="items" value={payload} />
      <input type="hidden" name="cover" value={cover} />
      <FormError message={form.formError} />

      <Card as="section" title="Words" headingId="story-words">
        <div className="space-y-4">
          <Field id="story-title" label="Title" hint="What was done, in a few words. No names, serial numbers or prices." error={form.fieldError("title")} required>
            <Input name="title" value={title} maxLength={120} onChange={(e) => setTitle(e.target.value)} />
          </Field>
          <Field id="story-slug" label="Web address" hint={`/s/${shopSlug}/${slug || "…"}`} error={form.fieldError("slug")} required>
            <Input name="slug" value={slug} maxLength={80} autoCapitalize="none" spellCheck={false} onChange={(e) => setSlug(e.target.value.toLowerCase())} />
          </Field>
          <div className="space-y-1.5">
            <p id="writeup-label" className="font-semibold text-ink">
              Write-up (optional)
            </p>
            <NoteEditor
              labelledBy="writeup-label"
              name="writeUp"
              defaultValue={(story.writeUp as JSONContent | null) ?? undefined}
              placeholder="What came in, what you found, what you did."
              invalid={!!form.fieldError("writeUp")}
              describedBy={form.fieldError("writeUp") ? "writeup-error" : undefined}
            />
            {form.fieldError("writeUp") ? (
              <p id="writeup-error" className="text-sm font-medium text-rust">
                {form.fieldError("writeUp")}
              </p>
            ) : null}
          </div>
        </div>
      </Card>

      <Card as="section" title="Cover photo" headingId="story-cover" description="Shown on the shop's page and in link previews.">
        {photos.length ? (
          <fieldset className="space-y-2">
            <legend className="sr-only">Cover photo</legend>
            {form.fieldError("cover") ? <p className="text-sm font-medium text-rust">{form.fieldError("cover")}</p> : null}
            <div className="flex flex-wrap gap-3">
              <label className="flex min-h-tap cursor-pointer items-center gap-2 rounded-lg border border-line px-3">
                <input type="radio" name="cover-choice" className="size-5 accent-oil" checked={cover === ""} onChange={() => setCover("")} />
                No cover
              </label>
              {photos.map((p) => (
                <label key={p.id} className="flex cursor-pointer items-center gap-2 rounded-lg border border-line p-2">
                  <input type="radio" name="cover-choice" className="size-5 accent-oil" checked={cover === p.id} onChange={() => setCover(p.id)} aria-label={`Cover: ${p.label}`} />
                  <PhotoImg photo={p} alt="" sizes="64px" className="size-16 rounded-md object-cover" />
                </label>
              ))}
            </div>
          </fieldset>
        ) : (
          <p className="text-ink-muted">No shared photos on this job yet.</p>
        )}
      </Card>

      <div className="grid gap-4 lg:grid-cols-2">
        <Card as="section" title="Shared entries of this job" headingId="story-choices" description="Only what was shared with the owner can be shown. Shop-only entries never appear here.">
          <Choices entries={labelled} checklist={checklist} onAdd={(it) => setItems((list) => [...list, { ...it, key: newKey(), caption: "", momentSeconds: "" }])} />
        </Card>
        <Card as="section" title="In the story" headingId="story-items" description="In the order the public reads them.">
          <ItemList items={items} labelOf={(it) => itemLabel(it, byId, checklist)} onChange={setItems} errors={(i) => form.fieldError(`items.${i}.caption`) ?? form.fieldError(`items.${i}`)} />
        </Card>
      </div>

      <div className="flex flex-wrap items-center gap-3">
        <Button type="submit" size="lg" loading={form.pending}>
          Save the story
        </Button>
        {form.state?.ok ? <p role="status">{form.state.data.reasked ? "Saved. The owner had agreed to other words: they are asked about this version, and it stays private until they agree." : "Saved."}</p> : null}
      </div>
    </form>
  );
}
