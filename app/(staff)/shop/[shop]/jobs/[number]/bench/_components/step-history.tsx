import { History, Trash2 } from "lucide-react";
import { torqueText } from "@/lib/bench";
import { type StepRevision, type StepSnapshot, changedFields, stepTrail } from "@/lib/teardown-history";
import type { TorqueUnit } from "@/lib/torque";
import { whenText } from "./when";

type Props = { revisions: readonly StepRevision[]; current: StepSnapshot | null; shopUnit: TorqueUnit; timeZone: string };

const CHANGE_WORD = { edit: "Edited", torque: "Torque changed", delete: "Deleted" } as const;

/** "Edited by Ana at 5 Dec, 10:42 — count was 8 (now 9)": each change to one step, oldest first. */
export function StepHistory({ revisions, current, shopUnit, timeZone }: Props) {
  if (!revisions.length) return null;
  const label = (v: number, u: TorqueUnit) => torqueText(v, u, shopUnit);
  return (
    <ol className="space-y-1 text-sm text-ink-muted" aria-label="Changes to this step">
      {stepTrail(revisions, current).map(({ revision: r, next }) => {
        const fields = changedFields(r.previous, next, label);
        return (
          <li key={r.version} className="flex gap-2">
            <History aria-hidden className="mt-0.5 size-4 shrink-0" />
            <span>
              {CHANGE_WORD[r.change]} by {r.by ?? "someone"} at {whenText(r.at, timeZone)}
              {fields.length ? ` — ${fields.join("; ")}` : r.change === "delete" ? "" : " — nothing changed"}.
            </span>
          </li>
        );
      })}
    </ol>
  );
}

const sizeText = (s: StepSnapshot) => [s.count ? `${s.count} ×` : null, s.size].filter(Boolean).join(" ");

/** Steps deleted from the log: gone from the checklist, kept here with what they said and their trail. */
export function DeletedSteps({ revisions, shopUnit, timeZone }: Omit<Props, "current">) {
  const deleted = revisions.filter((r) => r.change === "delete");
  if (!deleted.length) return null;
  return (
    <details className="rounded-lg border border-line p-3">
      <summary className="inline-flex min-h-tap cursor-pointer items-center gap-2 font-semibold text-ink">
        <Trash2 aria-hidden className="size-5" /> Deleted steps ({deleted.length})
      </summary>
      <ul className="space-y-3 pt-2" aria-label="Deleted teardown steps">
        {deleted.map((d) => (
          <li key={d.stepId} className="space-y-1">
            <p className="text-ink line-through decoration-ink-muted">
              {d.seq}. {d.previous.removed}
              {sizeText(d.previous) ? ` (${sizeText(d.previous)})` : ""}
            </p>
            {d.previous.notes ? <p className="whitespace-pre-line text-sm text-ink-muted">Notes were: {d.previous.notes}</p> : null}
            {d.previous.storage ? <p className="text-sm text-ink-muted">Kept in: {d.previous.storage}</p> : null}
            {d.previous.torque ? <p className="text-sm text-ink-muted">Torque was {torqueText(d.previous.torque.value, d.previous.torque.unit, shopUnit)}
                {d.previous.torque.note ? `, ${d.previous.torque.note}` : ""}
              </p> : null}
            <StepHistory revisions={revisions.filter((r) => r.stepId === d.stepId)} current={null} shopUnit={shopUnit} timeZone={timeZone} />
          </li>
        ))}
      </ul>
    </details>
  );
}
