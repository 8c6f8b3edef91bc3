"use client";
import { Plus } from "lucide-react";
import { useState } from "react";
import { FormError, useBenchForm } from "@/components/bench/action-form";
import { QueuedNotice } from "@/components/journal/outbox-panel";
import { Button, Field, Input, Select } from "@/components/ui";
import { MAX_SET_ITEMS, MEASUREMENT_KINDS, MEASUREMENT_KIND_INFO, MEASUREMENT_SET_VISIBLE, type MeasurementKind, SHIM_SOURCE_NOTE, VALVE_SIDES, VALVE_SIDE_LABEL, rowField } from "@/lib/measurements";
import { exampleIn, numberStyleFor } from "@/lib/number-input";
import { offlineCapable } from "@/lib/client/queue-post";
import { recordMeasurementSetAction } from "../measurement-actions";

// A structured measurement set: the kind, the shop's limit and its source, then one row per valve,
// plate, disc or cylinder. Rows left without a value are ignored. Numbers are typed as the shop
// writes them and read on the server by the one parser.

/** The rows a new valve set starts with: cylinder 1, two intake and two exhaust valves. */
const VALVE_START = [
  { cyl: "1", side: "intake", label: "left" },
  { cyl: "1", side: "intake", label: "right" },
  { cyl: "1", side: "exhaust", label: "left" },
  { cyl: "1", side: "exhaust", label: "right" },
];

export function MeasurementForm({ jobPublicId, currency }: { jobPublicId: string; currency: string }) {
  const example = exampleIn(numberStyleFor(currency));
  const [kind, setKind] = useState<MeasurementKind>("valve_clearance");
  const [rows, setRows] = useState(4);
  // Bumped after a success so the rows start empty again.
  const [round, setRound] = useState(0);
  // With no network the set waits in the phone's outbox and goes to the measurement-sets route.
  const queued = offlineCapable(recordMeasurementSetAction, { kind: "measurements", job: jobPublicId, label: (f) => `Measurement set: ${MEASUREMENT_KIND_INFO[f.get("kind") as MeasurementKind]?.title ?? "items"}` });
  const form = useBenchForm(queued, { onSuccess: () => setRound((n) => n + 1), visible: MEASUREMENT_SET_VISIBLE });
  const { values, fieldError } = form;
  const info = MEASUREMENT_KIND_INFO[kind];
  const valves = kind === "valve_clearance";
  const v = (name: string, fallback = "") => values?.[name] ?? fallback;

  function limitField(name: string, label: string) {
    return (
      <Field id={`ms-${name}`} label={label} error={fieldError(name)}>
        <Input name={name} inputMode="decimal" autoComplete="off" defaultValue={v(name)} maxLength={16} />
      </Field>
    );
  }

  return (
    <form action={form.formAction} className="space-y-4" key={`${kind}-${round}`} aria-label="Record a measurement set">
      <input type="hidden" name="job" value={jobPublicId} />
      <FormError message={form.formError} />
      <QueuedNotice state={form.state} />
      <Field id="ms-kind" label="What was measured" error={fieldError("kind")} required>
        <Select
          name="kind"
          value={kind}
          onChange={(e) => {
            setKind(e.target.value as MeasurementKind);
            setRows(e.target.value === "valve_clearance" ? 4 : 2);
          }}
        >
          {MEASUREMENT_KINDS.map((k) => (
            <option key={k} value={k}>
              {MEASUREMENT_KIND_INFO[k].title}
            </option>
          ))}
        </Select>
      </Field>
      {info.units.length > 1 ? (
        <Field id="ms-unit" label="Unit" error={fieldError("unit")}>
          <Select key={v("unit")} name="unit" defaultValue={v("unit", info.units[0])}>
            {info.units.map((u) => (
              <option key={u} value={u}>
                {u}
              </option>
            ))}
          </Select>
        </Field>
      ) : (
        <input type="hidden" name="unit" value={info.units[0]} />
      )}
      <p className="text-sm text-ink-muted">
        Limits from the maker&apos;s manual, in {info.units.join(" / ")}. {info.limitHint} Write numbers like {example}; the zeros you type are kept (0.20 stays 0.20).
      </p>
      <div className="grid grid-cols-2 gap-3">
        {limitField("min", valves ? "Intake minimum" : "Minimum")}
        {limitField("max", valves ? "Intake maximum" : "Maximum")}
        {valves ? limitField("exhaustMin", "Exhaust minimum") : null}
        {valves ? limitField("exhaustMax", "Exhaust maximum") : null}
      </div>
      <Field id="ms-source" label="Where the limit comes from" hint="e.g. “maker's manual p. 3-14”: the owner sees it with the limit." error={fieldError("source")} required>
        <Input name="source" autoComplete="off" defaultValue={v("source")} maxLength={200} />
      </Field>
      {valves ? (
        <p className="rounded-lg border border-line p-3 text-sm">
          For a valve out of limit with its old shim typed, the suggested shim is <strong>old shim + measured − specified clearance</strong>, aiming for the middle of the range — {SHIM_SOURCE_NOTE}. Pick the nearest shim you have and measure again after fitting.
        </p>
      ) : null}
      <fieldset className="space-y-3">
        <legend className="font-semibold text-ink">{valves ? "Valves" : "Items"}</legend>
        {Array.from({ length: rows }, (_, i) => {
          const start = valves ? VALVE_START[i] : undefined;
          return (
            <div key={i} className="grid grid-cols-2 gap-3 rounded-lg border border-line p-3 sm:grid-cols-5">
              {valves ? (
                <>
                  <Field id={`ms-cyl${i}`} label={`Row ${i + 1}: cylinder`} error={fieldError(rowField("cyl", i))}>
                    <Input name={rowField("cyl", i)} inputMode="numeric" autoComplete="off" defaultValue={v(rowField("cyl", i), start?.cyl ?? "")} maxLength={2} />
                  </Field>
                  <Field id={`ms-side${i}`} label="Intake or exhaust" error={fieldError(rowField("side", i))}>
                    <Select key={v(rowField("side", i))} name={rowField("side", i)} defaultValue={v(rowField("side", i), start?.side ?? "intake")}>
                      {VALVE_SIDES.map((s) => (
                        <option key={s} value={s}>
                          {VALVE_SIDE_LABEL[s]}
                        </option>
                      ))}
                    </Select>
                  </Field>
                  <Field id={`ms-label${i}`} label="Position (optional)" error={fieldError(rowField("label", i))}>
                    <Input name={rowField("label", i)} autoComplete="off" defaultValue={v(rowField("label", i), start?.label ?? "")} maxLength={120} />
                  </Field>
                </>
              ) : (
                <Field id={`ms-label${i}`} label={`Row ${i + 1}: item`} error={fieldError(rowField("label", i))} className="col-span-2">
                  <Input name={rowField("label", i)} autoComplete="off" defaultValue={v(rowField("label", i), info.item(i + 1))} maxLength={120} />
                </Field>
              )}
              <Field id={`ms-value${i}`} label={`Measured (${values?.unit ?? info.units[0]})`} error={fieldError(rowField("value", i))}>
                <Input name={rowField("value", i)} inputMode="decimal" autoComplete="off" defaultValue={v(rowField("value", i))} maxLength={16} />
              </Field>
              {valves ? (
                <Field id={`ms-shim${i}`} label="Old shim, mm (optional)" error={fieldError(rowField("shim", i))}>
                  <Input name={rowField("shim", i)} inputMode="decimal" autoComplete="off" defaultValue={v(rowField("shim", i))} maxLength={16} />
                </Field>
              ) : null}
            </div>
          );
        })}
        {rows < MAX_SET_ITEMS ? (
          <Button type="button" variant="secondary" icon={<Plus aria-hidden className="size-5" />} onClick={() => setRows((n) => Math.min(MAX_SET_ITEMS, n + 1))}>
            Add a row
          </Button>
        ) : null}
      </fieldset>
      <Field id="ms-note" label="Note (optional)" error={fieldError("note")}>
        <Input name="note" autoComplete="off" defaultValue={v("note")} maxLength={500} />
      </Field>
      <Button type="submit" size="lg" fullWidth loading={form.pending}>
        Log measurement set
      </Button>
    </form>
  );
}
