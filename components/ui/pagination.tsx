import clsx from "clsx";
import { ChevronLeft, ChevronRight } from "lucide-react";
import type { ReactNode } from "react";
import { Button, ButtonLink } from "./button";

export type PaginationProps = {
  /** 1-based current page. */
  page: number;
  pageCount: number;
  /** Total number of items across all pages. */
  total: number;
  onPageChange: (page: number) => void;
  /** Word for the items, singular and plural; defaults to job/jobs. */
  noun?: { one: string; other: string };
  className?: string;
};

export function Pagination({
  page,
  pageCount,
  total,
  onPageChange,
  noun = { one: "job", other: "jobs" },
  className,
}: PaginationProps) {
  // An empty list still reads "Page 1 of 1" rather than "Page 1 of 0".
  const pages = Math.max(1, pageCount);
  const current = Math.min(Math.max(1, page), pages);
  const word = total === 1 ? noun.one : noun.other;

  return (
    <nav aria-label="Pages" className={clsx("flex items-center justify-between gap-3", className)}>
      <Button
        variant="secondary"
        onClick={() => onPageChange(current - 1)}
        disabled={current <= 1}
        icon={<ChevronLeft aria-hidden className="size-5" />}
      >
        Previous
      </Button>
      <p aria-live="polite" className="text-center text-sm text-ink-muted">
        Page {current} of {pages} · {total.toLocaleString("en")} {word}
      </p>
      <Button variant="secondary" onClick={() => onPageChange(current + 1)} disabled={current >= pages}>
        Next
        <ChevronRight aria-hidden className="size-5" />
      </Button>
    </nav>
  );
}

/**
 * The same pager for a server-rendered list: links instead of buttons, so paging works without
 * JavaScript. `href(page)` makes a page's address; `label` is what sits between the links.
 */
export function LinkPagination({ page, hasNext, href, label }: { page: number; hasNext: boolean; href: (page: number) => string; label: ReactNode }) {
  return (
    <nav aria-label="Pages" className="flex items-center justify-between gap-3">
      {page > 1 ? (
        <ButtonLink variant="secondary" href={href(page - 1)} icon={<ChevronLeft aria-hidden className="size-5" />}>
          Previous
        </ButtonLink>
      ) : (
        <span />
      )}
      <p className="text-center text-sm text-ink-muted">{label}</p>
      {hasNext ? (
        <ButtonLink variant="secondary" href={href(page + 1)}>
          Next
          <ChevronRight aria-hidden className="size-5" />
        </ButtonLink>
      ) : (
        <span />
      )}
    </nav>
  );
}
