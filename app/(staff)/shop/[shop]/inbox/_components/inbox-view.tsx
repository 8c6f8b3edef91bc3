"use client";
import Form from "next/form";
import Link from "next/link";
import { useActionState, useEffect, useMemo } from "react";
import { CheckCheck, ChevronLeft, ChevronRight, Inbox as InboxIcon, ListFilter } from "lucide-react";
import { Alert, Button, EmptyState, Field, Input, Select, buttonClasses } from "@/components/ui";
import type { InboxPage } from "@/lib/inbox";
import { type InboxQuery, inboxQueryToSearch } from "@/lib/schemas/inbox";
import { INBOX_KINDS, INBOX_KIND_LABEL } from "@/lib/shop-events";
import { useInbox, useRefreshInbox } from "@/lib/swr/use-inbox";
import { markAllReadAction } from "../actions";
import { InboxItemRow } from "./inbox-item";
import { formBanner } from "@/lib/form-visible";

type Props = { shopSlug: string; timeZone: string; query: InboxQuery; initial: InboxPage };

/** The inbox list: filters (a plain GET form, so the address says what is shown), items, "mark all read" and keyset paging. */
export function InboxView({ shopSlug, timeZone, query, initial }: Props) {
  const search = inboxQueryToSearch(query);
  const { data, error } = useInbox(shopSlug, search, initial);
  const refresh = useRefreshInbox(shopSlug);
  const page = data ?? initial;
  const when = useMemo(() => new Intl.DateTimeFormat("en-US", { timeZone, month: "short", day: "numeric", hour: "numeric", minute: "2-digit" }), [timeZone]);
  const base = `/shop/${shopSlug}/inbox`;
  const filtered = query.kind.length > 0 || query.job != null || query.unread;
  const hasUnread = page.items.some((i) => !i.read);

  return (
    <div className="space-y-4">
      <Form action={base} className="grid gap-3 rounded-xl border border-line bg-surface p-3 sm:grid-cols-[1fr_1fr_auto_auto] sm:items-end sm:p-4">
        <Field id="inbox-kind" label="Kind">
          <Select name="kind" defaultValue={query.kind.length === 1 ? query.kind[0] : ""}>
            <option value="">Every kind</option>
            {INBOX_KINDS.map((k) => (
              <option key={k} value={k}>
                {INBOX_KIND_LABEL[k]}
              </option>
            ))}
          </Select>
        </Field>
        <Field id="inbox-job" label="Job number" hint="e.g. J-0042 or 42">
          <Input name="job" inputMode="text" autoComplete="off" defaultValue={query.job != null ? String(query.job) : ""} />
        </Field>
        <label className="flex min-h-tap items-center gap-2 font-semibold text-ink">
          <input type="checkbox" name="unread" value="1" defaultChecked={query.unread} className="size-5 accent-oil" />
          Unread only
        </label>
        <Button type="submit" variant="secondary" icon={<ListFilter aria-hidden className="size-5" />}>
          Show
        </Button>
      </Form>

      {error ? <Alert tone="warning">The inbox couldn&apos;t be refreshed just now ({error.message}). It tries again by itself.</Alert> : null}

      <div className="flex flex-wrap items-center justify-between gap-3">
        <p className="text-ink-muted" aria-live="polite">
          {page.unread === 0 ? "Nothing unread." : `${page.unread > 99 ? "99+" : page.unread} unread in the shop's inbox.`}
          {filtered ? (
            <>
              {" "}
              <Link href={base} className="font-semibold text-oil underline underline-offset-2">
                Show everything
              </Link>
            </>
          ) : null}
        </p>
        {query.before == null && hasUnread ? <MarkAllRead shopSlug={shopSlug} query={query} through={page.items[0]!.id} onDone={refresh} /> : null}
      </div>

      {page.items.length === 0 ? (
        <EmptyState
          icon={InboxIcon}
          title={filtered ? "Nothing matches" : "Nothing in the inbox yet"}
          description={
            filtered
              ? "No item of this kind or job. Clear the filters to see everything."
              : "Owners' answers, payments, portfolio consent, new followers, mail that couldn't be delivered and parts that came in show up here as they happen."
          }
        />
      ) : (
        <ul className="space-y-2" aria-label="Inbox items">
          {page.items.map((item) => (
            <InboxItemRow key={item.id} shopSlug={shopSlug} item={item} when={when} onChanged={refresh} />
          ))}
        </ul>
      )}

      {query.before != null || page.next != null ? (
        <nav aria-label="Inbox pages" className="flex flex-wrap justify-between gap-3">
          {query.before != null ? (
            <Link href={`${base}?${inboxQueryToSearch({ ...query, before: undefined })}`} className={buttonClasses("secondary")}>
              <ChevronLeft aria-hidden className="size-5" />
              Newest
            </Link>
          ) : (
            <span />
          )}
          {page.next != null ? (
            <Link href={`${base}?${inboxQueryToSearch({ ...query, before: page.next })}`} className={buttonClasses("secondary")}>
              Older
              <ChevronRight aria-hidden className="size-5" />
            </Link>
          ) : null}
        </nav>
      ) : null}
    </div>
  );
}

function MarkAllRead({ shopSlug, query, through, onDone }: { shopSlug: string; query: InboxQuery; through: number; onDone: () => void }) {
  const [state, action, pending] = useActionState(markAllReadAction, null);
  useEffect(() => {
    if (state?.ok) onDone();
  }, [state, onDone]);
  return (
    <form action={action} className="flex flex-col items-end gap-1">
      <input type="hidden" name="shop" value={shopSlug} />
      <input type="hidden" name="through" value={through} />
      <input type="hidden" name="kind" value={query.kind.join(",")} />
      <input type="hidden" name="job" value={query.job != null ? String(query.job) : ""} />
      <Button type="submit" variant="secondary" loading={pending} icon={<CheckCheck aria-hidden className="size-5" />}>
        {query.kind.length || query.job != null ? "Mark these read" : "Mark all read"}
      </Button>
      {state && !state.ok ? (
        <span role="alert" className="text-sm text-rust">
          {formBanner(state.error, [])}
        </span>
      ) : null}
    </form>
  );
}
