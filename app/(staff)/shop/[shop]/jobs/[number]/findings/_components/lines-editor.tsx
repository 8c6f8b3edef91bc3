"use client";
import { Package, Plus, Receipt, Trash2, Wrench } from "lucide-react";
import { Button, Field, Input, Select } from "@/components/ui";
import { LINE_KIND_LABEL, type LineKind } from "@/lib/approvals";
import { formatMoney } from "@/lib/money";
import type { MarkupRule } from "@/lib/parts-pricing";
import type { PickablePart } from "@/db/queries/parts-pricing";
import { type LineState, ruledPrice } from "./form-state";

type Props = {
  lines: LineState[];
  onChange: (lines: LineState[]) => void;
  onAdd: (kind: LineKind) => void;
  mayPrice: boolean;
  currency: string;
  errors: Record<string, string[]>;
  disabled: boolean;
  /** The shop's labour rates to pick from (rateChoices); empty: the rate is typed. */
  rates?: { label: string; text: string }[];
  /** The shop's parts markup: a costed part line's price starts from it (issue 19). */
  markup?: MarkupRule;
  /** Parts already on the job a new part line may stand for, instead of making another. */
  pickable?: PickablePart[];
};

const ICON = { part: Package, labour: Wrench, fee: Receipt } as const;

/** Proposed lines: parts (number, quantity), labour (hours), fees; prices and tax for the desk. */
export function LinesEditor({ lines, onChange, onAdd, mayPrice, currency, errors, disabled, rates = [], markup, pickable = [] }: Props) {
  const set = (key: string, patch: Partial<LineState>) => onChange(lines.map((l) => (l.key === key ? { ...l, ...patch } : l)));
  const err = (i: number, field: string) => errors[`lines.${i}.${field}`]?.[0] ?? (field === "description" ? errors[`lines.${i}`]?.[0] : undefined);
  return (
    <fieldset className="space-y-3" disabled={disabled}>
      <legend className="mb-2 text-lg font-bold text-ink">Proposed work</legend>
      {errors.lines ? <p className="font-medium text-rust">{errors.lines[0]}</p> : null}
      <ol className="space-y-3">
        {lines.map((line, i) => {
          const Icon = ICON[line.kind];
          const id = (f: string) => `line-${line.key}-${f}`;
          return (
            <li key={line.key} className="space-y-3 rounded-xl border border-line bg-surface p-4" aria-label={`Line ${i + 1}: ${LINE_KIND_LABEL[line.kind]}`}>
              <div className="flex items-center justify-between gap-2">
                <span className="flex items-center gap-2 font-semibold text-ink">
                  <Icon aria-hidden className="size-5 text-oil" />
                  Line {i + 1}: {LINE_KIND_LABEL[line.kind]}
                </span>
                <Button variant="ghost" icon={<Trash2 aria-hidden className="size-5" />} onClick={() => onChange(lines.filter((l) => l.key !== line.key))} aria-label={`Remove line ${i + 1}`}>
                  Remove
                </Button>
              </div>
              {mayPrice && line.kind === "part" && (line.id || pickable.length) ? (
                <Field
                  id={id("pick")}
                  label="Part on the job"
                  hint={line.id ? "Until the owner answers, this line can stand for another part the bench added, or a new one" : "Pick one the bench already added, so it isn't typed twice"}
                  error={err(i, "partId")}
                >
                  <Select
                    value={line.newPart ? "new" : (line.partId ?? "")}
                    onChange={(e) => {
                      const part = pickable.find((p) => p.id === Number(e.target.value));
                      // A picked part brings its own stored cost: the cost field is cleared so it isn't overwritten.
                      if (part) set(line.key, { partId: part.id, newPart: false, description: part.description, partNumber: part.partNumber ?? "", cost: "" });
                      else set(line.key, { partId: undefined, newPart: e.target.value === "new" });
                    }}
                  >
                    {line.id ? <option value="">Keep this line&apos;s part</option> : <option value="">A new part</option>}
                    {line.id ? <option value="new">A new part</option> : null}
                    {pickable
                      .filter((p) => p.id === line.partId || !lines.some((l) => l.partId === p.id))
                      .map((p) => (
                        <option key={p.id} value={p.id}>
                          {p.partNumber ? `${p.description} (${p.partNumber})` : p.description}
                        </option>
                      ))}
                  </Select>
                </Field>
              ) : null}
              <Field id={id("description")} label="Description" error={err(i, "description")} required>
                <Input value={line.description} maxLength={200} onChange={(e) => set(line.key, { description: e.target.value })} />
              </Field>
              <div className="grid gap-3 sm:grid-cols-2">
                {line.kind === "part" ? (
                  <>
                    <Field id={id("partNumber")} label="Part number" error={err(i, "partNumber")}>
                      <Input value={line.partNumber} maxLength={60} onChange={(e) => set(line.key, { partNumber: e.target.value })} />
                    </Field>
                    <Field id={id("qty")} label="Quantity" hint="1.5 for a litre and a half" error={err(i, "qty")} required>
                      <Input value={line.qty} inputMode="decimal" onChange={(e) => set(line.key, { qty: e.target.value })} />
                    </Field>
                  </>
                ) : null}
                {line.kind === "labour" ? (
                  <Field id={id("hours")} label="Hours" hint="In tenths: 1.5" error={err(i, "hours")} required>
                    <Input value={line.hours} inputMode="decimal" onChange={(e) => set(line.key, { hours: e.target.value })} />
                  </Field>
                ) : null}
                {mayPrice && line.kind === "labour" && rates.length ? (
                  <Field id={id("rate-choice")} label="Labour rate" hint="Fills the rate per hour; type another rate to override">
                    <Select value={rates.find((r) => r.text === line.rate)?.label ?? ""} onChange={(e) => set(line.key, { rate: rates.find((r) => r.label === e.target.value)?.text ?? line.rate })}>
                      <option value="">Typed rate</option>
                      {rates.map((r) => (
                        <option key={r.label} value={r.label}>
                          {r.label} ({r.text})
                        </option>
                      ))}
                    </Select>
                  </Field>
                ) : null}
                {mayPrice && line.kind === "part" ? (
                  <Field id={id("cost")} label={`Unit cost (${currency})`} hint="Staff only: the owner sees the sell price, never the cost" error={err(i, "cost")}>
                    <Input value={line.cost} inputMode="decimal" onChange={(e) => set(line.key, { cost: e.target.value })} />
                  </Field>
                ) : null}
                {mayPrice ? (
                  <Field
                    id={id("price")}
                    label={line.kind === "part" ? `Unit price (${currency})` : line.kind === "labour" ? `Rate per hour (${currency})` : `Amount (${currency})`}
                    hint={(() => {
                      const ruled = ruledPrice(line, markup, currency);
                      if (ruled !== null) return `Markup rule: ${formatMoney(ruled, currency)}. Leave empty to use it.`;
                      // Issue 19: an uncosted part line still makes its job part, at the price typed.
                      return line.kind === "part" && !line.cost.trim() ? "No cost typed: this is the sell price, no markup applied." : undefined;
                    })()}
                    error={err(i, line.kind === "part" ? "unitPrice" : line.kind === "labour" ? "rate" : "amount")}
                  >
                    <Input
                      value={line.kind === "part" ? line.unitPrice : line.kind === "labour" ? line.rate : line.amount}
                      inputMode="decimal"
                      onChange={(e) => set(line.key, line.kind === "part" ? { unitPrice: e.target.value } : line.kind === "labour" ? { rate: e.target.value } : { amount: e.target.value })}
                    />
                  </Field>
                ) : null}
              </div>
              {mayPrice && line.kind === "part" && (line.priceReason || err(i, "priceReason") || (line.unitPrice.trim() && ruledPrice(line, markup, currency) !== null)) ? (
                <Field id={id("reason")} label="Why this price" hint="Needed when the price isn't the markup rule's; kept with the part" error={err(i, "priceReason")}>
                  <Input value={line.priceReason} maxLength={200} onChange={(e) => set(line.key, { priceReason: e.target.value })} />
                </Field>
              ) : null}
              {mayPrice ? (
                <label className="flex min-h-tap cursor-pointer items-center gap-3 text-ink">
                  <input type="checkbox" className="size-5 accent-oil" checked={line.taxable} onChange={(e) => set(line.key, { taxable: e.target.checked })} />
                  Taxable
                </label>
              ) : null}
            </li>
          );
        })}
      </ol>
      <div className="flex flex-wrap gap-2">
        {(["part", "labour", "fee"] as const).map((kind) => (
          <Button key={kind} variant="secondary" icon={<Plus aria-hidden className="size-5" />} onClick={() => onAdd(kind)}>
            Add {LINE_KIND_LABEL[kind].toLowerCase()}
          </Button>
        ))}
      </div>
    </fieldset>
  );
}
