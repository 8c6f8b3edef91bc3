import { Alert } from "@/components/ui";
import type { ActionState } from "@/lib/action";

/** The form-level message of a failed action, if any. */
export function FormError({ state }: { state: ActionState }) {
  if (!state || state.ok) return null;
  return <Alert tone="error">{state.error.message}</Alert>;
}

export function fieldError(state: ActionState, name: string): string | undefined {
  return state && !state.ok ? state.error.fields?.[name]?.[0] : undefined;
}
