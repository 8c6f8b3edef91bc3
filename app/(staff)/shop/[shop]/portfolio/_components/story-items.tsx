"use client";
import { ArrowDown, ArrowUp, Plus, Trash2 } from "lucide-react";
import { PhotoImg } from "@/components/journal/photo-img";
import { Button, Field, Input } from "@/components/ui";
import { formatDuration } from "@/lib/clips";
import type { TimelineEntry } from "@/lib/journal";
import { STORY_ITEM_LABEL, type StoryItemKind } from "@/lib/portfolio";

// The story's items while curating: what the job's shared entries offer, and the ordered list the
// story will show, with a caption each (and where a clip starts). Pure UI state; the server checks
// every item again against the job when the form is saved.

export type DraftItem = { key: string; kind: StoryItemKind; entryId: number | null; photoId: string | null; momentSeconds: string; caption: string };
export type Checklist = { done: number; total: number; percent: number } | null;

let counter = 0;
export const newKey = () => `item-${++counter}`;

export function entryLabel(entry: TimelineEntry, when: string): string {
  if (entry.kind === "photos") return `Photo set of ${entry.photos.length}, ${when}${entry.caption ? `: ${entry.caption}` : ""}`;
  if (entry.kind === "clip") return `Clip${entry.clip?.durationSeconds != null ? ` (${formatDuration(entry.clip.durationSeconds)})` : ""}, ${when}${entry.caption ? `: ${entry.caption}` : ""}`;
  const fastener = (entry.body as { fastener?: unknown } | null)?.fastener;
  return `Torque record, ${when}${typeof fastener === "string" ? `: ${fastener}` : ""}`;
}

export function itemLabel(item: DraftItem, entries: Map<number, { entry: TimelineEntry; label: string }>, checklist: Checklist): string {
  if (item.kind === "checklist") return `${STORY_ITEM_LABEL.checklist}${checklist ? ` (${checklist.percent} %)` : ""}`;
  const found = item.entryId ? entries.get(item.entryId) : undefined;
  if (!found) return `${STORY_ITEM_LABEL[item.kind]} (no longer shared: remove it)`;
  if (item.kind === "photo") {
    const n = found.entry.photos.findIndex((p) => p.id === item.photoId) + 1;
    return `Photo ${n} of: ${found.label}`;
  }
  return found.label;
}

const addWords = (entry: TimelineEntry) => (entry.kind === "clip" ? (entry.clip?.status === "ready" ? "Add the clip" : "Clip not ready yet") : "Add the record");

export function Choices({
  entries,
  checklist,
  onAdd,
}: {
  entries: { entry: TimelineEntry; label: string }[];
  checklist: Checklist;
  onAdd: (item: Omit<DraftItem, "key" | "caption" | "momentSeconds">) => void;
}) {
  if (!entries.length && !checklist) {
    return <p className="text-ink-muted">Nothing on this job is shared with the owner yet. Only shared photos, clips and torque records can go in a story.</p>;
  }
  return (
    <ul className="space-y-3" aria-label="Shared entries of this job">
      {entries.map(({ entry, label }) => (
        <li key={entry.id} className="space-y-2 rounded-lg border border-line p-3">
          <p className="font-semibold text-ink">{label}</p>
          {entry.kind === "photos" ? (
            <>
              <Button variant="secondary" icon={<Plus aria-hidden className="size-5" />} aria-label={`Add the whole set: ${label}`} onClick={() => onAdd({ kind: "photos", entryId: entry.id, photoId: null })}>
                Add the whole set
              </Button>
              <ul className="flex flex-wrap gap-2" aria-label={`Photos of: ${label}`}>
                {entry.photos.map((p, i) => (
                  <li key={p.id} className="flex flex-col items-center gap-1">
                    <PhotoImg photo={p} alt={`Photo ${i + 1}`} sizes="80px" className="size-20 rounded-md border border-line object-cover" />
                    <Button variant="ghost" aria-label={`Add photo ${i + 1} of: ${label}`} onClick={() => onAdd({ kind: "photo", entryId: entry.id, photoId: p.id })}>
                      Add
                    </Button>
                  </li>
                ))}
              </ul>
            </>
          ) : (
            <Button
              variant="secondary"
              icon={<Plus aria-hidden className="size-5" />}
              // The visible words start the name (WCAG 2.5.3), the entry tells which one.
              aria-label={`${addWords(entry)}: ${label}`}
              disabled={entry.kind === "clip" && entry.clip?.status !== "ready"}
              onClick={() => onAdd({ kind: entry.kind === "clip" ? "clip" : "torque", entryId: entry.id, photoId: null })}
            >
              {addWords(entry)}
            </Button>
          )}
        </li>
      ))}
      {checklist ? (
        <li className="space-y-2 rounded-lg border border-line p-3">
          <p className="font-semibold text-ink">
            Reassembly progress: {checklist.done} of {checklist.total} steps ({checklist.percent} %)
          </p>
          <Button variant="secondary" icon={<Plus aria-hidden className="size-5" />} onClick={() => onAdd({ kind: "checklist", entryId: null, photoId: null })}>
            Add reassembly progress
          </Button>
        </li>
      ) : null}
    </ul>
  );
}

export function ItemList({
  items,
  labelOf,
  onChange,
  errors,
}: {
  items: DraftItem[];
  labelOf: (item: DraftItem) => string;
  onChange: (items: DraftItem[]) => void;
  errors: (i: number) => string | undefined;
}) {
  if (!items.length) return <p className="text-ink-muted">Nothing in the story yet: add entries from the list of shared entries.</p>;
  const move = (from: number, to: number) => {
    const next = [...items];
    const [it] = next.splice(from, 1);
    next.splice(to, 0, it!);
    onChange(next);
  };
  const patch = (i: number, change: Partial<DraftItem>) => onChange(items.map((it, j) => (j === i ? { ...it, ...change } : it)));
  return (
    <ol className="space-y-3" aria-label="In the story, in order">
      {items.map((item, i) => {
        const label = labelOf(item);
        return (
          <li key={item.key} aria-label={`Item ${i + 1}: ${label}`} className="space-y-2 rounded-lg border border-line bg-surface p-3">
            <div className="flex flex-wrap items-center gap-2">
              <span className="min-w-0 flex-1 font-semibold text-ink">
                {i + 1}. {label}
              </span>
              <Button variant="ghost" aria-label={`Move item ${i + 1} up`} disabled={i === 0} onClick={() => move(i, i - 1)} icon={<ArrowUp aria-hidden className="size-5" />} />
              <Button variant="ghost" aria-label={`Move item ${i + 1} down`} disabled={i === items.length - 1} onClick={() => move(i, i + 1)} icon={<ArrowDown aria-hidden className="size-5" />} />
              <Button variant="ghost" aria-label={`Remove item ${i + 1}`} onClick={() => onChange(items.filter((_, j) => j !== i))} icon={<Trash2 aria-hidden className="size-5" />} />
            </div>
            <div className="grid gap-2 sm:grid-cols-[1fr_auto]">
              <Field id={`${item.key}-caption`} label="Caption for the public (optional)" error={errors(i)}>
                <Input value={item.caption} maxLength={300} onChange={(e) => patch(i, { caption: e.target.value })} />
              </Field>
              {item.kind === "clip" ? (
                <Field id={`${item.key}-moment`} label="Start at (seconds)">
                  <Input inputMode="decimal" value={item.momentSeconds} maxLength={8} onChange={(e) => patch(i, { momentSeconds: e.target.value })} className="sm:w-32" />
                </Field>
              ) : null}
            </div>
          </li>
        );
      })}
    </ol>
  );
}
