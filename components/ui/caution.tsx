import clsx from "clsx";
import { ShieldExclamationPoint } from "lucide-react";
import type { ReactNode } from "react";

export type CautionProps = {
  /** The specific risk in a few words, e.g. "Fuel system open — no sparks or flames nearby." */
  children: ReactNode;
  title?: ReactNode;
  className?: string;
};

/** Shown wherever risky work is recorded, so the reminder sits next to the note. */
export function Caution({ children, title = "Safety caution", className }: CautionProps) {
  return (
    <aside
      aria-label="Safety caution"
      className={clsx("flex gap-3 rounded-lg border border-signal/40 bg-signal-soft p-4 text-ink", className)}
    >
      <ShieldExclamationPoint aria-hidden className="mt-0.5 size-6 shrink-0 text-signal" />
      <div className="flex flex-col gap-1">
        <p className="font-semibold">{title}</p>
        <div>{children}</div>
        <p className="text-sm text-ink-muted">
          Follow the maker&apos;s service manual, local codes and licensed practice.
        </p>
      </div>
    </aside>
  );
}
