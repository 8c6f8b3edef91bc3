import clsx from "clsx";
import dynamic from "next/dynamic";
import { ArrowRight, Eye, Lock } from "lucide-react";
import type { ReactNode } from "react";
import { Badge } from "@/components/ui";
import { NoteView } from "@/components/rich-text/note-view";
import { StatusBadge } from "@/components/status-badge";
import { ENTRY_KIND_LABEL, type TimelineEntry, VISIBILITY_LABEL, isStatusBody } from "@/lib/journal";
import type { NoteDoc } from "@/lib/rich-text/note";
import { ClipPlayer } from "./clip-player";
import { isBenchEntry } from "./bench-kinds";
import { PhotoGrid } from "./photo-grid";

// The bodies of bench, approval and money entries are their own chunks, fetched when a page shows
// such an entry (rendered on the server all the same): most of a timeline is notes and photos,
// and the customer's page stays light (DESIGN §5 First Load JS).
const BenchEntryBody = dynamic(() => import("./bench-entry-body").then((m) => m.BenchEntryBody));
const ApprovalEntryBody = dynamic(() => import("@/components/approvals/approval-entry-body").then((m) => m.ApprovalEntryBody));
const MoneyEntryBody = dynamic(() => import("@/components/invoices/money-entry-body").then((m) => m.MoneyEntryBody));

export function VisibilityBadge({ visibility }: { visibility: TimelineEntry["visibility"] }) {
  return visibility === "shared" ? (
    <Badge tone="moss" icon={Eye}>
      {VISIBILITY_LABEL.shared}
    </Badge>
  ) : (
    <Badge tone="neutral" icon={Lock}>
      {VISIBILITY_LABEL.shop}
    </Badge>
  );
}

/** One timeline entry as read by anyone allowed to see it; staff controls come in through `controls`. */
export function EntryCard({
  entry,
  time,
  showVisibility,
  controls,
  children,
}: {
  entry: TimelineEntry;
  time: string;
  showVisibility: boolean;
  controls?: ReactNode;
  /** Replaces the body, e.g. with an editor while editing. */
  children?: ReactNode;
}) {
  const label = entry.kind === "photos" ? `${entry.photos.length} photo${entry.photos.length === 1 ? "" : "s"}` : entry.kind === "status" ? "Status change" : ENTRY_KIND_LABEL[entry.kind];
  return (
    <article
      aria-label={`${label} by ${entry.author?.name ?? "the shop"} at ${time}`}
      data-entry-id={entry.id}
      className={clsx("rounded-xl border bg-surface p-4 shadow-sm", entry.visibility === "shared" ? "border-line" : "border-dashed border-line-strong")}
    >
      <header className="mb-2 flex flex-wrap items-center gap-x-3 gap-y-1 text-sm text-ink-muted">
        <span className="font-semibold text-ink">{entry.author?.name ?? "The shop"}</span>
        <time dateTime={entry.createdAt}>{time}</time>
        {entry.editedAt ? <span>(edited)</span> : null}
        {showVisibility ? <VisibilityBadge visibility={entry.visibility} /> : null}
      </header>
      {children ?? <EntryBody entry={entry} />}
      {controls ? <div className="mt-3 flex flex-wrap gap-2 border-t border-line pt-3">{controls}</div> : null}
    </article>
  );
}

function EntryBody({ entry }: { entry: TimelineEntry }) {
  if (entry.kind === "note") return <NoteView doc={entry.body as NoteDoc} headingLevel={4} />;
  if (entry.kind === "photos") {
    return (
      <div className="space-y-2">
        {entry.caption ? <p className="whitespace-pre-line">{entry.caption}</p> : null}
        <PhotoGrid photos={entry.photos} label={entry.caption ? `Photos: ${entry.caption}` : "Photos"} />
      </div>
    );
  }
  if (entry.kind === "clip" && entry.clip) {
    return (
      <div className="space-y-2">
        {entry.caption ? <p className="whitespace-pre-line">{entry.caption}</p> : null}
        <ClipPlayer clip={entry.clip} title={entry.caption ?? "Clip from the bench"} />
      </div>
    );
  }
  if (entry.kind === "status" && isStatusBody(entry.body)) {
    const body = entry.body;
    return (
      <div className="space-y-2">
        <p className="flex flex-wrap items-center gap-2">
          {body.from ? (
            <>
              <StatusBadge status={body.from} />
              <ArrowRight aria-label="to" className="size-4 text-ink-muted" />
            </>
          ) : null}
          <StatusBadge status={body.to} />
        </p>
        {body.note ? <p className="whitespace-pre-line">{body.note}</p> : null}
      </div>
    );
  }
  if (isBenchEntry(entry)) return <BenchEntryBody entry={entry} />;
  if (entry.kind === "approval") return <ApprovalEntryBody body={entry.body} />;
  if (entry.kind === "invoice" || entry.kind === "payment") return <MoneyEntryBody entry={entry} />;
  return null;
}
