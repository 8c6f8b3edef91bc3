import { Wrench } from "lucide-react";
import { BoltPattern } from "@/components/bench/bolt-pattern";
import { VisibilityBadge } from "@/components/journal/entry-card";
import { TorqueOutcomeBadge } from "@/components/bench/torque-outcome";
import { TorqueToolFacts } from "@/components/bench/torque-tool-facts";
import { PassTable, TorqueValue } from "@/components/bench/torque-value";
import { Card, Caution, EmptyState } from "@/components/ui";
import type { TorqueRecordRow } from "@/db/queries/bench";
import { sentenceCase, torqueProof } from "@/lib/bench";
import { CAUTIONS } from "@/lib/cautions";
import { crossPatternOrder } from "@/lib/tightening-order";
import type { TorqueUnit } from "@/lib/torque";
import type { WrenchClass } from "@/lib/torque-check";
import { ShareButton } from "./share-button";
import { TorqueForm, type TorqueSpecOption } from "./torque-form";
import { whenText } from "./when";

type Props = {
  jobPublicId: string;
  /** The shop's currency: numbers are read in its convention (lib/number-input.ts). */
  currency: string;
  shopUnit: TorqueUnit;
  /** The shop's usual wrench (bench settings): the form's default. */
  shopWrench: WrenchClass;
  passPercents: number[];
  specs: TorqueSpecOption[];
  records: TorqueRecordRow[];
  timeZone: string;
  mayRecord: boolean;
  /** Entries can be shared by their author, or by anyone who may moderate the journal. */
  viewerUserId: number;
  mayModerate: boolean;
};

/** Torque log: the form, then what was torqued, newest first, each with its schedule and pattern. */
export function TorqueSection({ jobPublicId, currency, shopUnit, shopWrench, passPercents, specs, records, timeZone, mayRecord, viewerUserId, mayModerate }: Props) {
  return (
    <Card as="section" title="Torque log" headingId="torque" className="scroll-mt-4">
      <div className="space-y-4">
        <Caution title={CAUTIONS.torque.title} rememberAs="torque">
          <p>{CAUTIONS.torque.text}</p>
          <p className="mt-1 font-semibold">The maker&apos;s tightening sequence and values override any pattern or pass schedule shown here.</p>
        </Caution>
        {mayRecord ? <TorqueForm jobPublicId={jobPublicId} currency={currency} shopUnit={shopUnit} shopWrench={shopWrench} passPercents={passPercents} specs={specs} /> : null}
        <h3 className="text-lg font-bold text-ink">Logged on this job</h3>
        {records.length === 0 ? (
          <EmptyState icon={Wrench} title="No torque logged yet" description="Log each fastener group as you tighten it: spec, passes and pattern." />
        ) : (
          <ul className="space-y-3" aria-label="Torque records">
            {records.map((r) => (
              <li key={r.id} className="space-y-2 rounded-lg border border-line p-3">
                <div className="flex flex-wrap items-center justify-between gap-2">
                  <p className="flex flex-wrap items-center gap-2">
                    <span className="font-semibold text-ink">{r.fastener}</span>
                    <TorqueOutcomeBadge record={r} />
                  </p>
                  {r.entry ? <VisibilityBadge visibility={r.entry.visibility} /> : null}
                </div>
                <TorqueValue value={r.specValue} unit={r.unit} displayUnit={shopUnit} />
                <p>{sentenceCase(torqueProof({ ...r, displayUnit: shopUnit }))}.</p>
                {r.warning ? <p className="text-sm text-ink-muted">Checked against a plausibility warning: {r.warning}.</p> : null}
                <TorqueToolFacts record={r} at={r.at} />
                {r.note ? <p className="whitespace-pre-line">{r.note}</p> : null}
                <details>
                  <summary className="inline-flex min-h-tap cursor-pointer items-center rounded-md px-2 font-semibold text-oil hover:bg-oil-soft">Pass schedule{r.boltCount && r.pattern ? " and tightening order" : ""}</summary>
                  <div className="space-y-3 pt-2">
                    <PassTable value={r.specValue} unit={r.unit} displayUnit={shopUnit} passPercents={r.passPercents} label={`Pass schedule: ${r.fastener}`} />
                    {r.boltCount && r.pattern === "cross" ? <BoltPattern count={r.boltCount} order={crossPatternOrder(r.boltCount)} /> : null}
                  </div>
                </details>
                <p className="text-sm text-ink-muted">
                  {r.by ?? "Someone"} · {whenText(r.at, timeZone)}
                </p>
                {r.entry && r.entry.visibility === "shop" && (mayModerate || r.byUserId === viewerUserId) ? <ShareButton jobPublicId={jobPublicId} entryId={r.entry.id} version={r.entry.version} /> : null}
              </li>
            ))}
          </ul>
        )}
      </div>
    </Card>
  );
}
