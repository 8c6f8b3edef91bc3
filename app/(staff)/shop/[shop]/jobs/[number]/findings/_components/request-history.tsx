import Link from "next/link";
import { CircleCheck, MailCheck, MessageCircleQuestionMark, Replace, Undo2 } from "lucide-react";
import { Badge, Card } from "@/components/ui";
import { DecisionRecord } from "@/components/approvals/decision-record";
import { RequestLines } from "@/components/approvals/request-lines";
import type { DecisionRow, RequestRow } from "@/db/queries/approvals";
import { PhoneDecisionForm } from "./phone-decision-form";
import { WithdrawButton } from "./withdraw-button";

type Props = {
  requests: RequestRow[];
  decisions: Map<number, DecisionRow>;
  timeZone: string;
  mayPrice: boolean;
  mayRecord: boolean;
  /** Amounts of what was sent and answered: not for a technician. */
  showMoney: boolean;
  owner: { name: string; phone: string | null };
};

function StateBadge({ r }: { r: RequestRow }) {
  if (r.status === "answered") return <Badge tone="moss" icon={CircleCheck}>Answered</Badge>;
  if (r.status === "withdrawn") return <Badge icon={Undo2}>Withdrawn</Badge>;
  if (r.status === "replaced") return <Badge tone="dusk" icon={Replace}>Replaced by a revision</Badge>;
  return r.openedAt ? <Badge tone="brass" icon={MailCheck}>Opened, not answered</Badge> : <Badge tone="brass" icon={MessageCircleQuestionMark}>Sent, not opened yet</Badge>;
}

/** Every version sent for this finding, newest first: its life, the answer on record, and what the desk can still do. */
export function RequestHistory({ requests, decisions, timeZone, mayPrice, mayRecord, showMoney, owner }: Props) {
  const when = new Intl.DateTimeFormat("en-US", { timeZone, dateStyle: "medium", timeStyle: "short" });
  const at = (iso: string | null) => (iso ? when.format(new Date(iso)) : null);
  return (
    <section aria-labelledby="requests-heading" className="space-y-3">
      <h2 id="requests-heading" className="text-xl font-bold text-ink">
        Sent to the owner
      </h2>
      {requests.map((r) => {
        const decision = decisions.get(r.id);
        const facts: [string, string | null][] = [
          ["Sent", `${at(r.sentAt)}${r.sentBy ? ` by ${r.sentBy}` : ""}${r.sentTo ? `, e-mailed to ${r.sentTo}` : ", no e-mail on file"}`],
          ["Opened by the owner", at(r.openedAt) ?? "Not yet"],
          ["Answered", at(r.answeredAt)],
          ["Withdrawn", at(r.withdrawnAt)],
        ];
        return (
          <Card key={r.publicId} as="article" title={`Version ${r.version}`} headingLevel={3} headingId={`request-${r.publicId}`} actions={<StateBadge r={r} />}>
            <div className="space-y-4" data-testid="request-card">
              <dl className="grid grid-cols-1 gap-x-4 gap-y-1 sm:grid-cols-[auto_1fr]">
                {facts
                  .filter(([, v]) => v != null)
                  .map(([term, value]) => (
                    <div key={term} className="contents">
                      <dt className="text-ink-muted">{term}</dt>
                      <dd>{value}</dd>
                    </div>
                  ))}
              </dl>
              <Link href={`/my/jobs/${r.jobPublicId}/approvals/${r.publicId}`} className="inline-flex min-h-tap items-center font-semibold text-oil underline underline-offset-2">
                See it as the owner does
              </Link>
              {decision ? (
                <DecisionRecord decision={decision} snapshot={r.snapshot} timeZone={timeZone} staff headingLevel={3} showMoney={showMoney} />
              ) : (
                <RequestLines snapshot={r.snapshot} label={`Lines of version ${r.version}`} showMoney={showMoney} />
              )}
              {r.status === "sent" && (mayPrice || mayRecord) ? (
                <div className="flex flex-wrap gap-2">
                  {mayRecord ? <PhoneDecisionForm snapshot={r.snapshot} hash={r.hash} ownerName={owner.name} ownerPhone={owner.phone} /> : null}
                  {mayPrice ? <WithdrawButton requestPublicId={r.publicId} /> : null}
                </div>
              ) : null}
            </div>
          </Card>
        );
      })}
    </section>
  );
}
