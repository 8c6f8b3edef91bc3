import { Card } from "@/components/ui";

/**
 * How far putting the machine back together has come, as the owner (and the bench) reads it: a
 * big bar plus the words, so the number never rests on the bar alone.
 */
export function ReassemblyProgress({ done, total, percent, headingId = "reassembly-progress" }: { done: number; total: number; percent: number; headingId?: string }) {
  return (
    <Card as="section" title="Putting it back together" headingId={headingId}>
      <div className="space-y-2">
        <p className="text-lg font-bold text-ink">{percent} % reassembled</p>
        <div
          role="progressbar"
          aria-labelledby={headingId}
          aria-valuemin={0}
          aria-valuemax={100}
          aria-valuenow={percent}
          aria-valuetext={`${percent} %, ${done} of ${total} steps`}
          className="h-4 w-full overflow-hidden rounded-full border border-line-strong bg-sunken"
        >
          <div className="h-full rounded-full bg-oil" style={{ width: `${percent}%` }} />
        </div>
        <p className="text-ink-muted">
          {done} of {total} reassembly step{total === 1 ? "" : "s"} done.
        </p>
      </div>
    </Card>
  );
}
