import { ArrowRight } from "lucide-react";
import { BoltPattern } from "@/components/bench/bolt-pattern";
import { ReadingVerdictBadge } from "@/components/bench/reading-verdict";
import { TorqueOutcomeBadge } from "@/components/bench/torque-outcome";
import { TorqueValue } from "@/components/bench/torque-value";
import { Badge } from "@/components/ui";
import { PART_STATUS_LABEL, isPartBody, isReadingBody, isTeardownBody, isTorqueBody, limitText, plainNumber, sentenceCase, torqueProof } from "@/lib/bench";
import type { TimelineEntry } from "@/lib/journal";
import { torqueHeadline } from "@/lib/torque-check";
import { crossPatternOrder } from "@/lib/tightening-order";

// Timeline bodies of the bench kinds, read from the snapshot each entry keeps. No hooks, so it
// renders on the server and inside the client timeline alike. Nothing here shows money: part
// entries never hold cost.

const BENCH_KINDS = new Set<TimelineEntry["kind"]>(["torque", "reading", "teardown", "part"]);
export const isBenchEntry = (entry: TimelineEntry) => BENCH_KINDS.has(entry.kind);

export function BenchEntryBody({ entry }: { entry: TimelineEntry }) {
  const body = entry.body;
  if (entry.kind === "torque" && isTorqueBody(body)) {
    return (
      <div className="space-y-2">
        <p className="flex flex-wrap items-center gap-2">
          <span className="font-semibold text-ink">{body.fastener}</span>
          <TorqueOutcomeBadge record={body} />
        </p>
        <TorqueValue value={body.specValue} unit={body.unit} displayUnit={body.displayUnit} />
        <p>{sentenceCase(torqueProof(body))}.</p>
        {body.tool ? <p className="text-sm text-ink-muted">Tool: {body.tool}</p> : null}
        {body.note ? <p className="whitespace-pre-line">{body.note}</p> : null}
        {body.pattern === "cross" && body.boltCount ? <BoltPattern count={body.boltCount} order={crossPatternOrder(body.boltCount)} size={200} /> : null}
      </div>
    );
  }
  if (entry.kind === "reading" && isReadingBody(body)) {
    const unit = body.unit ? ` ${body.unit}` : "";
    const limit = limitText(body);
    return (
      <div className="space-y-2">
        <p className="flex flex-wrap items-center gap-2">
          <span className="font-semibold text-ink">
            {body.label}: {plainNumber(body.value)}
            {unit}
          </span>
          <ReadingVerdictBadge verdict={body.verdict} />
        </p>
        {body.marginText ? <p>{sentenceCase(body.marginText)}.</p> : null}
        {body.chain ? (
          <p className="text-sm text-ink-muted">
            Chain measured {plainNumber(body.chain.measuredMm)} mm over {body.chain.pitches} pitches of {plainNumber(body.chain.pitchMm)} mm.
          </p>
        ) : null}
        {limit ? (
          <p className="text-sm text-ink-muted">
            Limit {limit}
            {body.source ? ` (${body.source})` : ""}
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
        {body.torque ? <p className="text-sm text-ink-muted">Torque on the way back: {torqueHeadline(body.torque.value, body.torque.unit, body.torque.unit)}</p> : null}
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
      </div>
    );
  }
  return null;
}
