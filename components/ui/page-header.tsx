import clsx from "clsx";
import Link from "next/link";
import { ArrowLeft } from "lucide-react";
import type { ReactNode } from "react";

export type PageHeaderProps = {
  title: ReactNode;
  description?: ReactNode;
  /** Main actions for the page; they stack under the title on phones. */
  actions?: ReactNode;
  /** Optional "back" link shown above the title, e.g. { href: "/jobs", label: "All jobs" }. */
  back?: { href: string; label: string };
  className?: string;
};

export function PageHeader({ title, description, actions, back, className }: PageHeaderProps) {
  return (
    <header className={clsx("mb-6 flex flex-col gap-3", className)}>
      {back ? (
        <Link
          href={back.href}
          className="-ml-2 inline-flex min-h-tap w-fit items-center gap-1.5 rounded-md px-2 font-semibold text-oil hover:bg-oil-soft"
        >
          <ArrowLeft aria-hidden className="size-5" />
          {back.label}
        </Link>
      ) : null}
      <div className="flex flex-col gap-3 sm:flex-row sm:items-start sm:justify-between">
        <div className="min-w-0">
          <h1 className="text-2xl font-extrabold leading-tight tracking-tight text-ink sm:text-3xl">{title}</h1>
          {description ? <p className="mt-1 max-w-prose text-ink-muted">{description}</p> : null}
        </div>
        {actions ? <div className="flex flex-wrap gap-2 sm:shrink-0">{actions}</div> : null}
      </div>
    </header>
  );
}
