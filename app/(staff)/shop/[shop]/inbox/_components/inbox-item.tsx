"use client";
import Link from "next/link";
import { useActionState, useEffect } from "react";
import clsx from "clsx";
import { Check, CircleDot } from "lucide-react";
import { Badge, Button } from "@/components/ui";
import type { InboxItem } from "@/lib/inbox";
import { formatJobNumber } from "@/lib/schemas/jobs";
import { INBOX_KIND_LABEL } from "@/lib/shop-events";
import { markReadAction } from "../actions";
import { KIND_ICON } from "./kind-look";
import { formBanner } from "@/lib/form-visible";

/** One line of the inbox: what happened, on which job, when; unread ones are marked in words and a dot, with their own "Mark read". */
export function InboxItemRow({ shopSlug, item, when, onChanged }: { shopSlug: string; item: InboxItem; when: Intl.DateTimeFormat; onChanged: () => void }) {
  const [state, action, pending] = useActionState(markReadAction, null);
  useEffect(() => {
    if (state?.ok) onChanged();
  }, [state, onChanged]);
  const read = item.read || state?.ok === true;
  const Icon = KIND_ICON[item.kind];
  const job = item.job ? [formatJobNumber(item.job.number), item.job.machine].filter(Boolean).join(" · ") : null;
  return (
    <li
      data-testid="inbox-item"
      data-read={read ? "true" : "false"}
      className={clsx("flex flex-col gap-3 rounded-xl border p-3 sm:flex-row sm:items-start sm:p-4", read ? "border-line bg-surface" : "border-oil/40 border-l-4 border-l-oil bg-oil-soft/40")}
    >
      <span className={clsx("hidden size-10 shrink-0 items-center justify-center rounded-full sm:flex", read ? "bg-sunken text-ink-muted" : "bg-oil-soft text-oil")}>
        <Icon aria-hidden className="size-5" />
      </span>
      <div className="min-w-0 flex-1 space-y-1">
        <p className="flex flex-wrap items-center gap-x-2 gap-y-1">
          {read ? null : (
            <Badge tone="oil" icon={CircleDot}>
              New
            </Badge>
          )}
          <span className={clsx("text-ink", read ? "font-semibold" : "font-bold")}>{INBOX_KIND_LABEL[item.kind]}</span>
          {/* Server and browser may space "3:12 PM" differently (their ICU versions): the browser's wins. */}
          <time dateTime={item.at} className="text-sm text-ink-muted" suppressHydrationWarning>
            {when.format(new Date(item.at))}
          </time>
        </p>
        <p className="break-words text-ink">
          {item.summary}
          {item.amount ? <span className="font-semibold"> · {item.amount}</span> : null}
        </p>
        {item.detail ? <p className="break-words text-sm text-ink-muted">{item.detail}</p> : null}
        {job ? (
          <Link href={`/shop/${shopSlug}/jobs/${item.job!.number}`} className="inline-flex min-h-tap items-center break-words font-semibold text-oil underline underline-offset-2">
            {job}
          </Link>
        ) : null}
        {state && !state.ok ? (
          <p role="alert" className="text-sm text-rust">
            {formBanner(state.error, [])}
          </p>
        ) : null}
      </div>
      {read ? null : (
        <form action={action} className="shrink-0">
          <input type="hidden" name="shop" value={shopSlug} />
          <input type="hidden" name="item" value={item.id} />
          <Button type="submit" variant="secondary" loading={pending} icon={<Check aria-hidden className="size-5" />} className="w-full sm:w-auto">
            Mark read<span className="sr-only">: {INBOX_KIND_LABEL[item.kind]}, {item.summary}</span>
          </Button>
        </form>
      )}
    </li>
  );
}
