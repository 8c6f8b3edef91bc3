"use client";
import { type ReactNode, useActionState } from "react";
import { Alert, Button, type ButtonVariant } from "@/components/ui";
import type { ActionState } from "@/lib/action";
import { formBanner } from "@/lib/form-visible";

// Shared plumbing for the bench forms: the action state, what was typed (kept after an error so
// nothing is lost), per-field messages, and a one-button form for ticks and toggles.

type Action<T> = (prev: ActionState<T>, formData: FormData) => Promise<ActionState<T>>;

/**
 * `visible`: the field names this form shows beside their inputs (lib/schemas/form-fields.ts). When
 * given, a message for any other field (an id or version the form fills itself) goes in the banner
 * instead of a "see the messages beside them" that points at nothing.
 */
export function useBenchForm<T>(action: Action<T>, { onSuccess, visible }: { onSuccess?: (data: T) => void; visible?: readonly string[] } = {}) {
  // onSuccess runs inside the action's transition (e.g. to clear controlled fields), not in an effect.
  const [state, formAction, pending] = useActionState<ActionState<T>, FormData>(async (prev, formData) => {
    const result = await action(prev, formData);
    if (result?.ok) onSuccess?.(result.data);
    return result;
  }, null);
  const error = state && !state.ok ? state.error : null;
  // React resets the form after each action; a select takes its defaultValue only when it mounts,
  // so forms key their selects on these values to bring a choice back after an error.
  const values = state && !state.ok ? state.values : undefined;
  return {
    state,
    formAction,
    pending,
    error,
    values,
    fieldError: (name: string) => error?.fields?.[name]?.[0],
    /** A message that belongs to no single field (or a check that failed on the server). */
    formError: formBanner(error, visible),
  };
}

export function FormError({ message }: { message: string | null }) {
  return message ? <Alert tone="error">{message}</Alert> : null;
}

/** A single button that posts hidden fields to a server action, e.g. a reassembly tick. */
export function ActionButton<T>({
  action,
  fields,
  children,
  variant = "secondary",
  icon,
  className,
  done,
}: {
  action: Action<T>;
  fields: Record<string, string>;
  children: ReactNode;
  variant?: ButtonVariant;
  icon?: ReactNode;
  className?: string;
  /** Said once the action went through, for actions whose result shows elsewhere. */
  done?: ReactNode;
}) {
  // Every field of a one-button form is hidden: any message goes in its banner.
  const { state, formAction, pending, formError } = useBenchForm(action, { visible: [] });
  return (
    <form action={formAction} className={className}>
      {Object.entries(fields).map(([name, value]) => (
        <input key={name} type="hidden" name={name} value={value} />
      ))}
      <Button type="submit" variant={variant} loading={pending} icon={icon}>
        {children}
      </Button>
      {formError ? <Alert tone="error" className="mt-2">{formError}</Alert> : null}
      {state?.ok && done ? <Alert tone="success" className="mt-2">{done}</Alert> : null}
    </form>
  );
}
