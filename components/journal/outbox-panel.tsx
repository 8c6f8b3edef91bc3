"use client";
import { useRouter } from "next/navigation";
import { useCallback } from "react";
import { CircleAlert, Clock, RotateCcw, Trash2, UploadCloud, UserRound, WifiOff } from "lucide-react";
import { Alert, Button, Card } from "@/components/ui";
import { discardItem, isMine, retryItem } from "@/lib/client/bench-outbox";
import { isQueued } from "@/lib/client/queue-post";
import { useOutbox } from "@/lib/client/use-outbox";

/**
 * "Waiting to send (n)": this job's posts kept on the phone until the network is back (issue 20
 * §2), each with its progress; a post the server refused shows its words with Retry / Discard. A
 * post someone else queued on this phone is never sent as the person signed in now: it says so,
 * with Discard. Renders nothing when the outbox holds nothing of this job. Mounting it starts the
 * runner (the staff layout has already: one runner per tab).
 */
export function OutboxPanel({ jobPublicId, onSent }: { jobPublicId: string; onSent?: () => void }) {
  const router = useRouter();
  // Without a hook of its own (the bench page), what was sent shows after a refresh of the page.
  const sent = useCallback(() => (onSent ? onSent() : router.refresh()), [onSent, router]);
  const { items, others, fractions, offline, me } = useOutbox(jobPublicId, sent);
  if (!items.length && !others) return null;
  const stopped = items.filter((i) => i.state === "held" || !isMine(i, me)).length;
  return (
    <Card as="section" title={`Waiting to send (${items.length})`} headingId="outbox-heading">
      <div className="space-y-3" data-testid="outbox">
        <p className="flex items-center gap-2 text-sm text-ink-muted" aria-live="polite">
          {offline ? <WifiOff aria-hidden className="size-5 shrink-0 text-signal" /> : <UploadCloud aria-hidden className="size-5 shrink-0 text-oil" />}
          {offline
            ? "No network. These are kept on this phone and go in this order when it is back, even if you close the page."
            : stopped === items.length && items.length
              ? "Sending is stopped for what is below until you decide."
              : "Sending in the order they were made…"}
        </p>
        {items.length ? (
          <ol className="space-y-2" aria-label="Posts waiting to send">
            {items.map((item) => {
              const fraction = fractions[item.seq];
              if (!isMine(item, me)) return <ForeignItem key={item.seq} label={item.label} seq={item.seq} />;
              return (
                <li key={item.seq} className="rounded-lg border border-line p-3" data-testid="outbox-item">
                  <div className="flex items-center gap-2">
                    {item.state === "held" ? <CircleAlert aria-hidden className="size-5 shrink-0 text-rust" /> : <Clock aria-hidden className="size-5 shrink-0 text-ink-muted" />}
                    <span className="min-w-0 flex-1 truncate font-semibold">{item.label}</span>
                    <span className="text-sm text-ink-muted">{item.state === "held" ? "Not sent" : fraction !== undefined ? `Sending ${Math.round(fraction * 100)} %` : "Waiting"}</span>
                  </div>
                  {item.state === "waiting" && (fraction !== undefined || item.kind === "photos" || item.kind === "clip") ? (
                    <progress className="mt-2 h-3 w-full accent-oil" max={1} value={fraction ?? 0} aria-label={`Sending ${item.label}`} />
                  ) : null}
                  {item.state === "waiting" && item.lastError ? <p className="mt-1 text-sm text-ink-muted">Last try: {item.lastError} It will be tried again by itself.</p> : null}
                  {item.state === "held" ? (
                    <div className="mt-2 space-y-2">
                      <Alert tone="error">{item.lastError}</Alert>
                      <div className="flex flex-wrap gap-2">
                        <Button variant="secondary" icon={<RotateCcw aria-hidden className="size-5" />} onClick={() => void retryItem(item.seq)}>
                          Retry
                        </Button>
                        <Button variant="ghost" icon={<Trash2 aria-hidden className="size-5" />} onClick={() => void discardItem(item.seq)} aria-label={`Discard ${item.label}`}>
                          Discard
                        </Button>
                      </div>
                    </div>
                  ) : null}
                </li>
              );
            })}
          </ol>
        ) : null}
        {others ? (
          <p className="text-sm text-ink-muted">
            {others} more waiting for other jobs; {others === 1 ? "it goes" : "they go"} in the same line.
          </p>
        ) : null}
      </div>
    </Card>
  );
}

/** A post queued on this phone by someone signed in before: it goes only when they sign in again. */
function ForeignItem({ label, seq }: { label: string; seq: number }) {
  return (
    <li className="rounded-lg border border-line p-3" data-testid="outbox-item">
      <div className="flex items-center gap-2">
        <UserRound aria-hidden className="size-5 shrink-0 text-ink-muted" />
        <span className="min-w-0 flex-1 truncate font-semibold">{label}</span>
        <span className="text-sm text-ink-muted">Someone else’s</span>
      </div>
      <p className="mt-1 text-sm text-ink-muted">
        Queued on this phone by another person, so it isn’t sent under your name. It goes when they sign in here; or discard it.
      </p>
      <div className="mt-2">
        <Button variant="ghost" icon={<Trash2 aria-hidden className="size-5" />} onClick={() => void discardItem(seq)} aria-label={`Discard ${label}`}>
          Discard
        </Button>
      </div>
    </li>
  );
}

/** Under a form whose post went into the outbox instead of straight to the server. */
export function QueuedNotice({ state }: { state: { ok: boolean; data?: unknown } | null }) {
  if (!state?.ok || !isQueued(state.data)) return null;
  return (
    <Alert tone="info" title="Kept on this phone">
      No network right now: it is sent by itself, in order, when the connection is back (see “Waiting to send”).
    </Alert>
  );
}
