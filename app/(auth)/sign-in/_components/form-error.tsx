import { Alert } from "@/components/ui";
import type { ActionState } from "@/lib/action";
import { formBanner } from "@/lib/form-visible";

/**
 * The form-level message of a failed action, if any. With `visible` (the form's fields,
 * FORM_VISIBLE in lib/form-visible.ts), messages for fields the form fills itself (a token, the
 * return address) are said here, since no input shows them.
 */
export function FormError({ state, visible }: { state: ActionState; visible?: readonly string[] }) {
  if (!state || state.ok) return null;
  const message = visible ? formBanner(state.error, visible) : state.error.message;
  return message ? <Alert tone="error">{message}</Alert> : null;
}

export function fieldError(state: ActionState, name: string): string | undefined {
  return state && !state.ok ? state.error.fields?.[name]?.[0] : undefined;
}
