import { Skeleton, SkeletonText } from "@/components/ui/skeleton";

// Generic page-shaped placeholder; areas can add their own loading.tsx for a closer match.
export default function Loading() {
  return (
    <main id="main" tabIndex={-1} aria-busy="true" className="mx-auto w-full max-w-3xl px-4 py-6">
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
    </main>
  );
}
