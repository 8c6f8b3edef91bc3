import type { ReactNode } from "react";
import { CheckCircle2, Clock } from "lucide-react";
import { Badge } from "@/components/ui";
import { VIA_LABEL, type ThreadMessage, lineLabel } from "@/lib/questions";

// A job's questions and answers, oldest first, with who wrote each and when (on the shop's
// clock). Both sides read the same list; the desk gets an answer form under each open question.

type Props = {
  thread: readonly ThreadMessage[];
  timeZone: string;
  /** "owner": the owner's own messages read "You"; "shop": names throughout. */
  viewer: "owner" | "shop";
  shopName: string;
  /** The approval request page a line links to. */
  requestHref: (requestPublicId: string) => string;
  /** Under an open question (the desk's answer form). */
  renderAnswer?: (question: ThreadMessage) => ReactNode;
};

export function QuestionThread({ thread, timeZone, viewer, shopName, requestHref, renderAnswer }: Props) {
  const when = new Intl.DateTimeFormat("en-US", { timeZone, dateStyle: "medium", timeStyle: "short" });
  return (
    <ol className="space-y-3" data-testid="question-thread">
      {thread.map((m) => {
        const owner = m.author === "owner";
        const who = owner ? (viewer === "owner" ? "You" : (m.authorName ?? "The owner")) : `${m.authorName ?? "Someone"} at ${shopName}`;
        return (
          <li key={m.id} className={owner ? "rounded-lg border border-line bg-paper p-3" : "ml-4 rounded-lg border-l-4 border-oil bg-surface p-3"} data-testid={owner ? "thread-question" : "thread-answer"}>
            <p className="text-sm text-ink-muted">
              <span className="font-semibold text-ink">{who}</span> {owner ? "asked" : "answered"}
              {owner && m.via !== "page" ? ` ${VIA_LABEL[m.via]}` : ""} · <time dateTime={m.at}>{when.format(new Date(m.at))}</time>
            </p>
            {m.line ? (
              <p className="text-sm">
                <a href={requestHref(m.line.requestPublicId)} className="inline-flex min-h-tap items-center font-semibold text-oil underline underline-offset-2 hover:no-underline">
                  {lineLabel(m.line)}
                </a>
              </p>
            ) : null}
            <p className="mt-1 whitespace-pre-line break-words">{m.body}</p>
            {owner ? (
              <p className="mt-2">
                {m.answeredAt ? (
                  <Badge tone="moss" icon={CheckCircle2}>
                    Answered
                  </Badge>
                ) : (
                  <Badge tone="signal" icon={Clock}>
                    {viewer === "owner" ? "Waiting for the shop's answer" : "Waiting for an answer"}
                  </Badge>
                )}
              </p>
            ) : null}
            {owner && !m.answeredAt && renderAnswer ? <div className="mt-3">{renderAnswer(m)}</div> : null}
          </li>
        );
      })}
    </ol>
  );
}
