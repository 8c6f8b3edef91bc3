import type { Metadata } from "next";
import { notFound } from "next/navigation";
import { Alert, ButtonLink, Card, PageHeader } from "@/components/ui";
import { DecisionRecord } from "@/components/approvals/decision-record";
import { EvidenceList } from "@/components/approvals/evidence-list";
import { FindingCaution } from "@/components/approvals/finding-caution";
import { RequestLines } from "@/components/approvals/request-lines";
import { formatJobNumber } from "@/lib/schemas/jobs";
import { type RequestView, requestView } from "@/lib/server/approval-views";
import { loadPage } from "@/lib/server/page-access";
import { AnswerForm } from "./_components/answer-form";
import { QuestionThread } from "@/components/questions/question-thread";
import { can } from "@/lib/permissions";
import { jobThread } from "@/lib/server/questions";
import { AskForm } from "../../_components/ask-form";

export const metadata: Metadata = { title: "The shop's request" };

type Props = { params: Promise<{ job: string; request: string }> };

/** One approval request, for the machine's owner (to answer) and the job's staff (to see what was sent). */
export default async function ApprovalRequestPage({ params }: Props) {
  const { job: jobPublicId, request: requestPublicId } = await params;
  // Someone else's request looks like one that doesn't exist; a request of another job in the address is a 404 too.
  const { actor, ...found } = await loadPage("request", { request: requestPublicId }, "job:view", `/my/jobs/${jobPublicId}/approvals/${requestPublicId}`);
  if (found.request.jobPublicId !== jobPublicId) notFound();
  // Questions are the owner's (followers never see them: they may be about prices).
  const mayAsk = can(actor, "questions:ask", found.resource);
  const [view, thread] = await Promise.all([requestView(actor, found, jobPublicId), mayAsk ? jobThread({ shopId: found.job.shopId, jobId: found.job.id }) : []]);
  // This request's questions and their answers.
  const about = new Set(thread.filter((m) => m.line?.requestPublicId === requestPublicId).map((m) => m.id));
  const requestThread = thread.filter((m) => about.has(m.id) || (m.answersQuestionId != null && about.has(m.answersQuestionId)));
  const { snapshot, job } = view;
  const when = new Intl.DateTimeFormat("en-US", { timeZone: job.timeZone, dateStyle: "medium", timeStyle: "short" });
  const jobPath = `/my/jobs/${jobPublicId}`;

  return (
    <div className="space-y-4">
      <PageHeader title={snapshot.finding.title} description={`${job.shopName} · ${formatJobNumber(job.number)} · ${job.machine}`} back={{ href: jobPath, label: "Back to your job" }} />
      <StatusNote view={view} jobPath={jobPath} sentAt={when.format(new Date(view.sentAt))} />
      <Card as="section" title="What the shop found" headingId="finding-heading">
        <div className="space-y-3">
          <p className="whitespace-pre-line">{snapshot.finding.found}</p>
          {snapshot.finding.whyItMatters ? (
            <>
              <h3 className="font-semibold text-ink">Why it matters</h3>
              <p className="whitespace-pre-line">{snapshot.finding.whyItMatters}</p>
            </>
          ) : null}
          <FindingCaution safety={snapshot.finding.safety} />
          <EvidenceList evidence={view.evidence} />
        </div>
      </Card>
      {view.status === "sent" && view.mayAnswer ? (
        <AnswerForm snapshot={snapshot} hash={view.hash} jobPublicId={jobPublicId} ownerName={job.ownerName} />
      ) : view.decision ? (
        <DecisionRecord decision={view.decision} snapshot={snapshot} timeZone={job.timeZone} staff={view.audience === "shop"} showMoney={view.mayViewMoney} />
      ) : (
        <Card as="section" title="What the shop proposed" headingId="lines-heading">
          <RequestLines snapshot={snapshot} showMoney={view.mayViewMoney} />
        </Card>
      )}
      {mayAsk ? (
        <Card as="section" title="Ask about a line" headingId="ask-line" description="Not sure about something before you answer? Ask the shop; your answer can wait for theirs.">
          <div className="space-y-4">
            {requestThread.length ? (
              <QuestionThread thread={requestThread} timeZone={job.timeZone} viewer="owner" shopName={job.shopName} requestHref={(r) => `${jobPath}/approvals/${r}`} />
            ) : null}
            <AskForm jobPublicId={jobPublicId} request={{ publicId: requestPublicId, lines: snapshot.lines.map((l) => ({ no: l.no, description: l.description })) }} />
          </div>
        </Card>
      ) : null}
    </div>
  );
}

function StatusNote({ view, jobPath, sentAt }: { view: RequestView; jobPath: string; sentAt: string }) {
  const version = view.version > 1 ? ` (version ${view.version})` : "";
  if (view.status === "replaced" || (view.current && view.status !== "answered")) {
    return (
      <Alert tone="warning" title="There is a newer version" action={view.current ? <ButtonLink href={`${jobPath}/approvals/${view.current}`}>See the current version</ButtonLink> : undefined}>
        The shop revised this request after sending it, so this version{version} can no longer be answered.
      </Alert>
    );
  }
  if (view.status === "withdrawn") return <Alert tone="info" title="Withdrawn">The shop withdrew this request; there is nothing to answer. They will be in touch if the work is still needed.</Alert>;
  if (view.status === "answered") return <Alert tone="success" title="Answered">This request{version} has been answered. The record below is what was agreed.</Alert>;
  if (!view.mayAnswer) {
    return (
      <Alert tone="info" title="Waiting for the owner">
        Sent {sentAt}
        {version}. {view.openedAt ? "The owner has opened it." : "The owner hasn't opened it yet."}
        {view.mayRecord ? " If they answer by phone or in person, note it on the finding's page." : ""}
      </Alert>
    );
  }
  return (
    <Alert tone="info" title="The shop needs your answer">
      Sent {sentAt}
      {version}. Approve the lines you want done and decline the others; you can ask for the replaced parts back.
    </Alert>
  );
}
