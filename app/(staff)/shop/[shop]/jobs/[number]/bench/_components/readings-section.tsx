import { FilePenLine, Gauge } from "lucide-react";
import { ReadingVerdictBadge, isOutOfLimit } from "@/components/bench/reading-verdict";
import { ButtonLink, Card, EmptyState } from "@/components/ui";
import type { ReadingRow } from "@/db/queries/bench";
import { plainNumber, sentenceCase } from "@/lib/bench";
import { limitNotes, readingLimitText, readingMarginText, readingValueText } from "@/lib/reading-text";
import { ChainForm } from "./chain-form";
import { ReadingForm, type LimitSpecOption } from "./reading-form";
import { whenText } from "./when";

type Props = { jobPublicId: string; /** Numbers are typed in the convention of the shop's currency (lib/number-input.ts). */ currency: string; readings: ReadingRow[]; specs: LimitSpecOption[]; chainLimitPct: number; timeZone: string; mayRecord: boolean };

function marginOf(r: ReadingRow): string | null {
  const text = readingMarginText(r);
  return text ? sentenceCase(text) : null;
}

/** Readings against limits, with the chain-wear helper; an out-of-limit reading can become a finding. */
export function ReadingsSection({ jobPublicId, currency, readings, specs, chainLimitPct, timeZone, mayRecord }: Props) {
  return (
    <Card as="section" title="Readings" headingId="readings" className="scroll-mt-4">
      <div className="space-y-4">
        {mayRecord ? (
          <>
            <ReadingForm jobPublicId={jobPublicId} currency={currency} specs={specs} />
            <details className="rounded-lg border border-line p-3">
              <summary className="inline-flex min-h-tap cursor-pointer items-center font-semibold text-oil">Chain wear helper</summary>
              <div className="pt-3">
                <ChainForm jobPublicId={jobPublicId} currency={currency} defaultLimitPct={chainLimitPct} />
              </div>
            </details>
          </>
        ) : null}
        <h3 className="text-lg font-bold text-ink">Logged on this job</h3>
        {readings.length === 0 ? (
          <EmptyState icon={Gauge} title="No readings yet" description="Log what you measure with the limit from the manual; out-of-limit readings are flagged." />
        ) : (
          <ul className="space-y-3" aria-label="Readings">
            {readings.map((r) => {
              const limit = readingLimitText(r);
              const margin = marginOf(r);
              return (
                <li key={r.id} className="space-y-2 rounded-lg border border-line p-3">
                  <p className="flex flex-wrap items-center gap-2">
                    <span className="font-semibold text-ink">
                      {r.label}: {readingValueText(r)}
                    </span>
                    <ReadingVerdictBadge verdict={r.verdict} />
                  </p>
                  {margin ? <p>{margin}.</p> : null}
                  {r.chain ? (
                    <p className="text-sm text-ink-muted">
                      Chain: {plainNumber(r.chain.measuredMm)} mm over {r.chain.pitches} pitches of {plainNumber(r.chain.pitchMm)} mm.
                    </p>
                  ) : null}
                  {limit ? (
                    <p className="text-sm text-ink-muted">
                      Limit {limit}
                      {limitNotes(r)}
                    </p>
                  ) : null}
                  <p className="text-sm text-ink-muted">
                    {r.by ?? "Someone"} · {whenText(r.at, timeZone)}
                  </p>
                  {mayRecord && isOutOfLimit(r.verdict) ? (
                    // Relative to /…/jobs/N/bench: the finding form opens with this reading as its evidence.
                    <ButtonLink href={`findings/new?reading=${r.id}`} variant="secondary" icon={<FilePenLine aria-hidden className="size-5" />}>
                      Draft a finding
                    </ButtonLink>
                  ) : null}
                </li>
              );
            })}
          </ul>
        )}
      </div>
    </Card>
  );
}
