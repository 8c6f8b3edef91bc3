import clsx from "clsx";

export type SkeletonProps = {
  /** Size and shape via utilities, e.g. "h-6 w-40" or "h-24 w-full rounded-xl". */
  className?: string;
};

/** A placeholder block. Hidden from screen readers; wrap a group in a role="status" region instead. */
export function Skeleton({ className }: SkeletonProps) {
  return <div aria-hidden className={clsx("rounded-md bg-sunken motion-safe:animate-pulse", className)} />;
}

/** A few text-like lines, the last one shorter so it reads as a paragraph. */
export function SkeletonText({ lines = 3, className }: { lines?: number; className?: string }) {
  return (
    <div aria-hidden className={clsx("flex flex-col gap-2", className)}>
      {Array.from({ length: lines }, (_, i) => (
        <Skeleton key={i} className={clsx("h-4", i === lines - 1 ? "w-2/3" : "w-full")} />
      ))}
    </div>
  );
}
