"use client";
import { ChevronDown } from "lucide-react";
import { usePathname } from "next/navigation";
import { type ReactNode, useEffect, useId, useRef, useState, useSyncExternalStore } from "react";
import { CAUTIONS_SEEN_KEY, cautionKey, hasSeen, parseSeen, withSeen } from "@/lib/caution-seen";

function readSeen() {
  try {
    return parseSeen(localStorage.getItem(CAUTIONS_SEEN_KEY));
  } catch {
    return {};
  }
}

// What the browser said when the caution was first shown on this visit, held until it leaves the
// screen: marking it seen while it is being read must not fold it under the reader.
const firstLook = new Map<string, boolean>();
function seenAtFirstLook(key: string): boolean {
  let seen = firstLook.get(key);
  if (seen === undefined) {
    seen = hasSeen(readSeen(), key);
    firstLook.set(key, seen);
  }
  return seen;
}
const noUpdates = () => () => undefined;

/**
 * The body of a <Caution rememberAs="…">: in full on the first visit to the page (and whenever
 * scripts don't run); once it has been on screen, later visits show it folded under its title, with
 * a button that opens it in one tap. Remembered per page and caution (lib/caution-seen.ts).
 */
export function CautionFold({ id, title, children }: { id: string; title: ReactNode; children: ReactNode }) {
  const key = cautionKey(usePathname(), id);
  const bodyId = useId();
  const ref = useRef<HTMLDivElement>(null);
  // null on the server and while hydrating: rendered open, as without scripts.
  const seenBefore = useSyncExternalStore(noUpdates, () => seenAtFirstLook(key), () => null);
  const [choice, setChoice] = useState<boolean | null>(null);

  useEffect(() => () => void firstLook.delete(key), [key]);

  useEffect(() => {
    if (seenBefore !== false) return;
    // Seen means shown on screen, not just rendered somewhere below.
    const mark = () => {
      try {
        localStorage.setItem(CAUTIONS_SEEN_KEY, JSON.stringify(withSeen(readSeen(), key, Date.now())));
      } catch {
        // No storage: it simply shows in full every time.
      }
    };
    const el = ref.current;
    if (!el || typeof IntersectionObserver === "undefined") return mark();
    const watch = new IntersectionObserver((entries) => {
      if (entries.some((e) => e.isIntersecting)) {
        mark();
        watch.disconnect();
      }
    });
    watch.observe(el);
    return () => watch.disconnect();
  }, [seenBefore, key]);

  const open = choice ?? seenBefore !== true;
  return (
    <div ref={ref} className="flex flex-col gap-1">
      <div className="flex items-start justify-between gap-2">
        <p className="self-center font-semibold">{title}</p>
        {seenBefore === null ? null : (
          <button
            type="button"
            aria-expanded={open}
            aria-controls={bodyId}
            onClick={() => setChoice(!open)}
            className="-my-2 -mr-2 inline-flex min-h-tap shrink-0 items-center gap-1 rounded-lg px-3 text-sm font-semibold text-ink underline underline-offset-2 hover:bg-signal/10"
          >
            {open ? "Hide" : "Show"}
            <span className="sr-only"> the safety caution</span>
            <ChevronDown aria-hidden className={open ? "size-4 rotate-180" : "size-4"} />
          </button>
        )}
      </div>
      <div id={bodyId} hidden={!open}>
        {children}
      </div>
    </div>
  );
}
