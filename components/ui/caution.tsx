import clsx from "clsx";
import { ShieldExclamationPoint } from "lucide-react";
import type { ReactNode } from "react";
import { CautionFold } from "./caution-fold";

export type CautionProps = {
  /** The specific risk in a few words, e.g. "Fuel system open — no sparks or flames nearby." */
  children: ReactNode;
  title?: ReactNode;
  className?: string;
  /**
   * For a caution met again and again on one page (the bench): a name for it, unique on the page.
   * It shows in full on the first visit, then folds to its title and the deferral, one tap from
   * the full text (issue 20 §3; lib/caution-seen.ts). Without it the caution always shows in full.
   */
  rememberAs?: string;
};

/** Shown wherever risky work is recorded, so the reminder sits next to the note. */
export function Caution({ children, title = "Safety caution", className, rememberAs }: CautionProps) {
  return (
    <aside
      aria-label="Safety caution"
      className={clsx("flex gap-3 rounded-lg border border-signal/40 bg-signal-soft p-4 text-ink", className)}
    >
      <ShieldExclamationPoint aria-hidden className="mt-0.5 size-6 shrink-0 text-signal" />
      <div className="flex min-w-0 flex-1 flex-col gap-1">
        {rememberAs ? (
          <CautionFold id={rememberAs} title={title}>
            {children}
          </CautionFold>
        ) : (
          <>
            <p className="font-semibold">{title}</p>
            <div>{children}</div>
          </>
        )}
        <p className="text-sm text-ink-muted">
          Follow the maker&apos;s service manual, local codes and licensed practice.
        </p>
      </div>
    </aside>
  );
}
