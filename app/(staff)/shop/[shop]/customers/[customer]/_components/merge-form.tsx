"use client";
import { useActionState } from "react";
import { Merge } from "lucide-react";
import { Alert, Button } from "@/components/ui";
import { FORM_FIELDS } from "@/lib/schemas/form-fields";
import { mergeCustomerAction } from "../actions";
import { bannerText } from "./banner";

const VISIBLE: readonly string[] = FORM_FIELDS.customerMerge.visible;

export type MergeCandidate = {
  id: number;
  name: string;
  contact: string;
  machines: string;
  jobCount: number;
};

/**
 * Pick the duplicate among the search results and confirm: its jobs and machines move to this
 * record, which keeps its own details and takes only what it lacks; the duplicate is removed.
 */
export function MergeForm({ shopSlug, customerId, keptName, candidates }: { shopSlug: string; customerId: number; keptName: string; candidates: MergeCandidate[] }) {
  const [state, action, pending] = useActionState(mergeCustomerAction, null);
  const err = (key: string) => (state && !state.ok ? state.error.fields?.[key]?.[0] : undefined);
  if (state?.ok) {
    return (
      <Alert tone="success">
        Merged: {state.data.jobs} {state.data.jobs === 1 ? "job" : "jobs"} and {state.data.machines} {state.data.machines === 1 ? "machine" : "machines"} moved to {keptName}.
      </Alert>
    );
  }
  return (
    <form action={action} className="space-y-4">
      <input type="hidden" name="shop" value={shopSlug} />
      <input type="hidden" name="customer" value={customerId} />
      {state && !state.ok && bannerText(state.error, VISIBLE, "") ? <Alert tone="error">{bannerText(state.error, VISIBLE, "")}</Alert> : null}
      <fieldset aria-describedby={err("duplicate") ? "merge-duplicate-error" : undefined}>
        <legend className="font-semibold text-ink">Duplicate record to fold into {keptName}</legend>
        <ul className="mt-2 space-y-1">
          {candidates.map((c) => (
            <li key={c.id}>
              <label className="flex min-h-tap items-start gap-3 rounded-lg px-2 py-2 text-ink hover:bg-sunken">
                <input type="radio" name="duplicate" value={c.id} className="mt-1 size-5 accent-oil" />
                <span>
                  <span className="font-semibold">{c.name}</span> · {c.contact}
                  <span className="block text-sm text-ink-muted">
                    {c.machines} · {c.jobCount} {c.jobCount === 1 ? "job" : "jobs"}
                  </span>
                </span>
              </label>
            </li>
          ))}
        </ul>
        {err("duplicate") ? (
          <p id="merge-duplicate-error" role="alert" className="mt-1 text-sm text-rust">
            {err("duplicate")}
          </p>
        ) : null}
      </fieldset>
      <div>
        <label className="flex min-h-tap items-center gap-3 text-ink">
          <input type="checkbox" name="confirm" value="yes" className="size-5 accent-oil" aria-describedby={err("confirm") ? "merge-confirm-error" : undefined} />
          It is the same person: move every job and machine here and remove the duplicate.
        </label>
        {err("confirm") ? (
          <p id="merge-confirm-error" role="alert" className="text-sm text-rust">
            {err("confirm")}
          </p>
        ) : null}
      </div>
      <Button type="submit" variant="danger" loading={pending} icon={<Merge aria-hidden className="size-5" />}>
        Merge into {keptName}
      </Button>
    </form>
  );
}
