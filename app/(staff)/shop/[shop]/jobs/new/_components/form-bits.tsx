import clsx from "clsx";
import { CircleExclamationPoint } from "lucide-react";
import type { ReactNode } from "react";
import type { ActionState } from "@/lib/action";

/** The first message for one field of a failed check-in, if any. */
export function fieldError(state: ActionState, name: string): string | undefined {
  return state && !state.ok ? state.error.fields?.[name]?.[0] : undefined;
}

/** A titled step of the form (owner, machine, job). */
export function FormSection({ id, title, children }: { id: string; title: string; children: ReactNode }) {
  return (
    <section aria-labelledby={id} className="space-y-4 rounded-xl border border-line bg-surface p-4 sm:p-5">
      <h2 id={id} className="text-xl font-bold text-ink">
        {title}
      </h2>
      {children}
    </section>
  );
}

/** A set of radio cards with a visible legend and, when set, its error read with the group. */
export function ChoiceGroup({ id, legend, error, children }: { id: string; legend: string; error?: string; children: ReactNode }) {
  return (
    <fieldset aria-describedby={error ? `${id}-error` : undefined} className="space-y-2">
      <legend className="mb-2 text-lg font-semibold text-ink">{legend}</legend>
      <div className="space-y-2">{children}</div>
      <FieldMessage id={`${id}-error`} message={error} />
    </fieldset>
  );
}

/** An error line in the same look as Field's, for controls Field doesn't wrap. */
export function FieldMessage({ id, message }: { id: string; message?: string }) {
  if (!message) return null;
  return (
    <p id={id} className="flex items-start gap-1.5 text-sm font-medium text-rust">
      <CircleExclamationPoint aria-hidden className="mt-0.5 size-4 shrink-0" />
      <span>{message}</span>
    </p>
  );
}

/** One radio as a thumb-sized card: the whole card is the label. */
export function ChoiceCard(props: {
  name: string;
  value: string;
  checked: boolean;
  onChange: () => void;
  title: ReactNode;
  detail?: ReactNode;
}) {
  return (
    <label
      className={clsx(
        "flex min-h-tap cursor-pointer items-start gap-3 rounded-lg border p-3",
        props.checked ? "border-2 border-oil bg-oil-soft" : "border-line-strong bg-surface hover:bg-sunken",
      )}
    >
      <input
        type="radio"
        name={props.name}
        value={props.value}
        checked={props.checked}
        onChange={props.onChange}
        className="mt-0.5 size-5 shrink-0 accent-oil"
      />
      <span className="min-w-0">
        <span className="block font-semibold text-ink">{props.title}</span>
        {props.detail ? <span className="block break-words text-sm text-ink-muted">{props.detail}</span> : null}
      </span>
    </label>
  );
}
