import { ArrowRight } from "lucide-react";
import { BoltPattern } from "@/components/bench/bolt-pattern";
import { MeasurementSetEntry } from "@/components/bench/measurement-set";
import { ReadingVerdictBadge } from "@/components/bench/reading-verdict";
import { TorqueOutcomeBadge } from "@/components/bench/torque-outcome";
import { TorqueToolFacts } from "@/components/bench/torque-tool-facts";
import { TorqueValue } from "@/components/bench/torque-value";
import { Badge } from "@/components/ui";
import { PART_STATUS_LABEL, isPartBody, isReadingBody, isTeardownBody, isTorqueBody, plainNumber, sentenceCase, torqueProof } from "@/lib/bench";
import { limitNotes, readingLimitText, readingMarginText, readingValueText } from "@/lib/reading-text";
import type { TimelineEntry } from "@/lib/journal";
import { isMeasurementSetBody } from "@/lib/measurements";
import { torqueHeadline } from "@/lib/torque-check";
import { stepTorqueNote } from "@/lib/torque-special";
import { crossPatternOrder } from "@/lib/tightening-order";

// Timeline bodies of the bench kinds, read from the snapshot each entry keeps. No hooks, so it
// renders on the server and inside the client timeline alike. Nothing here shows money: part
// entries never hold cost.


export function BenchEntryBody({ entry }: { entry: TimelineEntry }) {
  const body = entry.body;
  // A measurement set (issue 18 §5) is a reading entry holding every item of the set.
  if (entry.kind === "reading" && isMeasurementSetBody(body)) return <MeasurementSetEntry body={body} />;
  if (entry.kind === "torque" && isTorqueBody(body)) {
    return (
      <div className="space-y-2">
        <p className="flex flex-wrap items-center gap-2">
          <span className="font-semibold text-ink">{body.fastener}</span>
          <TorqueOutcomeBadge record={body} />
        </p>
        <TorqueValue value={body.specValue} unit={body.unit} displayUnit={body.displayUnit} />
        <p>{sentenceCase(torqueProof(body))}.</p>
        <TorqueToolFacts record={body} at={entry.createdAt} />
        {body.note ? <p className="whitespace-pre-line">{body.note}</p> : null}
        {body.pattern === "cross" && body.boltCount ? <BoltPattern count={body.boltCount} order={crossPatternOrder(body.boltCount)} size={200} /> : null}
      </div>
    );
  }
  if (entry.kind === "reading" && isReadingBody(body)) {
    // Value at its typed resolution, limit, source and verdict together: the owner reads all four.
    const limit = readingLimitText(body);
    const margin = readingMarginText(body);
    return (
      <div className="space-y-2">
        <p className="flex flex-wrap items-center gap-2">
          <span className="font-semibold text-ink">
            {body.label}: {readingValueText(body)}
          </span>
          <ReadingVerdictBadge verdict={body.verdict} />
        </p>
        {margin ? <p>{sentenceCase(margin)}.</p> : null}
        {body.chain ? (
          <p className="text-sm text-ink-muted">
            Chain measured {plainNumber(body.chain.measuredMm)} mm over {body.chain.pitches} pitches of {plainNumber(body.chain.pitchMm)} mm.
          </p>
        ) : null}
        {limit ? (
          <p className="text-sm text-ink-muted">
            Limit {limit}
            {limitNotes(body)}
          </p>
        ) : null}
      </div>
    );
  }
  if (entry.kind === "teardown" && isTeardownBody(body)) {
    const size = [body.count ? `${body.count} ×` : null, body.size].filter(Boolean).join(" ");
    return (
      <div className="space-y-1">
        <p className="font-semibold text-ink">
          Off, step {body.seq}: {body.removed}
          {size ? <span className="font-normal text-ink-muted"> ({size})</span> : null}
        </p>
        {body.notes ? <p className="whitespace-pre-line">{body.notes}</p> : null}
        {body.storage ? <p className="text-sm text-ink-muted">Kept in: {body.storage}</p> : null}
        {body.torque ? (
          <p className="text-sm text-ink-muted">
            Torque on the way back: {torqueHeadline(body.torque.value, body.torque.unit, body.torque.unit)}
            {stepTorqueNote(body.torque) ? `; ${stepTorqueNote(body.torque)}` : ""}
          </p>
        ) : null}
      </div>
    );
  }
  if (entry.kind === "part" && isPartBody(body)) {
    return (
      <div className="space-y-1">
        <p className="font-semibold text-ink">
          {body.description}
          {body.partNumber ? <span className="font-normal text-ink-muted"> · {body.partNumber}</span> : null}
          <span className="font-normal text-ink-muted"> · qty {body.qty}</span>
        </p>
        <p className="flex flex-wrap items-center gap-2">
          {body.from ? (
            <>
              <Badge>{PART_STATUS_LABEL[body.from]}</Badge>
              <ArrowRight aria-label="to" className="size-4 text-ink-muted" />
            </>
          ) : (
            <span>Added as</span>
          )}
          <Badge tone="oil">{PART_STATUS_LABEL[body.to]}</Badge>
        </p>
        {body.expectedOn ? <p className="text-sm text-ink-muted">Expected {body.expectedOn}</p> : null}
        {body.movedTo ? <p className="text-sm text-ink-muted">Moved to job {body.movedTo}</p> : null}
        {body.movedFrom ? <p className="text-sm text-ink-muted">Moved here from job {body.movedFrom}</p> : null}
      </div>
    );
  }
  return null;
}
