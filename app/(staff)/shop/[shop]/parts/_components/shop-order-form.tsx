"use client";
import { useState } from "react";
import { Alert, Button } from "@/components/ui";
import { FormError, useBenchForm } from "@/components/bench/action-form";
import { SupplierOrderFields } from "@/components/bench/supplier-order-fields";
import { FORM_FIELDS } from "@/lib/schemas/form-fields";
import { formatJobNumber } from "@/lib/schemas/jobs";
import type { NeededPart } from "@/db/queries/parts-needed";
import { orderShopPartsAction } from "../actions";

// The parts page's order form (issue 19): needed parts of any of the shop's jobs onto one supplier
// order, written in one transaction; each job's wait follows. Every field shows its own message;
// the shop (filled by the page) goes to the banner.

export function ShopOrderForm({ shop, needed, more, today }: { shop: string; needed: NeededPart[]; more: boolean; today: string }) {
  const [ticked, setTicked] = useState<number[]>([]);
  const form = useBenchForm(orderShopPartsAction, { visible: FORM_FIELDS.orderShopParts.visible, onSuccess: () => setTicked([]) });
  const done = form.state?.ok ? form.state.data : null;
  return (
    <form action={form.formAction} className="space-y-3 rounded-xl border border-line bg-surface p-4" aria-label="Order parts for several jobs">
      <h2 className="text-lg font-bold text-ink">Order needed parts</h2>
      <p className="text-ink-muted">Tick parts of any job that go on the same supplier order. A part the owner hasn&apos;t answered for yet is marked proposed.</p>
      <input type="hidden" name="shop" value={shop} />
      <input type="hidden" name="parts" value={ticked.join(",")} />
      <FormError message={form.formError} />
      {done ? <Alert tone="success">{`On order: ${done.parts} part${done.parts === 1 ? "" : "s"}. Their jobs now wait on the order.`}</Alert> : null}
      {/* Stays mounted when the last needed part went on order, so the confirmation above stays in view. */}
      {needed.length === 0 ? <p className="text-ink-muted">No part of any job is waiting to be ordered.</p> : null}
      {needed.length ? (
        <>
          <fieldset className="space-y-1" aria-describedby={form.fieldError("parts") ? "shop-order-parts-error" : undefined}>
            <legend className="font-semibold text-ink">Parts on this order</legend>
            {needed.map((p) => (
              <label key={p.partId} className="flex min-h-tap items-center gap-2">
                <input
                  type="checkbox"
                  className="size-5"
                  checked={ticked.includes(p.partId)}
                  onChange={(e) => setTicked((t) => (e.target.checked ? [...t, p.partId] : t.filter((x) => x !== p.partId)))}
                />
                <span>
                  <span className="font-semibold">{formatJobNumber(p.jobNumber)}</span> · {p.description}
                  {p.partNumber ? ` (${p.partNumber})` : ""}
                  {p.proposed ? " · proposed" : ""}
                </span>
              </label>
            ))}
            {more ? <p className="text-sm text-ink-muted">Only the oldest {needed.length} needed parts are listed; order these first to see the rest.</p> : null}
          </fieldset>
          {form.fieldError("parts") ? (
            <p id="shop-order-parts-error" className="text-sm font-medium text-rust">
              {form.fieldError("parts")}
            </p>
          ) : null}
          <SupplierOrderFields idPrefix="shop-order" today={today} values={form.values} fieldError={form.fieldError} />
          <Button type="submit" loading={form.pending}>
            Put on one order
          </Button>
        </>
      ) : null}
    </form>
  );
}
