import clsx from "clsx";
import { ChevronDown } from "lucide-react";
import type { ComponentProps } from "react";

// text-base (16 px) on every control: smaller text makes phones zoom in on focus.
const control =
  "w-full rounded-lg border border-line-strong bg-surface px-3 text-base text-ink placeholder:text-ink-muted disabled:cursor-not-allowed disabled:bg-sunken disabled:text-ink-muted aria-[invalid=true]:border-2 aria-[invalid=true]:border-rust";

export type InputProps = ComponentProps<"input">;

export function Input({ className, type = "text", ...rest }: InputProps) {
  return <input type={type} className={clsx(control, "min-h-tap py-2", className)} {...rest} />;
}

export type TextareaProps = ComponentProps<"textarea">;

export function Textarea({ className, rows = 4, ...rest }: TextareaProps) {
  return <textarea rows={rows} className={clsx(control, "min-h-24 py-2", className)} {...rest} />;
}

export type SelectProps = ComponentProps<"select">;

/** Native select: the phone's own picker is the easiest thing to use one-handed. */
export function Select({ className, children, ...rest }: SelectProps) {
  return (
    <div className="relative">
      <select className={clsx(control, "min-h-tap appearance-none py-2 pr-10", className)} {...rest}>
        {children}
      </select>
      <ChevronDown
        aria-hidden
        className="pointer-events-none absolute right-3 top-1/2 size-5 -translate-y-1/2 text-ink-muted"
      />
    </div>
  );
}

/** One `<option>` per value, the value as its label: time zones, currency codes. */
export function PlainOptions({ values }: { values: readonly string[] }) {
  return (
    <>
      {values.map((v) => (
        <option key={v} value={v}>
          {v}
        </option>
      ))}
    </>
  );
}
