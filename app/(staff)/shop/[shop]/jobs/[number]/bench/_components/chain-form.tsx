"use client";
import { useState } from "react";
import { Button, Field, Input, Select } from "@/components/ui";
import { ReadingVerdictBadge } from "@/components/bench/reading-verdict";
import { CHAIN_PITCHES, chainCheck } from "@/lib/chain-wear";
import { type NumberStyle, formatNumberInput, numberStyleFor, parseNumberInput } from "@/lib/number-input";
import { formatFixed } from "@/lib/rounding";
import { recordChainAction } from "../actions";
import { FormError, useBenchForm } from "@/components/bench/action-form";
import { QueuedNotice } from "@/components/journal/outbox-panel";
import { offlineCapable } from "@/lib/client/queue-post";
import { FORM_FIELDS } from "@/lib/schemas/form-fields";

/** The typed number when it reads one way in the shop's style (the server says why otherwise). */
function num(s: string, style: NumberStyle): number | null {
  const r = parseNumberInput(s, style);
  return r.ok ? r.value : null;
}

function preview(pitchMm: number | null, pitches: number | null, measuredMm: number | null, limitPct: number | null, sprocketTeeth: number | null) {
  if (!pitchMm || !pitches || !measuredMm || !limitPct || !Number.isInteger(pitches)) return null;
  try {
    return chainCheck({ pitchMm, pitches, measuredMm, limitPct, sprocketTeeth: sprocketTeeth && Number.isInteger(sprocketTeeth) ? sprocketTeeth : null });
  } catch (e) {
    return (e as Error).message;
  }
}

/** Chain wear over N pitches: elongation and verdict as the numbers are typed, then logged as a reading. */
export function ChainForm({ jobPublicId, currency, defaultLimitPct }: { jobPublicId: string; currency: string; defaultLimitPct: number }) {
  const style = numberStyleFor(currency);
  // With no network the reading waits in the phone's outbox and goes to the chain-readings route.
  const form = useBenchForm(offlineCapable(recordChainAction, { kind: "chain", job: jobPublicId, label: (f) => `Chain wear: ${String(f.get("label") || "drive chain")}` }), {
    visible: FORM_FIELDS.chainReading.visible,
  });
  const { fieldError } = form;
  const [size, setSize] = useState<string>("#520");
  const [pitch, setPitch] = useState(formatNumberInput(CHAIN_PITCHES["#520"], style));
  const [pitches, setPitches] = useState("20");
  const [measured, setMeasured] = useState("");
  const [limit, setLimit] = useState(formatNumberInput(defaultLimitPct, style));
  const [teeth, setTeeth] = useState("");
  const result = preview(num(pitch, style), num(pitches, style), num(measured, style), num(limit, style), num(teeth, style));

  return (
    <form action={form.formAction} className="space-y-4">
      <input type="hidden" name="job" value={jobPublicId} />
      <FormError message={form.formError} />
      <QueuedNotice state={form.state} />
      <Field id="chain-label" label="Which chain (optional)" error={fieldError("label")}>
        <Input name="label" placeholder="Drive chain wear" maxLength={200} />
      </Field>
      <div className="grid grid-cols-2 gap-3">
        <Field id="chain-size" label="Chain size">
          <Select
            value={size}
            onChange={(e) => {
              const chosen = e.target.value as keyof typeof CHAIN_PITCHES | "";
              setSize(chosen);
              if (chosen) setPitch(formatNumberInput(CHAIN_PITCHES[chosen], style));
            }}
          >
            <option value="">Other: type the pitch</option>
            {Object.keys(CHAIN_PITCHES).map((size) => (
              <option key={size} value={size}>
                {size}
              </option>
            ))}
          </Select>
        </Field>
        <Field id="chain-pitch" label="Pitch (mm)" error={fieldError("pitchMm")} required>
          <Input name="pitchMm" inputMode="decimal" value={pitch} onChange={(e) => {
              setPitch(e.target.value);
              setSize("");
            }} maxLength={10} />
        </Field>
        <Field id="chain-pitches" label="Pitches measured" hint="Pitches = pins − 1: 21 pins span 20 pitches." error={fieldError("pitches")} required>
          <Input name="pitches" inputMode="numeric" value={pitches} onChange={(e) => setPitches(e.target.value)} maxLength={3} />
        </Field>
        <Field id="chain-measured" label="Measured length (mm)" error={fieldError("measuredMm")} required>
          <Input name="measuredMm" inputMode="decimal" value={measured} onChange={(e) => setMeasured(e.target.value)} maxLength={10} />
        </Field>
      </div>
      <Field id="chain-limit" label="Replace at (% stretch)" hint="The shop's default; the maker's service limit for this chain wins." error={fieldError("limitPct")}>
        <Input name="limitPct" inputMode="decimal" value={limit} onChange={(e) => setLimit(e.target.value)} maxLength={6} />
      </Field>
      <Field
        id="chain-teeth"
        label="Large sprocket teeth (optional)"
        hint="Over 67 teeth the limit tightens to 200 ÷ teeth % when that is smaller."
        error={fieldError("sprocketTeeth")}
      >
        <Input name="sprocketTeeth" inputMode="numeric" value={teeth} onChange={(e) => setTeeth(e.target.value)} maxLength={3} />
      </Field>
      <Field id="chain-source" label="Where the limit comes from (optional)" error={fieldError("source")}>
        <Input name="source" maxLength={200} />
      </Field>
      <label className="flex min-h-tap items-center gap-3">
        <input type="checkbox" name="countChecked" className="size-6 accent-oil" />
        <span>Pitch count checked (tick if asked to recount and the count is right)</span>
      </label>
      <div aria-live="polite" className="min-h-tap">
        {typeof result === "string" ? (
          <p className="text-rust">{result}</p>
        ) : result ? (
          <p className="flex flex-wrap items-center gap-2">
            <span className="font-semibold">Stretch {formatFixed(result.elongationPct, 2)} %</span>
            <ReadingVerdictBadge verdict={result.verdict === "replace" ? "above" : "within"} />
            <span className="text-ink-muted">New: {formatFixed(result.nominalMm, 2)} mm · replace at {formatFixed(result.replaceAtMm, 2)} mm</span>
            {result.limitReason ? <span className="w-full text-ink-muted">Limit {result.limitReason}.</span> : null}
            {result.maybeMiscounted ? <span className="w-full text-rust">This length fits one pitch more within the limit: count the pitches again (pins − 1).</span> : null}
          </p>
        ) : null}
      </div>
      <Button type="submit" size="lg" fullWidth loading={form.pending}>
        Log chain wear
      </Button>
    </form>
  );
}
