import { Table, TBody, TD, TH, THead, TR } from "@/components/ui";
import { torqueText, torqueViews } from "@/lib/bench";
import { passSchedule } from "@/lib/tightening-passes";
import { type TorqueUnit, torqueUnitLabel } from "@/lib/torque";

// Torque as the bench reads it: the unit it was entered in first, the shop's unit beside it when
// different, and every other unit one tap away. No hooks: renders on the server
// and inside client lists alike; <details> opens without JavaScript.

export function TorqueValue({ value, unit, displayUnit }: { value: number; unit: TorqueUnit; displayUnit: TorqueUnit }) {
  const views = torqueViews(value, unit, displayUnit);
  return (
    <div className="flex flex-wrap items-center gap-x-3">
      <strong className="text-lg text-ink">{views.primary}</strong>
      {views.shop ? <span className="text-ink-muted">({views.shop})</span> : null}
      <details className="group">
        <summary className="inline-flex min-h-tap cursor-pointer items-center rounded-md px-2 font-semibold text-oil hover:bg-oil-soft">Other units</summary>
        <p className="pb-2 text-ink">{views.others.join(" · ")}</p>
      </details>
    </div>
  );
}

/**
 * Each pass with its torque in N·m and in the shop's unit (and the spec's own unit when that is a
 * third one), then the check pass at final.
 */
export function PassTable({ value, unit, displayUnit, passPercents, label }: { value: number; unit: TorqueUnit; displayUnit: TorqueUnit; passPercents: readonly number[]; label: string }) {
  const units = [...new Set<TorqueUnit>(["nm", displayUnit, unit])];
  const rows = passSchedule(value, unit, passPercents);
  return (
    <Table label={label}>
      <THead>
        <TR>
          <TH>Pass</TH>
          <TH>Share of final</TH>
          {units.map((u) => (
            <TH key={u}>{torqueUnitLabel(u)}</TH>
          ))}
        </TR>
      </THead>
      <TBody>
        {rows.map((row) => (
          <TR key={row.pass}>
            <TD>{row.check ? `${row.pass} (check)` : row.pass}</TD>
            <TD>{row.percent} %</TD>
            {units.map((u) => (
              <TD key={u}>{torqueText(row.value, unit, u)}</TD>
            ))}
          </TR>
        ))}
      </TBody>
    </Table>
  );
}
