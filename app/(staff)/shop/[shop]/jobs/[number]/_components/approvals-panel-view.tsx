"use client";
import { CircleCheck, FilePenLine, MailCheck, MessageCircleQuestionMark, Plus, Undo2 } from "lucide-react";
import Link from "next/link";
import { Alert, Badge, ButtonLink, Card, EmptyState } from "@/components/ui";
import type { ApprovalsOverview, FindingSummary } from "@/lib/approvals-overview";
import { SAFETY_LABEL } from "@/lib/approvals";
import { formatMoney } from "@/lib/money";
import { useJobApprovals } from "@/lib/swr/use-job-approvals";

type Props = { jobPublicId: string; basePath: string; timeZone: string; initial: ApprovalsOverview; mayDraft: boolean };

export function FindingStateBadge({ finding }: { finding: Pick<FindingSummary, "state" | "requests"> }) {
  const latest = finding.requests[0];
  if (finding.state === "draft") return <Badge icon={FilePenLine}>Draft, not sent</Badge>;
  if (finding.state === "answered") return <Badge tone="moss" icon={CircleCheck}>Answered</Badge>;
  if (finding.state === "withdrawn") return <Badge icon={Undo2}>Withdrawn</Badge>;
  return latest?.openedAt ? (
    <Badge tone="brass" icon={MailCheck}>
      Opened, not answered
    </Badge>
  ) : (
    <Badge tone="brass" icon={MessageCircleQuestionMark}>
      Sent, not opened yet
    </Badge>
  );
}

/** The job's findings and what the owner has authorised; answers from the owner's phone show up within seconds. */
export function ApprovalsPanelView({ jobPublicId, basePath, timeZone, initial, mayDraft }: Props) {
  const { data = initial, error } = useJobApprovals(jobPublicId, initial);
  const money = (n: number) => formatMoney(n, data.currency);
  const when = new Intl.DateTimeFormat("en-US", { timeZone, month: "short", day: "numeric", hour: "numeric", minute: "2-digit" });
  return (
    <Card
      as="section"
      title="Findings and approvals"
      headingId="approvals-heading"
      actions={mayDraft ? <ButtonLink href={`${basePath}/findings/new`} icon={<Plus aria-hidden className="size-5" />}>Draft a finding</ButtonLink> : undefined}
    >
      <div className="space-y-4">
        {error ? <Alert tone="error">Couldn&apos;t refresh the approvals: {(error as Error).message}</Alert> : null}
        <dl className="grid gap-3 sm:grid-cols-3" data-testid="approval-totals">
          <div className="rounded-lg bg-moss-soft p-3">
            <dt className="text-sm text-ink">Authorised by the owner</dt>
            <dd className="text-xl font-bold tabular-nums text-ink" data-testid="authorised-total">
              {money(data.authorised.totalMinor)}
            </dd>
            <dd className="text-sm text-ink">{money(data.authorised.preTaxMinor)} before tax</dd>
          </div>
          <div className="rounded-lg bg-sunken p-3">
            <dt className="text-sm text-ink-muted">Estimated on answered requests</dt>
            <dd className="text-xl font-bold tabular-nums text-ink">{money(data.estimated.totalMinor)}</dd>
          </div>
          <div className="rounded-lg bg-brass-soft p-3">
            <dt className="text-sm text-ink">Waiting for the owner</dt>
            <dd className="text-xl font-bold tabular-nums text-ink">{data.awaiting.count ? money(data.awaiting.totalMinor) : "Nothing"}</dd>
            {data.awaiting.count ? <dd className="text-sm text-ink">{data.awaiting.count} request{data.awaiting.count === 1 ? "" : "s"}</dd> : null}
          </div>
        </dl>
        {data.warnings.map((w) => (
          <Alert key={w.findingId} tone="warning" title="Needs the owner's approval">
            {w.message}
          </Alert>
        ))}
        {data.findings.length ? (
          <ul className="divide-y divide-line" aria-label="Findings">
            {[...data.findings].reverse().map((f) => {
              const latest = f.requests[0];
              return (
                <li key={f.id} className="flex flex-wrap items-start justify-between gap-3 py-3" data-testid="finding-row">
                  <div className="min-w-0 space-y-1">
                    <Link href={`${basePath}/findings/${f.id}`} className="font-semibold text-oil underline underline-offset-2">
                      {f.title}
                    </Link>
                    <div className="flex flex-wrap gap-2">
                      <FindingStateBadge finding={f} />
                      {f.safety !== "none" ? <Badge tone="signal">{SAFETY_LABEL[f.safety]}</Badge> : null}
                      {f.changedSinceSent ? <Badge tone="dusk">Edited since sent</Badge> : null}
                    </div>
                    <p className="text-sm text-ink-muted">
                      {latest
                        ? `Version ${latest.version} sent ${when.format(new Date(latest.sentAt))}${latest.openedAt ? `, opened ${when.format(new Date(latest.openedAt))}` : ""}${latest.decision ? `, answered ${when.format(new Date(latest.decision.decidedAt))}: ${latest.decision.approved} approved, ${latest.decision.declined} declined, ${money(latest.decision.authorisedTotalMinor)} of ${money(latest.estimateTotalMinor)}` : ""}.`
                        : "totals" in f.draft
                          ? `${f.lineCount} line${f.lineCount === 1 ? "" : "s"}, ${money(f.draft.totals.totalMinor)} with tax.`
                          : `${f.lineCount} line${f.lineCount === 1 ? "" : "s"}. ${f.draft.missing}`}
                    </p>
                  </div>
                </li>
              );
            })}
          </ul>
        ) : (
          <EmptyState icon={FilePenLine} title="No findings yet" description="When something needs the owner's OK, draft a finding with photos and the parts and labour it needs." />
        )}
        {data.authorised.lines.length || data.declined.length ? (
          <details className="rounded-lg border border-line p-3">
            <summary className="min-h-tap cursor-pointer content-center font-semibold text-ink">Authorised work and declined recommendations</summary>
            <h3 className="mt-2 font-semibold text-ink">Authorised work</h3>
            <ul className="list-disc pl-5" aria-label="Authorised work">
              {data.authorised.lines.map((l) => (
                <li key={`${l.requestPublicId}-${l.lineNo}`}>
                  {l.description} · {money(l.netMinor)}
                </li>
              ))}
            </ul>
            {data.declined.length ? (
              <>
                <h3 className="mt-2 font-semibold text-ink">Declined, recommended for later</h3>
                <ul className="list-disc pl-5" aria-label="Declined recommendations">
                  {data.declined.map((l) => (
                    <li key={`${l.requestPublicId}-${l.lineNo}`}>
                      {l.description} · {money(l.netMinor)}
                    </li>
                  ))}
                </ul>
              </>
            ) : null}
          </details>
        ) : null}
      </div>
    </Card>
  );
}
