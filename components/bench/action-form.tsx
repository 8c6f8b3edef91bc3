"use client";
import { type ReactNode, useActionState } from "react";
import { Alert, Button, type ButtonVariant } from "@/components/ui";
import type { ActionState } from "@/lib/action";

// Shared plumbing for the bench forms: the action state, what was typed (kept after an error so
// nothing is lost), per-field messages, and a one-button form for ticks and toggles.

type Action<T> = (prev: ActionState<T>, formData: FormData) => Promise<ActionState<T>>;

export function useBenchForm<T>(action: Action<T>, { onSuccess }: { onSuccess?: (data: T) => void } = {}) {
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
    formError: error && !error.fields ? error.message : error?.fields && Object.keys(error.fields).length ? "Some fields need attention: see the messages beside them." : null,
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
  const { state, formAction, pending, error } = useBenchForm(action);
  return (
    <form action={formAction} className={className}>
      {Object.entries(fields).map(([name, value]) => (
        <input key={name} type="hidden" name={name} value={value} />
      ))}
      <Button type="submit" variant={variant} loading={pending} icon={icon}>
        {children}
      </Button>
      {error ? <Alert tone="error" className="mt-2">{error.message}</Alert> : null}
      {state?.ok && done ? <Alert tone="success" className="mt-2">{done}</Alert> : null}
    </form>
  );
}
