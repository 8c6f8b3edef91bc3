"use client";
import { useActionState } from "react";
import { Button } from "@/components/ui";
import { retryMailAction } from "./actions";
import { formBanner } from "@/lib/form-visible";

export function RetryButton({ shop, id }: { shop: string; id: number }) {
  const [state, action, pending] = useActionState(retryMailAction, null);
  return (
    <form action={action} className="flex flex-col items-start gap-1">
      <input type="hidden" name="shop" value={shop} />
      <input type="hidden" name="id" value={id} />
      <Button type="submit" variant="secondary" loading={pending} disabled={state?.ok}>
        {state?.ok ? "Queued" : "Send again"}
      </Button>
      {state && !state.ok ? (
        <span role="alert" className="text-sm text-rust">
          {formBanner(state.error, [])}
        </span>
      ) : null}
    </form>
  );
}
