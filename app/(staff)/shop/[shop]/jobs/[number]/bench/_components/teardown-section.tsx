import { Layers } from "lucide-react";
import { Card, EmptyState } from "@/components/ui";
import type { TeardownRow } from "@/db/queries/bench";
import { torqueText } from "@/lib/bench";
import { type StepRevision, snapshotOfStep } from "@/lib/teardown-history";
import type { TorqueUnit } from "@/lib/torque";
import { stepFastener, stepTorqueNote } from "@/lib/torque-special";
import { DeletedSteps, StepHistory } from "./step-history";
import { StepTorqueForm } from "./step-torque-form";
import { TeardownEditForm } from "./teardown-edit-form";
import { TeardownForm } from "./teardown-form";

type Props = {
  jobPublicId: string;
  /** The shop's currency: numbers are typed in its convention. */
  currency: string;
  steps: TeardownRow[];
  photos: { id: string; caption: string | null }[];
  shopUnit: TorqueUnit;
  mayRecord: boolean;
  /** Every change to the job's steps (issue 18 §7), oldest first; the shop's time zone for when. */
  revisions: StepRevision[];
  timeZone: string;
  /** Steps are numbered on from the highest ever logged, deleted ones included. */
  nextSeq: number;
};

const sizeText = (s: TeardownRow) => [s.count ? `${s.count} ×` : null, s.size].filter(Boolean).join(" ");

/** The teardown log in removal order; each step can carry the torque it goes back on with. */
export function TeardownSection({ jobPublicId, currency, steps, photos, shopUnit, mayRecord, revisions, timeZone, nextSeq }: Props) {
  return (
    <Card as="section" title="Teardown log" headingId="teardown" description="Log each thing as it comes off. The reassembly checklist below is this log in reverse." className="scroll-mt-4">
      <div className="space-y-4">
        {steps.length === 0 ? (
          <EmptyState icon={Layers} title="Nothing logged coming apart" description="Log the first thing you take off: what it is, how many, where you put it." />
        ) : (
          <ol className="space-y-3" aria-label="Teardown steps in removal order">
            {steps.map((s) => (
              <li key={s.id} className="space-y-2 rounded-lg border border-line p-3">
                <p className="font-semibold text-ink">
                  {s.seq}. {s.removed}
                  {sizeText(s) ? <span className="font-normal text-ink-muted"> ({sizeText(s)})</span> : null}
                </p>
                {s.notes ? <p className="whitespace-pre-line">{s.notes}</p> : null}
                {s.storage ? <p className="text-sm text-ink-muted">Kept in: {s.storage}</p> : null}
                {s.torque ? <p className="text-sm">Goes back on at {torqueText(s.torque.value, s.torque.unit, shopUnit)}{stepTorqueNote(s.torque) ? `; ${stepTorqueNote(s.torque)}` : ""}</p> : null}
                <StepHistory revisions={revisions.filter((r) => r.stepId === s.id)} current={snapshotOfStep(s)} shopUnit={shopUnit} timeZone={timeZone} />
                {mayRecord ? (
                  <details>
                    <summary className="inline-flex min-h-tap cursor-pointer items-center rounded-md px-2 font-semibold text-oil hover:bg-oil-soft">Edit or delete step {s.seq}</summary>
                    <div className="pt-2">
                      <TeardownEditForm jobPublicId={jobPublicId} step={s} />
                    </div>
                  </details>
                ) : null}
                {mayRecord ? (
                  <details>
                    <summary className="inline-flex min-h-tap cursor-pointer items-center rounded-md px-2 font-semibold text-oil hover:bg-oil-soft">
                      {s.torque ? "Change torque spec" : "Add torque spec"}
                    </summary>
                    <div className="pt-2">
                      <StepTorqueForm jobPublicId={jobPublicId} currency={currency} stepId={s.id} current={s.torque} shopUnit={shopUnit} fastener={stepFastener(s)} />
                    </div>
                  </details>
                ) : null}
              </li>
            ))}
          </ol>
        )}
        <DeletedSteps revisions={revisions} shopUnit={shopUnit} timeZone={timeZone} />
        {mayRecord ? <TeardownForm jobPublicId={jobPublicId} nextSeq={nextSeq} photos={photos} /> : null}
      </div>
    </Card>
  );
}
