import clsx from "clsx";
import { CircleExclamationPoint } from "lucide-react";
import { cloneElement, isValidElement, type ReactElement, type ReactNode } from "react";

/** Props Field hands to its control so label, hint and error are announced together. */
export type FieldControlProps = {
  id: string;
  "aria-describedby"?: string;
  "aria-invalid"?: true;
  required?: boolean;
};

export type FieldProps = {
  /** id of the control; hint and error ids are derived from it. */
  id: string;
  label: ReactNode;
  hint?: ReactNode;
  /** When set, the control is marked invalid and this message is read with it. */
  error?: ReactNode;
  required?: boolean;
  className?: string;
  /**
   * Either a single control element (it is cloned with the wiring props) or a
   * function receiving those props, for controls wrapped in other markup.
   */
  children: ReactElement | ((control: FieldControlProps) => ReactNode);
};

export function Field({ id, label, hint, error, required, className, children }: FieldProps) {
  const hintId = hint ? `${id}-hint` : undefined;
  const errorId = error ? `${id}-error` : undefined;
  const describedBy = [hintId, errorId].filter(Boolean).join(" ") || undefined;
  const controlProps: FieldControlProps = {
    id,
    "aria-describedby": describedBy,
    ...(error ? { "aria-invalid": true as const } : {}),
    ...(required ? { required: true } : {}),
  };

  let control: ReactNode;
  if (typeof children === "function") {
    control = children(controlProps);
  } else if (isValidElement<Record<string, unknown>>(children)) {
    // Keep any describedby the caller set themselves.
    const own = children.props["aria-describedby"];
    control = cloneElement(children, {
      ...controlProps,
      "aria-describedby":
        [typeof own === "string" ? own : undefined, describedBy].filter(Boolean).join(" ") ||
        undefined,
    });
  } else {
    control = children;
  }

  return (
    <div className={clsx("flex flex-col gap-1.5", className)}>
      <label htmlFor={id} className="font-semibold text-ink">
        {label}
        {required ? (
          <span className="font-normal text-ink-muted"> (required)</span>
        ) : null}
      </label>
      {hint ? (
        <p id={hintId} className="text-sm text-ink-muted">
          {hint}
        </p>
      ) : null}
      {control}
      {error ? (
        <p id={errorId} className="flex items-start gap-1.5 text-sm font-medium text-rust">
          <CircleExclamationPoint aria-hidden className="mt-0.5 size-4 shrink-0" />
          <span>{error}</span>
        </p>
      ) : null}
    </div>
  );
}
