import type { Metadata } from "next";
import { notFound } from "next/navigation";
import { getJobByPublicId } from "@/db/queries/jobs";
import { StatusBadge } from "@/components/status-badge";
import { Card, PageHeader } from "@/components/ui";
import { describeMachine } from "@/lib/machine";
import { formatJobNumber } from "@/lib/schemas/jobs";
import { authorizePage, requirePageActor } from "@/lib/server/authorize";

export const metadata: Metadata = { title: "Your job" };

export default async function MyJobPage({ params }: { params: Promise<{ job: string }> }) {
  const { job: publicId } = await params;
  const actor = await requirePageActor(`/my/jobs/${publicId}`);
  if (!/^[A-Za-z0-9_-]{16}$/.test(publicId)) notFound();
  const job = await getJobByPublicId({ publicId });
  authorizePage(actor, "job:view", job && { shopId: job.shopId, customerUserId: job.customerUserId });
  if (!job) notFound();
  return (
    <div className="space-y-4">
      <PageHeader
        title={describeMachine(job.machine)}
        description={`${job.shopName} · ${formatJobNumber(job.number)}`}
        back={{ href: "/my", label: "My machines" }}
      />
      <Card as="section" title="Where it stands">
        <div className="space-y-2">
          <StatusBadge status={job.status} />
          <p>{job.promisedOn ? `The shop expects to have it ready by ${job.promisedOn}.` : "The shop hasn't set a ready date yet."}</p>
        </div>
      </Card>
      <Card as="section" title="What you told the shop">
        <p className="whitespace-pre-line">{job.concern}</p>
      </Card>
    </div>
  );
}
