import type { TimelineEntry } from "@/lib/journal";

// Which timeline entries are bench records, apart from the component that draws them, so the
// timeline can tell without loading it (components/journal/entry-card.tsx loads it on demand).
const BENCH_KINDS = new Set<TimelineEntry["kind"]>(["torque", "reading", "teardown", "part"]);
export const isBenchEntry = (entry: Pick<TimelineEntry, "kind">) => BENCH_KINDS.has(entry.kind);
