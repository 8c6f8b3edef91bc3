import clsx from "clsx";
import type { ReactNode } from "react";

export type CardProps = {
  /** Pick the element that fits: "article" for a job in a list, "section" for a panel. */
  as?: "div" | "section" | "article" | "li";
  /** Heading shown at the top; rendered as h2 unless headingLevel says otherwise. */
  title?: ReactNode;
  headingLevel?: 2 | 3 | 4;
  /** Gives the heading this id and names the card by it (a titled section becomes a landmark region). */
  headingId?: string;
  description?: ReactNode;
  /** Buttons or links beside the title (they wrap below it on narrow screens). */
  actions?: ReactNode;
  className?: string;
  children?: ReactNode;
};

export function Card({
  as: Tag = "div",
  title,
  headingLevel = 2,
  headingId,
  description,
  actions,
  className,
  children,
}: CardProps) {
  const Heading = `h${headingLevel}` as const;
  const hasHeader = title || description || actions;
  return (
    <Tag aria-labelledby={title && headingId ? headingId : undefined} className={clsx("rounded-xl border border-line bg-surface p-4 shadow-sm sm:p-5", className)}>
      {hasHeader ? (
        <div className="mb-3 flex flex-wrap items-start justify-between gap-3">
          <div className="min-w-0 flex-1">
            {title ? <Heading id={headingId} className="text-lg font-bold leading-snug text-ink">{title}</Heading> : null}
            {description ? <p className="mt-1 text-sm text-ink-muted">{description}</p> : null}
          </div>
          {actions ? <div className="flex flex-wrap gap-2">{actions}</div> : null}
        </div>
      ) : null}
      {children}
    </Tag>
  );
}
