import { CircleCheck, CircleX, Clock, type LucideIcon, RotateCw } from "lucide-react";
import { Badge, TBody, TD, TH, THead, TR, Table } from "@/components/ui";
import { CHANNEL_LABEL, type SentMessage, mailKindLabel, messageState, triesText } from "@/lib/mail-log";

const ICONS: Record<ReturnType<typeof messageState>["icon"], LucideIcon> = { sent: CircleCheck, waiting: Clock, retrying: RotateCw, failed: CircleX };

type Props = { messages: SentMessage[]; timeZone: string; now: Date };

type Fmt = Intl.DateTimeFormat;

function When({ at, fmt }: { at: Date; fmt: Fmt }) {
  return <time dateTime={at.toISOString()}>{fmt.format(at)}</time>;
}

function State({ m, now }: { m: SentMessage; now: Date }) {
  const s = messageState(m, now);
  return (
    <Badge tone={s.tone} icon={ICONS[s.icon]}>
      {s.label}
    </Badge>
  );
}

/** When it went, or why not and what happens next: the words that answer "did they get it?". */
function Outcome({ m, fmt }: { m: SentMessage; fmt: Fmt }) {
  if (m.state === "sent" && m.sentAt && m.channel === "text")
    return (
      <>
        Taken by the text service <When at={m.sentAt} fmt={fmt} />
        {m.delivery === "delivered" ? "; delivered to the phone" : m.delivery === "undelivered" || m.delivery === "failed" ? "; the carrier could not deliver it" : ""}
      </>
    );
  if (m.state === "sent" && m.sentAt) return <>Taken by the mail service <When at={m.sentAt} fmt={fmt} /></>;
  if (m.state === "dead")
    return (
      <>
        Gave up after {triesText(m.attempts)}.{m.lastError ? ` Last error: ${m.lastError}.` : ""} It won&apos;t go unless someone sends it again.
      </>
    );
  if (m.state === "retrying")
    return (
      <>
        {triesText(m.attempts)} so far.{m.lastError ? ` Last error: ${m.lastError}.` : ""} Next try <When at={m.nextAttemptAt} fmt={fmt} />
      </>
    );
  if (m.state === "queued")
    return (
      <>
        Goes <When at={m.nextAttemptAt} fmt={fmt} />
        {m.heldReason ? ` (held: ${m.heldReason})` : null}
        {m.sendBefore ? <>, not after <When at={m.sendBefore} fmt={fmt} /></> : null}
      </>
    );
  return <>Being handed to the mail service</>;
}

/** A job's messages: one card each on a phone, a table from the small breakpoint up (as the board does). */
export function MessageList({ messages, timeZone, now }: Props) {
  const fmt = new Intl.DateTimeFormat("en-US", { timeZone, month: "short", day: "numeric", hour: "numeric", minute: "2-digit" });
  return (
    <>
      <ul className="space-y-3 sm:hidden" aria-label="Messages about this job">
        {messages.map((m) => (
          <li key={`${m.channel}-${m.id}`} data-testid="message-card" className="space-y-2 rounded-xl border border-line bg-surface p-4">
            <div className="flex flex-wrap items-center justify-between gap-2">
              <span className="font-semibold">{mailKindLabel(m.kind)}</span>
              <State m={m} now={now} />
            </div>
            <p className="break-words">{m.subject}</p>
            <dl className="grid grid-cols-[auto_minmax(0,1fr)] gap-x-3 gap-y-1 text-sm">
              <dt className="text-ink-muted">To</dt>
              <dd className="break-all">{m.to}</dd>
              <dt className="text-ink-muted">By</dt>
              <dd>{CHANNEL_LABEL[m.channel]}</dd>
              <dt className="text-ink-muted">Queued</dt>
              <dd>
                <When at={m.queuedAt} fmt={fmt} />
              </dd>
              <dt className="text-ink-muted">Outcome</dt>
              <dd className="break-words">
                <Outcome m={m} fmt={fmt} />
              </dd>
              {m.providerId ? (
                <>
                  <dt className="text-ink-muted">Service id</dt>
                  <dd className="break-all font-mono text-xs">{m.providerId}</dd>
                </>
              ) : null}
            </dl>
          </li>
        ))}
      </ul>
      <Table label="Messages about this job" wrapperClassName="hidden sm:block">
        <THead>
          <TR>
            <TH>Queued</TH>
            <TH>To</TH>
            <TH>What</TH>
            <TH>State</TH>
            <TH>Outcome</TH>
            <TH>Service id</TH>
          </TR>
        </THead>
        <TBody>
          {messages.map((m) => (
            <TR key={`${m.channel}-${m.id}`} data-testid="message-row">
              <TD className="whitespace-nowrap">
                <When at={m.queuedAt} fmt={fmt} />
              </TD>
              <TD className="break-all">{m.to}</TD>
              <TD>
                <span className="block font-semibold">
                  {mailKindLabel(m.kind)} <span className="font-normal text-ink-muted">· {CHANNEL_LABEL[m.channel]}</span>
                </span>
                <span className="block">{m.subject}</span>
              </TD>
              <TD>
                <State m={m} now={now} />
              </TD>
              <TD className="text-sm">
                <Outcome m={m} fmt={fmt} />
              </TD>
              <TD className="break-all font-mono text-xs">{m.providerId ?? "—"}</TD>
            </TR>
          ))}
        </TBody>
      </Table>
    </>
  );
}
