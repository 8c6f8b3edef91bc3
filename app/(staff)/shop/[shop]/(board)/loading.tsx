import { Skeleton, SkeletonText } from "@/components/ui/skeleton";

// Placeholder while the job board loads. It wraps the board only (this route group), after
// the shop layout has checked access, so refusals (403) and missing jobs (404) elsewhere
// under /shop/[shop] are answered with their real status before anything streams.
export default function Loading() {
  return (
    <div aria-busy="true">
      <div role="status">
        <span className="sr-only">Loading…</span>
        <Skeleton className="mb-2 h-8 w-48" />
        <Skeleton className="mb-6 h-4 w-64 max-w-full" />
        <div className="flex flex-col gap-3">
          {[0, 1, 2].map((i) => (
            <div key={i} className="rounded-xl border border-line bg-surface p-4">
              <Skeleton className="mb-3 h-5 w-40" />
              <SkeletonText lines={2} />
            </div>
          ))}
        </div>
      </div>
    </div>
  );
}
