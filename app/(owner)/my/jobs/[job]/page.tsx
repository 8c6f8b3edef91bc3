import type { Metadata } from "next";
import { Suspense } from "react";
import { listTimeline } from "@/db/queries/journal";
import { StatusBadge } from "@/components/status-badge";
import { Card, PageHeader } from "@/components/ui";
import { describeMachine } from "@/lib/machine";
import { formatJobNumber } from "@/lib/schemas/jobs";
import { loadPage } from "@/lib/server/page-access";
import { authorisedWorkOf, shopBySlug } from "@/lib/server/request-cache";
import { ownerPartWaitLines } from "@/lib/server/part-orders";
import { TIMELINE_PAGE_SIZE } from "@/lib/timeline-paging";
import { OwnerTimeline } from "./_components/owner-timeline";
import { LiveJobUpdates } from "@/components/live-updates";
import { latestEventId } from "@/db/queries/shop-events";
import { OwedDecisions } from "./_components/owed-decisions";
import { DropoffNotice } from "./_components/dropoff-notice";
import { FollowingCard } from "./_components/following-card";
import { QuestionsCard } from "./_components/questions-card";
import { ShopContactCard } from "./_components/shop-contact-card";
import { getReassemblyProgress } from "@/db/queries/bench";
import { ReassemblyProgress } from "@/components/journal/reassembly-progress";
import { OwnerInvoiceCard } from "@/components/invoices/owner-invoice-card";
import { PortfolioConsentNotice } from "./portfolio/_components/consent-notice";
import { collectedAt, jobFacts } from "@/db/queries/workflow";
import { ownerStanding } from "@/lib/job-workflow";
import { shopToday } from "@/lib/jobs-view";

export const metadata: Metadata = { title: "Your job" };

export default async function MyJobPage({ params }: { params: Promise<{ job: string }> }) {
  const { job: publicId } = await params;
  const { actor, job, resource, audience: seenAs } = await loadPage("job", { job: publicId }, "job:view", `/my/jobs/${publicId}`);
  // A follower reads without money or decisions; everyone else here reads as the owner.
  const audience = seenAs === "follower" ? "follower" : "owner";
  const key = { shopId: job.shopId, jobId: job.id };
  // All at once: the page's reads don't depend on each other. The owner's page always reads as
  // the owner, even for staff who look at their own machine; its first page of the timeline goes
  // out with the page and to SWR once, older pages through the timeline API on demand.
  // Reassembly is shown once the shop has logged the machine coming apart and is putting it back
  // together: not while it waits on the owner's answer or on parts, when a percentage would
  // promise too much. The page follows the job live from the newest event before these reads, so
  // nothing that lands while they run is missed.
  const since = await latestEventId();
  const [shop, timeline, reassembly, facts, collected, work, partWaits] = await Promise.all([
    shopBySlug(job.shopSlug),
    listTimeline({ shopId: job.shopId, jobId: job.id, audience, order: "desc", limit: TIMELINE_PAGE_SIZE }),
    job.status === "in_progress" || job.status === "ready" ? getReassemblyProgress(key) : null,
    jobFacts(key),
    job.status === "picked_up" ? collectedAt(key) : null,
    audience === "owner" ? authorisedWorkOf(key.shopId, key.jobId) : null,
    // Parts on the way for cleared work only (approved, or booked in): never work not yet asked
    // about. The owner only: which parts come says what was approved, and followers see no decisions.
    audience === "owner" && job.status !== "ready" && job.status !== "picked_up" ? ownerPartWaitLines(key) : [],
  ]);
  const timeZone = shop?.timezone ?? "UTC";
  const standing = ownerStanding({
    status: job.status,
    promisedOn: job.promisedOn,
    facts,
    declined: work ? work.record.flatMap((e) => e.declined.map((d) => d.description)) : [],
    collectedOn: collected ? shopToday(timeZone, collected) : null,
  });
  return (
    <div className="space-y-4">
      <LiveJobUpdates jobPublicId={job.publicId} since={since} />
      <PageHeader
        title={describeMachine(job.machine)}
        description={`${job.shopName} · ${formatJobNumber(job.number)}`}
        back={{ href: "/my", label: "My machines" }}
      />
      <OwedDecisions actor={actor} job={job} />
      <DropoffNotice actor={actor} job={job} resource={resource} timeZone={timeZone} />
      {/* Secondary cards stream in after the page's first part (they are often empty). */}
      <Suspense fallback={null}>
        <OwnerInvoiceCard actor={actor} job={job} resource={resource} />
      </Suspense>
      <Suspense fallback={null}>
        <PortfolioConsentNotice actor={actor} job={job} resource={resource} />
      </Suspense>
      <Card as="section" title="Where it stands" headingId="where-it-stands">
        <div className="space-y-2">
          <StatusBadge status={job.status} />
          <p className="font-semibold text-ink" data-testid="standing">
            {standing.headline}
          </p>
          {standing.lines.map((line) => (
            <p key={line}>{line}</p>
          ))}
          {partWaits.map((line) => (
            <p key={line} data-testid="part-wait">
              {line}
            </p>
          ))}
        </div>
      </Card>
      {reassembly ? <ReassemblyProgress {...reassembly} /> : null}
      <Card as="section" title={audience === "follower" ? "What the owner told the shop" : "What you told the shop"} headingId="your-concern">
        <p className="whitespace-pre-line">{job.concern}</p>
      </Card>
      <section aria-labelledby="updates-heading" className="space-y-3">
        <h2 id="updates-heading" className="text-xl font-bold text-ink">
          Updates from the shop
        </h2>
        <OwnerTimeline jobPublicId={job.publicId} timeZone={timeZone} initial={{ ...timeline, audience }} />
      </section>
      <Suspense fallback={null}>
        <QuestionsCard actor={actor} job={job} resource={resource} shopName={job.shopName} timeZone={timeZone} />
      </Suspense>
      <Suspense fallback={null}>
        <ShopContactCard shopId={job.shopId} />
      </Suspense>
      <Suspense fallback={null}>
        <FollowingCard actor={actor} job={job} resource={resource} />
      </Suspense>
    </div>
  );
}
