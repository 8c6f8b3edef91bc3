"use client";
import { Camera, NotebookPen, Video } from "lucide-react";
import { useCallback, useEffect, useState } from "react";
import { Alert, Button, Card, Field, Input } from "@/components/ui";
import { EntryCard } from "@/components/journal/entry-card";
import { OutboxPanel } from "@/components/journal/outbox-panel";
import { TimelineView } from "@/components/journal/timeline-view";
import type { TimelineEntry } from "@/lib/journal";
import type { NoteDoc } from "@/lib/rich-text/note";
import { sendJson } from "@/lib/swr/fetcher";
import { useFailedClips } from "@/lib/swr/use-failed-clips";
import { type TimelineResponse, useJobTimeline } from "@/lib/swr/use-job-timeline";
import { collectedJobRefusal, type JobStatus } from "@/lib/job-status";
import { ClipComposer } from "./clip-composer";
import { EntryControls } from "./entry-controls";
import { FailedClips } from "./failed-clips";
import { NoteComposer } from "./note-composer";
import { PhotoComposer } from "./photo-composer";
import { StatusForm } from "./status-form";

type Props = {
  jobPublicId: string;
  status: JobStatus;
  mayChangeStatus: boolean;
  timeZone: string;
  mayModerate: boolean;
  initial: TimelineResponse;
  clipLimits: { maxSeconds: number; maxBytes: number };
  findingsPath: string | null;
  /** Opens the photo composer first, e.g. straight after check-in for intake photos. */
  startWith?: "note" | "photos" | "clip";
  intakeCaption?: string;
};

/** The staff side of a job's journal: the composer on top, the timeline under it. */
export function JobJournal({ jobPublicId, status, mayChangeStatus, timeZone, mayModerate, initial, clipLimits, findingsPath, startWith = "note", intakeCaption }: Props) {
  const [order, setOrder] = useState<"asc" | "desc">("desc");
  const [editing, setEditing] = useState<number | null>(null);
  const timeline = useJobTimeline(jobPublicId, order, order === "desc" ? initial : undefined);
  // Clips the video service rejects leave the timeline; their reasons come from this list.
  const clipsPending = timeline.entries.some((e) => e.clip?.status === "uploading" || e.clip?.status === "processing");
  const failed = useFailedClips(jobPublicId, clipsPending);
  const { mutate } = timeline;
  const { mutate: mutateFailed } = failed;
  const refresh = useCallback(() => {
    void mutate();
    void mutateFailed();
  }, [mutate, mutateFailed]);
  // A clip that stops being pending either turned playable or was turned down: ask at once which.
  useEffect(() => {
    if (!clipsPending) void mutateFailed();
  }, [clipsPending, mutateFailed]);

  const renderEntry = (entry: TimelineEntry, time: string) => (
    <EntryCard
      entry={entry}
      time={time}
      showVisibility
      controls={<EntryControls jobPublicId={jobPublicId} findingsPath={findingsPath} entry={entry} mayModerate={mayModerate} onChanged={refresh} onEdit={() => setEditing(entry.id)} />}
    >
      {editing === entry.id ? (
        <EntryEditor
          jobPublicId={jobPublicId}
          entry={entry}
          onDone={() => {
            setEditing(null);
            refresh();
          }}
          onCancel={() => setEditing(null)}
        />
      ) : undefined}
    </EntryCard>
  );

  return (
    <div className="space-y-6">
      <OutboxPanel jobPublicId={jobPublicId} onSent={refresh} />
      {mayChangeStatus ? (
        <Card as="section" title="Move the job on" headingId="status-heading">
          <StatusForm jobPublicId={jobPublicId} status={status} onMoved={refresh} />
        </Card>
      ) : null}
      {status === "picked_up" ? (
        <Card as="section" title="Add to the journal" headingId="composer-heading">
          <p>{collectedJobRefusal(status, "nothing new can be added to its journal")}</p>
        </Card>
      ) : (
        <ComposerCard jobPublicId={jobPublicId} clipLimits={clipLimits} startWith={startWith} intakeCaption={intakeCaption} onChanged={refresh} />
      )}

      <section aria-labelledby="timeline-heading" className="space-y-3">
        <h2 id="timeline-heading" className="text-xl font-bold text-ink">
          Journal
        </h2>
        <FailedClips jobPublicId={jobPublicId} clips={failed.data?.clips ?? []} onCleared={() => void mutateFailed()} />
        <TimelineView
          entries={timeline.entries}
          timeZone={timeZone}
          order={order}
          onOrderChange={setOrder}
          showVisibility
          loading={timeline.isLoading}
          error={timeline.error as Error | undefined}
          hasMore={timeline.hasMore}
          loadingMore={timeline.isValidating && timeline.size > (timeline.data?.length ?? 0)}
          onLoadMore={() => void timeline.setSize(timeline.size + 1)}
          empty={{ title: "Nothing in the journal yet", description: "Post a note or photos from the bench. Entries stay shop-only until you share them." }}
          renderEntry={renderEntry}
        />
      </section>
    </div>
  );
}

function EntryEditor({ jobPublicId, entry, onDone, onCancel }: { jobPublicId: string; entry: TimelineEntry; onDone: () => void; onCancel: () => void }) {
  const [caption, setCaption] = useState(entry.caption ?? "");
  const [saving, setSaving] = useState(false);
  const [error, setError] = useState<string | null>(null);
  if (entry.kind === "note") {
    return <NoteComposer target={{ kind: "edit", jobPublicId, entryId: entry.id, version: entry.version ?? 1, doc: entry.body as NoteDoc }} onDone={onDone} onCancel={onCancel} />;
  }
  async function save() {
    setSaving(true);
    setError(null);
    try {
      await sendJson(`/api/jobs/${jobPublicId}/entries/${entry.id}`, "PATCH", { version: entry.version, caption });
      onDone();
    } catch (e) {
      setError((e as Error).message);
    } finally {
      setSaving(false);
    }
  }
  return (
    <div className="space-y-3">
      <Field id={`caption-${entry.id}`} label="Caption">
        <Input value={caption} onChange={(e) => setCaption(e.target.value)} maxLength={500} />
      </Field>
      {error ? <Alert tone="error">{error}</Alert> : null}
      <div className="flex gap-2">
        <Button loading={saving} onClick={() => void save()}>
          Save caption
        </Button>
        <Button variant="secondary" onClick={onCancel}>
          Cancel
        </Button>
      </div>
    </div>
  );
}

/** The composer: a note, a photo set or a clip, one tab each. */
function ComposerCard({
  jobPublicId,
  clipLimits,
  startWith,
  intakeCaption,
  onChanged,
}: Pick<Props, "jobPublicId" | "clipLimits" | "intakeCaption"> & { startWith: NonNullable<Props["startWith"]>; onChanged: () => void }) {
  const [tab, setTab] = useState<"note" | "photos" | "clip">(startWith);
  return (
    <Card as="section" title="Add to the journal" headingId="composer-heading" className="scroll-mt-4">
      <div id="composer" role="tablist" aria-label="What to add" className="mb-4 grid grid-cols-3 gap-2">
        {(
          [
            ["note", "Note", NotebookPen],
            ["photos", "Photos", Camera],
            ["clip", "Clip", Video],
          ] as const
        ).map(([value, label, Icon]) => (
          <button
            key={value}
            type="button"
            role="tab"
            id={`tab-${value}`}
            aria-selected={tab === value}
            aria-controls={`panel-${value}`}
            onClick={() => setTab(value)}
            className="inline-flex min-h-14 items-center justify-center gap-2 rounded-lg border border-line-strong font-semibold text-ink aria-selected:border-oil aria-selected:bg-oil aria-selected:text-oil-on"
          >
            <Icon aria-hidden className="size-6" />
            {label}
          </button>
        ))}
      </div>
      <div role="tabpanel" id={`panel-${tab}`} aria-labelledby={`tab-${tab}`}>
        {tab === "note" ? (
          <NoteComposer target={{ kind: "new", jobPublicId }} onDone={onChanged} />
        ) : tab === "photos" ? (
          <PhotoComposer jobPublicId={jobPublicId} onPosted={onChanged} defaultCaption={intakeCaption} />
        ) : (
          <ClipComposer jobPublicId={jobPublicId} limits={clipLimits} onStarted={onChanged} />
        )}
      </div>
    </Card>
  );
}
