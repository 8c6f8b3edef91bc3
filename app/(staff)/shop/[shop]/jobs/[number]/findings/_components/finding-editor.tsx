"use client";
import { useRouter } from "next/navigation";
import { useState } from "react";
import { Alert, Button, Card, Field, Input, Select, Textarea } from "@/components/ui";
import { FindingCaution } from "@/components/approvals/finding-caution";
import type { EvidenceChoices } from "@/db/queries/findings";
import { SAFETY_CATEGORIES, SAFETY_LABEL, type SafetyCategory } from "@/lib/approvals";
import { postJson } from "@/lib/client/approvals";
import { formatMoney } from "@/lib/money";
import { EvidencePicker } from "./evidence-picker";
import { type EditorSettings, type FindingState, emptyLine, payload, preview, rateChoices } from "./form-state";
import { LinesEditor } from "./lines-editor";
import type { PickablePart } from "@/db/queries/parts-pricing";

type Props = {
  jobPublicId: string;
  basePath: string;
  finding: { id: number; version: number } | null;
  initial: FindingState;
  choices: EvidenceChoices;
  mayPrice: boolean;
  locked: boolean;
  currency: string;
  settings: EditorSettings;
  /** Parts already on the job a new part line may stand for (the desk's editor only). */
  pickable?: PickablePart[];
};

/** Draft (the bench) or price (the desk) a finding: what was found, why it matters, evidence and lines. */
export function FindingEditor({ jobPublicId, basePath, finding, initial, choices, mayPrice, locked, currency, settings, pickable = [] }: Props) {
  const router = useRouter();
  const [state, setState] = useState<FindingState>(initial);
  const [errors, setErrors] = useState<Record<string, string[]>>({});
  const [message, setMessage] = useState<{ tone: "error" | "success"; text: string } | null>(null);
  const [saving, setSaving] = useState(false);
  const set = (patch: Partial<FindingState>) => setState((s) => ({ ...s, ...patch }));
  const est = mayPrice ? preview(state.lines, settings, currency) : null;

  async function save() {
    setSaving(true);
    setMessage(null);
    const body = payload(state, mayPrice, finding?.version);
    const result = finding ? await postJson<{ id: number; version: number }>(`/api/jobs/${jobPublicId}/findings/${finding.id}`, body, "PATCH") : await postJson<{ id: number; version: number }>(`/api/jobs/${jobPublicId}/findings`, body);
    setSaving(false);
    if (!result.ok) {
      setErrors(result.fields ?? {});
      setMessage({ tone: "error", text: result.message });
      return;
    }
    setErrors({});
    if (!finding) return router.push(`${basePath}/findings/${result.data.id}`);
    setMessage({ tone: "success", text: "Saved." });
    router.refresh();
  }

  return (
    <Card as="section" title={locked ? "The finding" : finding ? "Edit the finding" : "Draft a finding"} headingId="finding-form-heading">
      <form
        className="space-y-5"
        noValidate
        onSubmit={(e) => {
          e.preventDefault();
          void save();
        }}
      >
        {locked ? <Alert tone="info">The owner has answered this finding, so it can&apos;t change. Draft a new finding for more work.</Alert> : null}
        <fieldset className="space-y-4" disabled={locked}>
          <Field id="finding-title" label="Title" hint="A few words the owner will recognise." error={errors.title?.[0]} required>
            <Input value={state.title} maxLength={200} onChange={(e) => set({ title: e.target.value })} />
          </Field>
          <Field id="finding-found" label="What you found" error={errors.found?.[0]} required>
            <Textarea value={state.found} maxLength={4000} onChange={(e) => set({ found: e.target.value })} />
          </Field>
          <Field id="finding-why" label="Why it matters" hint="What happens if it's left as it is." error={errors.whyItMatters?.[0]}>
            <Textarea value={state.whyItMatters} rows={3} maxLength={4000} onChange={(e) => set({ whyItMatters: e.target.value })} />
          </Field>
          <Field id="finding-safety" label="Does it affect safety?" error={errors.safety?.[0]}>
            <Select value={state.safety} onChange={(e) => set({ safety: e.target.value as SafetyCategory })}>
              {SAFETY_CATEGORIES.map((s) => (
                <option key={s} value={s}>
                  {SAFETY_LABEL[s]}
                </option>
              ))}
            </Select>
          </Field>
          <FindingCaution safety={state.safety} />
        </fieldset>
        <EvidencePicker choices={choices} value={state.evidence} onChange={(evidence) => set({ evidence })} errors={errors} disabled={locked} />
        <LinesEditor
          lines={state.lines}
          onChange={(lines) => set({ lines })}
          onAdd={(kind) => set({ lines: [...state.lines, emptyLine(kind, settings, currency)] })}
          mayPrice={mayPrice}
          currency={currency}
          errors={errors}
          disabled={locked}
          rates={mayPrice ? rateChoices(settings, currency) : []}
          markup={settings.markup}
          pickable={mayPrice ? pickable : []}
        />
        {est ? (
          <div aria-live="polite" className="rounded-xl bg-sunken p-4">
            {"totals" in est ? (
              <p className="text-ink">
                Estimate: <strong className="tabular-nums">{formatMoney(est.totals.totalMinor, currency)}</strong> with tax ({formatMoney(est.totals.taxMinor, currency)} tax
                {est.totals.suppliesMinor ? `, ${formatMoney(est.totals.suppliesMinor, currency)} shop supplies` : ""}), {formatMoney(est.totals.preTaxTotalMinor, currency)} before tax.
              </p>
            ) : (
              <p className="text-ink-muted">{est.missing}</p>
            )}
          </div>
        ) : (
          <p className="text-ink-muted">The service writer adds the prices before it goes to the owner.</p>
        )}
        {message ? <Alert tone={message.tone}>{message.text}</Alert> : null}
        {locked ? null : (
          <Button type="submit" size="lg" loading={saving} fullWidth>
            {finding ? "Save the finding" : "Save the draft"}
          </Button>
        )}
      </form>
    </Card>
  );
}
