import clsx from "clsx";
import Link from "next/link";

export type BrandProps = {
  href?: string;
  size?: "sm" | "md";
  className?: string;
};

/**
 * Benchside mark: a rounded tile holding a bench top on two legs with a part
 * resting on it — the "thing on the bench" the whole product is about.
 */
export function BrandMark({ className }: { className?: string }) {
  return (
    <svg viewBox="0 0 32 32" aria-hidden focusable="false" className={clsx("shrink-0", className)}>
      <rect width="32" height="32" rx="8" className="fill-oil" />
      <rect x="6" y="17" width="20" height="3.5" rx="1.25" className="fill-oil-on" />
      <rect x="8.5" y="20" width="3" height="6" rx="1" className="fill-oil-on" />
      <rect x="20.5" y="20" width="3" height="6" rx="1" className="fill-oil-on" />
      <circle cx="16" cy="11.5" r="4" className="fill-brass-soft" />
    </svg>
  );
}

export function Brand({ href = "/", size = "md", className }: BrandProps) {
  return (
    <Link
      href={href}
      className={clsx(
        "inline-flex min-h-tap items-center gap-2 rounded-md font-extrabold tracking-tight text-ink",
        size === "sm" ? "text-lg" : "text-xl",
        className,
      )}
    >
      <BrandMark className={size === "sm" ? "size-7" : "size-8"} />
      <span>Benchside</span>
    </Link>
  );
}
