"use client";
import { ArrowDownWideNarrow, ArrowUpNarrowWide, NotebookPen } from "lucide-react";
import { useMemo, type ReactNode } from "react";
import { Alert, Button, EmptyState, Skeleton } from "@/components/ui";
import { type TimelineEntry, groupByDay } from "@/lib/journal";
import { EntryCard } from "./entry-card";

export type TimelineViewProps = {
  entries: TimelineEntry[];
  timeZone: string;
  order: "asc" | "desc";
  /** Shown when the reader may switch between newest-first and oldest-first. */
  onOrderChange?: (order: "asc" | "desc") => void;
  showVisibility: boolean;
  loading: boolean;
  error?: Error;
  hasMore: boolean;
  loadingMore: boolean;
  onLoadMore: () => void;
  empty: { title: string; description: string };
  renderEntry?: (entry: TimelineEntry, time: string) => ReactNode;
};

/** A job's entries grouped by day in the shop's time zone. */
export function TimelineView(props: TimelineViewProps) {
  const { entries, timeZone, order } = props;
  const groups = useMemo(() => groupByDay(entries, timeZone), [entries, timeZone]);
  const time = useMemo(() => new Intl.DateTimeFormat("en-US", { timeZone, hour: "numeric", minute: "2-digit" }), [timeZone]);

  return (
    <div className="space-y-4">
      {props.onOrderChange ? (
        <div role="group" aria-label="Order of entries" className="inline-flex rounded-lg border border-line-strong bg-surface p-1">
          {(["desc", "asc"] as const).map((value) => (
            <button
              key={value}
              type="button"
              aria-pressed={order === value}
              onClick={() => props.onOrderChange?.(value)}
              className="inline-flex min-h-tap items-center gap-2 rounded-md px-3 font-semibold text-ink aria-pressed:bg-oil aria-pressed:text-oil-on"
            >
              {value === "desc" ? <ArrowDownWideNarrow aria-hidden className="size-5" /> : <ArrowUpNarrowWide aria-hidden className="size-5" />}
              {value === "desc" ? "Newest first" : "Oldest first"}
            </button>
          ))}
        </div>
      ) : null}

      {props.error && !entries.length ? <Alert tone="error">{props.error.message}</Alert> : null}
      {props.loading && !entries.length ? (
        <div role="status" className="space-y-3" aria-label="Loading the journal">
          <Skeleton className="h-24" />
          <Skeleton className="h-24" />
        </div>
      ) : null}
      {!props.loading && !props.error && !entries.length ? <EmptyState icon={NotebookPen} title={props.empty.title} description={props.empty.description} /> : null}

      {groups.map((group) => (
        <section key={group.day} aria-label={group.label} className="space-y-3">
          <h3 className="sticky top-0 z-10 -mx-1 bg-paper/95 px-1 py-1 text-sm font-bold uppercase tracking-wide text-ink-muted">{group.label}</h3>
          <ol className="space-y-3">
            {group.entries.map((entry) => {
              const at = time.format(new Date(entry.createdAt));
              return <li key={entry.id}>{props.renderEntry ? props.renderEntry(entry, at) : <EntryCard entry={entry} time={at} showVisibility={props.showVisibility} />}</li>;
            })}
          </ol>
        </section>
      ))}

      {props.hasMore ? (
        <Button variant="secondary" fullWidth loading={props.loadingMore} onClick={props.onLoadMore}>
          {order === "desc" ? "Show older entries" : "Show later entries"}
        </Button>
      ) : null}
    </div>
  );
}
