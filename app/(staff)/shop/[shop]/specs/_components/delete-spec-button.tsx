"use client";
import { Trash2 } from "lucide-react";
import { useState } from "react";
import { useBenchForm } from "@/components/bench/action-form";
import { Alert, Button } from "@/components/ui";
import { deleteSpecAction } from "../actions";

/** Deleting asks once more: the spec may be what the bench pre-fills torque from. */
export function DeleteSpecButton({ shopSlug, specId, label }: { shopSlug: string; specId: number; label: string }) {
  const [confirming, setConfirming] = useState(false);
  const form = useBenchForm(deleteSpecAction, { visible: [] });
  if (!confirming) {
    return (
      <Button variant="ghost" icon={<Trash2 aria-hidden className="size-5" />} onClick={() => setConfirming(true)} aria-label={`Delete ${label}`}>
        Delete
      </Button>
    );
  }
  return (
    <form action={form.formAction} role="group" aria-label={`Confirm deleting ${label}`} className="flex flex-wrap items-center gap-2 rounded-lg bg-rust-soft p-2">
      <input type="hidden" name="shop" value={shopSlug} />
      <input type="hidden" name="spec" value={specId} />
      <span className="font-semibold text-ink">Delete this spec?</span>
      <Button type="submit" variant="danger" loading={form.pending}>
        Delete
      </Button>
      <Button variant="secondary" onClick={() => setConfirming(false)}>
        Keep
      </Button>
      {form.formError ? <Alert tone="error">{form.formError}</Alert> : null}
    </form>
  );
}
