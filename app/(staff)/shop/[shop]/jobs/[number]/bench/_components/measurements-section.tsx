import { FilePenLine, Ruler } from "lucide-react";
import Link from "next/link";
import { ActionButton } from "@/components/bench/action-form";
import { MeasurementItems } from "@/components/bench/measurement-set";
import { Card, Caution, EmptyState } from "@/components/ui";
import type { StoredSet } from "@/db/queries/measurements";
import { isOut, judgeItem, setHeadline } from "@/lib/measurements";
import { draftSetFindingAction } from "../measurement-actions";
import { MeasurementForm } from "./measurement-form";
import { whenText } from "./when";

type Props = {
  jobPublicId: string;
  /** Numbers are typed in the convention of the shop's currency (lib/number-input.ts). */
  currency: string;
  sets: StoredSet[];
  timeZone: string;
  mayRecord: boolean;
  mayDraft: boolean;
};

/** Structured measurement sets: record one, see each item's verdict, draft a finding from one out of limit. */
export function MeasurementsSection({ jobPublicId, currency, sets, timeZone, mayRecord, mayDraft }: Props) {
  return (
    <Card as="section" title="Measurement sets" headingId="measurements" className="scroll-mt-4">
      <div className="space-y-4">
        {mayRecord ? (
          <>
            <Caution title="Measuring safely" rememberAs="measuring">
              Measure clearances on a cold engine. For compression and leak-down, disable the ignition and fuel, keep hands clear of the crank and of the open plug hole, and hold the crank
              against the air pressure.
            </Caution>
            <MeasurementForm jobPublicId={jobPublicId} currency={currency} />
          </>
        ) : null}
        <h3 className="text-lg font-bold text-ink">Sets on this job</h3>
        {sets.length === 0 ? (
          <EmptyState icon={Ruler} title="No measurement sets yet" description="Log a set of valve clearances, plates, discs or cylinders against the limit from the manual." />
        ) : (
          <ul className="space-y-4" aria-label="Measurement sets">
            {sets.map((set) => {
              // Judged again from the stored numbers, by the same rule as when recorded.
              const items = set.items.map((i) => judgeItem({ label: i.label, value: i.value, limit: i.limit, unit: set.unit, valve: i.valve }));
              const out = items.filter((i) => isOut(i.verdict)).length;
              return (
                <li key={set.id} className="space-y-3 rounded-lg border border-line p-3" data-testid="measurement-set">
                  <p className="font-semibold text-ink">{setHeadline(set.title, items)}</p>
                  <MeasurementItems items={items} unit={set.unit} source={set.source} />
                  {set.note ? <p className="whitespace-pre-line">{set.note}</p> : null}
                  <p className="text-sm text-ink-muted">
                    {set.by ?? "Someone"} · {whenText(set.at, timeZone)}
                  </p>
                  {set.findingId != null ? (
                    <Link href={`findings/${set.findingId}`} className="inline-flex min-h-tap items-center font-semibold text-oil underline">
                      Open the finding drafted from this set
                    </Link>
                  ) : mayDraft && out ? (
                    <ActionButton action={draftSetFindingAction} fields={{ job: jobPublicId, set: String(set.id) }} icon={<FilePenLine aria-hidden className="size-5" />}>
                      Draft a finding
                    </ActionButton>
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
