import clsx from "clsx";
import { Inbox, type LucideIcon } from "lucide-react";
import type { ReactNode } from "react";

export type EmptyStateProps = {
  icon?: LucideIcon;
  /** What is empty, e.g. "No jobs on the bench". */
  title: ReactNode;
  /** What to do next, e.g. "Book a machine in to start its journal." */
  description: ReactNode;
  /** Usually a ButtonLink or Button that does the next step. */
  action?: ReactNode;
  className?: string;
};

export function EmptyState({ icon: Icon = Inbox, title, description, action, className }: EmptyStateProps) {
  return (
    <div
      className={clsx(
        "flex flex-col items-center gap-3 rounded-xl border-2 border-dashed border-line px-4 py-10 text-center",
        className,
      )}
    >
      <span className="flex size-14 items-center justify-center rounded-full bg-sunken text-ink-muted">
        <Icon aria-hidden className="size-7" />
      </span>
      <p className="text-lg font-bold text-ink">{title}</p>
      <div className="max-w-prose text-ink-muted">{description}</div>
      {action ? <div className="mt-2">{action}</div> : null}
    </div>
  );
}
