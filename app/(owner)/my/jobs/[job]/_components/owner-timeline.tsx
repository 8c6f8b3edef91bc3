"use client";
import { TimelineView } from "@/components/journal/timeline-view";
import { type TimelineResponse, useJobTimeline } from "@/lib/swr/use-job-timeline";

/** What the shop has shared, newest on top; new entries arrive on focus and every few seconds. */
export function OwnerTimeline({ jobPublicId, timeZone, initial }: { jobPublicId: string; timeZone: string; initial: TimelineResponse }) {
  const timeline = useJobTimeline(jobPublicId, "desc", initial, "owner");
  return (
    <TimelineView
      entries={timeline.entries}
      timeZone={timeZone}
      order="desc"
      showVisibility={false}
      loading={timeline.isLoading}
      error={timeline.error as Error | undefined}
      hasMore={timeline.hasMore}
      loadingMore={timeline.isValidating && timeline.size > (timeline.data?.length ?? 0)}
      onLoadMore={() => void timeline.setSize(timeline.size + 1)}
      empty={{ title: "No updates yet", description: "The shop will post notes and photos here as they work on your machine. This page updates by itself." }}
    />
  );
}
