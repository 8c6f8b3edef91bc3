"use client";
import { CircleCheck, FilePenLine, MailCheck, MessageCircleQuestionMark, Plus, Undo2 } from "lucide-react";
import Link from "next/link";
import { Alert, Badge, ButtonLink, Card, EmptyState } from "@/components/ui";
import type { ApprovalsOverview, FindingState, FindingSummary } from "@/lib/approvals-overview";
import { SAFETY_LABEL } from "@/lib/approvals";
import { formatMoney } from "@/lib/money";
import type { WithoutMoney } from "@/lib/money-fields";
import { useJobApprovals } from "@/lib/swr/use-job-approvals";

/** The overview as this reader gets it: without amounts and warnings for someone without `money:view`. */
type Seen = WithoutMoney<ApprovalsOverview>;
type Props = { jobPublicId: string; basePath: string; timeZone: string; initial: Seen; mayDraft: boolean; showMoney: boolean };

export function FindingStateBadge({ finding }: { finding: { state: FindingState; requests: { openedAt: string | null }[] } }) {
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

/** One finding's line under its title: where its request stands, and its amounts for those who see money. */
function findingText(f: Seen["findings"][number], full: FindingSummary | undefined, money: (n: number) => string, when: (iso: string) => string): string {
  const latest = f.requests[0];
  if (latest) {
    const opened = latest.openedAt ? `, opened ${when(latest.openedAt)}` : "";
    const d = latest.decision;
    const priced = full?.requests[0];
    const amounts = priced?.decision ? `, ${money(priced.decision.authorisedTotalMinor)} of ${money(priced.estimateTotalMinor)}` : "";
    return `Version ${latest.version} sent ${when(latest.sentAt)}${opened}${d ? `, answered ${when(d.decidedAt)}: ${d.approved} approved, ${d.declined} declined${amounts}` : ""}.`;
  }
  const lines = `${f.lineCount} line${f.lineCount === 1 ? "" : "s"}`;
  if ("missing" in f.draft) return `${lines}. ${f.draft.missing}`;
  return full && "totals" in full.draft ? `${lines}, ${money(full.draft.totals.totalMinor)} with tax.` : `${lines}.`;
}

/**
 * The job's findings and what the owner has authorised; answers from the owner's phone show up
 * within seconds. A technician sees the findings, where each request stands and which lines were
 * approved or declined, without amounts.
 */
export function ApprovalsPanelView({ jobPublicId, basePath, timeZone, initial, mayDraft, showMoney }: Props) {
  const { data = initial, error } = useJobApprovals(jobPublicId, initial);
  // Amounts reach this page only for people who may see money (the panel and the route strip them otherwise).
  const full = showMoney ? (data as ApprovalsOverview) : null;
  const money = (n: number) => formatMoney(n, data.currency);
  const format = new Intl.DateTimeFormat("en-US", { timeZone, month: "short", day: "numeric", hour: "numeric", minute: "2-digit" });
  const when = (iso: string) => format.format(new Date(iso));
  return (
    <Card
      as="section"
      title="Findings and approvals"
      headingId="approvals-heading"
      actions={mayDraft ? <ButtonLink href={`${basePath}/findings/new`} icon={<Plus aria-hidden className="size-5" />}>Draft a finding</ButtonLink> : undefined}
    >
      <div className="space-y-4">
        {error ? <Alert tone="error">Couldn&apos;t refresh the approvals: {(error as Error).message}</Alert> : null}
        {full ? <Totals data={full} money={money} /> : null}
        {full?.warnings.map((w) => (
          <Alert key={w.findingId} tone="warning" title="Needs the owner's approval">
            {w.message}
          </Alert>
        ))}
        {data.findings.length ? (
          <ul className="divide-y divide-line" aria-label="Findings">
            {[...data.findings].reverse().map((f) => (
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
                  <p className="text-sm text-ink-muted">{findingText(f, full?.findings.find((x) => x.id === f.id), money, when)}</p>
                </div>
              </li>
            ))}
          </ul>
        ) : (
          <EmptyState icon={FilePenLine} title="No findings yet" description="When something needs the owner's OK, draft a finding with photos and the parts and labour it needs." />
        )}
        {data.authorised.lines.length || data.declined.length ? (
          <details className="rounded-lg border border-line p-3">
            <summary className="min-h-tap cursor-pointer content-center font-semibold text-ink">Authorised work and declined recommendations</summary>
            <h3 className="mt-2 font-semibold text-ink">Authorised work</h3>
            <ul className="list-disc pl-5" aria-label="Authorised work">
              {data.authorised.lines.map((l, i) => (
                <li key={`${l.requestPublicId}-${l.lineNo}`}>
                  {l.description}
                  {full ? ` · ${money(full.authorised.lines[i]!.netMinor)}` : ""}
                </li>
              ))}
            </ul>
            {data.declined.length ? (
              <>
                <h3 className="mt-2 font-semibold text-ink">Declined, recommended for later</h3>
                <ul className="list-disc pl-5" aria-label="Declined recommendations">
                  {data.declined.map((l, i) => (
                    <li key={`${l.requestPublicId}-${l.lineNo}`}>
                      {l.description}
                      {full ? ` · ${money(full.declined[i]!.netMinor)}` : ""}
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

/** What the owner has authorised, what was estimated, and what is waiting on them (the desk and the shop owner only). */
function Totals({ data, money }: { data: ApprovalsOverview; money: (n: number) => string }) {
  return (
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
  );
}
