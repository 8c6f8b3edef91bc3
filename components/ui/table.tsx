import clsx from "clsx";
import Link from "next/link";
import { ArrowDown, ArrowUp, ArrowUpDown } from "lucide-react";
import type { ComponentProps, ReactNode } from "react";

export type TableProps = ComponentProps<"table"> & {
  /** Names the scrollable region and the table for screen readers. */
  label: string;
  /** Visible caption; when absent the label is used as a hidden caption. */
  caption?: ReactNode;
  /** Classes for the scrolling wrapper (e.g. to hide the table on phones). */
  wrapperClassName?: string;
};

export function Table({ label, caption, className, wrapperClassName, children, ...rest }: TableProps) {
  return (
    // Wide tables scroll sideways on phones; the region is focusable so keyboards can scroll it too.
    <div
      role="region"
      aria-label={label}
      tabIndex={0}
      className={clsx("w-full overflow-x-auto rounded-xl border border-line bg-surface", wrapperClassName)}
    >
      <table className={clsx("w-full border-collapse text-left text-sm sm:text-base", className)} {...rest}>
        <caption className={caption ? "px-4 py-3 text-left font-semibold text-ink" : "sr-only"}>
          {caption ?? label}
        </caption>
        {children}
      </table>
    </div>
  );
}

export function THead({ className, ...rest }: ComponentProps<"thead">) {
  return <thead className={clsx("bg-sunken text-ink", className)} {...rest} />;
}

export function TBody({ className, ...rest }: ComponentProps<"tbody">) {
  return <tbody className={clsx("divide-y divide-line", className)} {...rest} />;
}

export function TR({ className, ...rest }: ComponentProps<"tr">) {
  return <tr className={clsx("align-middle", className)} {...rest} />;
}

export type SortDirection = "asc" | "desc" | false;

export type THProps = Omit<ComponentProps<"th">, "onClick"> & {
  /** Current sort of this column; false means sortable but not sorted. */
  sortDirection?: SortDirection;
  /** Makes the header a button (client-side sorting). */
  onSort?: () => void;
  /** Alternative to onSort for server-rendered lists: the header becomes a link. */
  sortHref?: string;
};

const sortIcons = { asc: ArrowUp, desc: ArrowDown } as const;

export function TH({ sortDirection, onSort, sortHref, className, children, scope = "col", ...rest }: THProps) {
  const sortable = Boolean(onSort || sortHref);
  const Icon = sortDirection ? sortIcons[sortDirection] : ArrowUpDown;
  const ariaSort = sortDirection === "asc" ? "ascending" : sortDirection === "desc" ? "descending" : undefined;
  const inner = (
    <>
      <span>{children}</span>
      <Icon aria-hidden className={clsx("size-4 shrink-0", !sortDirection && "text-ink-muted")} />
    </>
  );
  const controlClass =
    "-mx-2 inline-flex min-h-tap items-center gap-1.5 rounded-md px-2 font-semibold hover:bg-paper";

  return (
    <th
      scope={scope}
      aria-sort={sortable ? ariaSort : undefined}
      className={clsx("whitespace-nowrap px-4 py-2 font-semibold", className)}
      {...rest}
    >
      {onSort ? (
        <button type="button" onClick={onSort} className={controlClass}>
          {inner}
        </button>
      ) : sortHref ? (
        <Link href={sortHref} className={controlClass}>
          {inner}
        </Link>
      ) : (
        children
      )}
    </th>
  );
}

export function TD({ className, ...rest }: ComponentProps<"td">) {
  return <td className={clsx("px-4 py-3 text-ink", className)} {...rest} />;
}
