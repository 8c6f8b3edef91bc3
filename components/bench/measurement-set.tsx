import { ReadingVerdictBadge } from "@/components/bench/reading-verdict";
import { type JudgedItem, type MeasurementSetBody, SHIM_SOURCE_NOTE, isOut, itemLimitText, setHeadline, typedText } from "@/lib/measurements";

// One measurement set's items as a list: value as typed (its resolution kept), the limit it was
// judged by, the verdict as a word and an icon, and for a valve out of limit the suggested shim
// with its arithmetic. No hooks: renders on the bench page and in the timeline alike.

export function MeasurementItems({ items, unit, source }: { items: readonly JudgedItem[]; unit: string; source: string }) {
  return (
    <ul className="space-y-2" aria-label="Measured items">
      {items.map((item) => (
        <li key={item.key} className="space-y-1 border-b border-line pb-2 last:border-b-0">
          <p className="flex flex-wrap items-center gap-2">
            <span className="font-semibold text-ink">
              {item.label}: {typedText(item.value)} {unit}
            </span>
            <ReadingVerdictBadge verdict={item.verdict} />
          </p>
          <p className="text-sm text-ink-muted">
            Limit {itemLimitText(item.limit, unit)} ({source})
            {item.marginText && isOut(item.verdict) ? ` · ${item.marginText}` : ""}
          </p>
          {item.shim ? (
            item.shim.problem ? (
              <p className="text-sm">{item.shim.problem}</p>
            ) : (
              <p className="text-sm">
                Suggested shim <strong>{typedText(item.shim.newShim)} {unit}</strong>: old shim + measured − specified = {item.shim.arithmetic}{" "}
                <span className="text-ink-muted">({SHIM_SOURCE_NOTE})</span>
              </p>
            )
          ) : item.valve && isOut(item.verdict) && !item.valve.oldShim ? (
            <p className="text-sm text-ink-muted">No old shim was typed, so no shim is suggested: measure the shim fitted and log the set again.</p>
          ) : null}
        </li>
      ))}
    </ul>
  );
}

/** A set's timeline entry, read from the snapshot it keeps. */
export function MeasurementSetEntry({ body }: { body: MeasurementSetBody }) {
  const { measurementSet: set, items } = body;
  return (
    <div className="space-y-2">
      <p className="font-semibold text-ink">{setHeadline(set.title, items)}</p>
      <MeasurementItems items={items} unit={set.unit} source={set.source} />
      {set.note ? <p className="whitespace-pre-line">{set.note}</p> : null}
    </div>
  );
}
