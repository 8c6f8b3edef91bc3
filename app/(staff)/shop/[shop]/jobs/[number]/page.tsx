import type { Metadata } from "next";
import Link from "next/link";
import { Suspense } from "react";
import { jobFacts } from "@/db/queries/workflow";
import { WAITING_ON_LABEL, waitingOn } from "@/lib/job-workflow";
import { listTimeline } from "@/db/queries/journal";
import { StatusBadge } from "@/components/status-badge";
import { BenchQuickPost } from "@/components/bench-quick-post";
import { FollowersCard } from "@/components/journal/followers-card";
import { ButtonLink, Card, PageHeader, Skeleton } from "@/components/ui";
import { MACHINE_KIND_LABEL, describeMachine } from "@/lib/machine";
import { can } from "@/lib/permissions";
import { formatJobNumber, jobNumberParamSchema } from "@/lib/schemas/jobs";
import { staffJobPage } from "@/lib/server/page-access";
import { TIMELINE_PAGE_SIZE } from "@/lib/timeline-paging";
import { ApprovalsPanel } from "./_components/approvals-panel";
import { DropoffCard } from "./_components/dropoff-card";
import { StaffQuestionsCard } from "./_components/questions-card";
import { JobJournal } from "./_components/job-journal";
import { PortfolioJobCard } from "../../portfolio/_components/job-card";

type Props = { params: Promise<{ shop: string; number: string }>; searchParams: Promise<{ intake?: string }> };

export async function generateMetadata({ params }: Props): Promise<Metadata> {
  const { number } = await params;
  const n = jobNumberParamSchema.safeParse(number);
  return { title: n.success ? formatJobNumber(n.data) : "Job" };
}

export default async function StaffJobPage({ params, searchParams }: Props) {
  const { shop: slug, number } = await params;
  const { actor, shop, job, resource } = await staffJobPage(slug, number, "journal:view-shop-only");
  const intake = (await searchParams).intake === "1";
  // The first page of the journal goes out with the page and to SWR once; older pages come
  // through the timeline API on demand. The cards around it stream in their own time.
  const [timeline, facts] = await Promise.all([
    listTimeline({ shopId: shop.id, jobId: job.id, audience: "shop", order: "desc", limit: TIMELINE_PAGE_SIZE, viewerUserId: actor.userId }),
    jobFacts({ shopId: shop.id, jobId: job.id }),
  ]);
  const waits = waitingOn(job.status, facts);

  return (
    // Room at the bottom on a phone for the quick-post bar, which sits there.
    <div className="space-y-6 max-sm:pb-24">
      <PageHeader
        title={`${formatJobNumber(job.number)} · ${describeMachine(job.machine)}`}
        description={`${MACHINE_KIND_LABEL[job.machine.kind]} · owner ${job.customerName}`}
        back={{ href: `/shop/${shop.slug}`, label: "All jobs" }}
        actions={<><ButtonLink href={`/shop/${shop.slug}/jobs/${job.number}/bench`} variant="secondary">Bench tools</ButtonLink>{can(actor, "invoice:view", resource) ? <ButtonLink href={`/shop/${shop.slug}/jobs/${job.number}/invoice`} variant="secondary">Invoice</ButtonLink> : null}{can(actor, "outbox:manage", resource) ? <ButtonLink href={`/shop/${shop.slug}/jobs/${job.number}/mail`} variant="secondary">Mail sent</ButtonLink> : null}</>}
      />
      {/* A collected job takes nothing new (the server refuses it): no quick-post bar to offer it. */}
      {job.status !== "picked_up" ? <BenchQuickPost jobPath={`/shop/${shop.slug}/jobs/${job.number}`} on="job" mayRecord={can(actor, "bench:record", resource)} /> : null}
      <div className="grid gap-4 md:grid-cols-2">
        <Card as="section" title="Where it stands" headingId="job-facts">
          <dl className="grid grid-cols-[auto_1fr] gap-x-4 gap-y-2">
            <dt className="text-ink-muted">Status</dt>
            <dd>
              <StatusBadge status={job.status} />
            </dd>
            <dt className="text-ink-muted">Waits on</dt>
            <dd data-testid="staff-waits-on">{waits ? `${WAITING_ON_LABEL[waits.on]}: ${waits.next}` : "Nobody: it has been collected"}</dd>
            <dt className="text-ink-muted">Promised</dt>
            <dd>{job.promisedOn ?? "No date set"}</dd>
            <dt className="text-ink-muted">Technician</dt>
            <dd>{job.technician?.name ?? "Unassigned"}</dd>
            <dt className="text-ink-muted">Owner</dt>
            <dd>
              {/* The owner's and the machine's pages: contact details and the machine's history across jobs. */}
              {can(actor, "customer:view", resource) ? (
                <Link href={`/shop/${shop.slug}/customers/${job.customerId}`} className="inline-flex min-h-tap items-center font-semibold text-oil underline underline-offset-2 hover:no-underline">
                  {job.customerName}
                </Link>
              ) : (
                job.customerName
              )}
            </dd>
            <dt className="text-ink-muted">Machine</dt>
            <dd>
              {can(actor, "customer:view", resource) ? (
                <Link href={`/shop/${shop.slug}/machines/${job.machineId}`} className="inline-flex min-h-tap items-center font-semibold text-oil underline underline-offset-2 hover:no-underline">
                  {describeMachine(job.machine)}: history
                </Link>
              ) : (
                describeMachine(job.machine)
              )}
            </dd>
            <dt className="text-ink-muted">Serial / VIN</dt>
            <dd>{job.machine.serial ?? "Not recorded"}</dd>
          </dl>
        </Card>
        <Card as="section" title="Owner's concern" headingId="job-concern">
          <p className="whitespace-pre-line">{job.concern}</p>
          {job.intakeNotes ? (
            <>
              <h3 className="mt-3 font-semibold text-ink">Condition at check-in</h3>
              <p className="whitespace-pre-line">{job.intakeNotes}</p>
            </>
          ) : null}
        </Card>
      </div>
      <Suspense fallback={<Skeleton className="h-32" />}>
        <DropoffCard actor={actor} resource={resource} job={job} currency={shop.currency} timeZone={shop.timezone} />
      </Suspense>
      <Suspense fallback={<Skeleton className="h-32" />}>
        <ApprovalsPanel actor={actor} job={job} currency={shop.currency} basePath={`/shop/${shop.slug}/jobs/${job.number}`} timeZone={shop.timezone} />
      </Suspense>
      <Suspense fallback={<Skeleton className="h-24" />}>
        <StaffQuestionsCard actor={actor} resource={resource} job={job} shopName={shop.name} timeZone={shop.timezone} />
      </Suspense>
      <JobJournal
        jobPublicId={job.publicId}
        status={job.status}
        mayChangeStatus={can(actor, "job:change-status", resource)}
        timeZone={shop.timezone}
        mayModerate={can(actor, "journal:moderate", resource)}
        initial={{ ...timeline, audience: "shop" }}
        clipLimits={{ maxSeconds: shop.clipMaxSeconds, maxBytes: shop.clipMaxBytes }}
        findingsPath={can(actor, "approvals:draft", resource) ? `/shop/${shop.slug}/jobs/${job.number}/findings/new` : null}
        startWith={intake ? "photos" : "note"}
        intakeCaption={intake ? "Condition at check-in" : undefined}
      />
      <Suspense fallback={null}>
        <FollowersCard shopId={shop.id} jobId={job.id} />
      </Suspense>
      <Suspense fallback={null}>
        <PortfolioJobCard actor={actor} shop={shop} job={job} />
      </Suspense>
    </div>
  );
}
