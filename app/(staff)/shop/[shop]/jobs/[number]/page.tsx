import type { Metadata } from "next";
import { notFound } from "next/navigation";
import { getJobByNumber, listStatusChanges } from "@/db/queries/jobs";
import { StatusBadge } from "@/components/status-badge";
import { Card, PageHeader } from "@/components/ui";
import { JOB_STATUS_LABEL } from "@/lib/job-status";
import { MACHINE_KIND_LABEL, describeMachine } from "@/lib/machine";
import { formatJobNumber, jobNumberParamSchema } from "@/lib/schemas/jobs";
import { authorizePage } from "@/lib/server/authorize";
import { shopPageAccess } from "../../shop-access";

type Props = { params: Promise<{ shop: string; number: string }> };

export async function generateMetadata({ params }: Props): Promise<Metadata> {
  const { number } = await params;
  const n = jobNumberParamSchema.safeParse(number);
  return { title: n.success ? formatJobNumber(n.data) : "Job" };
}

export default async function StaffJobPage({ params }: Props) {
  const { shop: slug, number } = await params;
  const { actor, shop } = await shopPageAccess(slug, "shop:view-board", `/shop/${slug}/jobs/${number}`);
  const n = jobNumberParamSchema.safeParse(number);
  if (!n.success) notFound();
  const job = await getJobByNumber({ shopId: shop.id, number: n.data });
  if (!job) notFound();
  authorizePage(actor, "job:view-history", { shopId: job.shopId, customerUserId: job.customerUserId });
  const history = await listStatusChanges({ shopId: shop.id, jobId: job.id });
  // Times read in the shop's own zone: that is the clock on the shop wall.
  const at = new Intl.DateTimeFormat("en-US", { timeZone: shop.timezone, dateStyle: "medium", timeStyle: "short" });

  return (
    <div className="space-y-6">
      <PageHeader
        title={`${formatJobNumber(job.number)} · ${describeMachine(job.machine)}`}
        description={`${MACHINE_KIND_LABEL[job.machine.kind]} · owner ${job.customerName}`}
        back={{ href: `/shop/${shop.slug}`, label: "All jobs" }}
      />
      <div className="grid gap-4 md:grid-cols-2">
        <Card as="section" title="Where it stands">
          <dl className="grid grid-cols-[auto_1fr] gap-x-4 gap-y-2">
            <dt className="text-ink-muted">Status</dt>
            <dd>
              <StatusBadge status={job.status} />
            </dd>
            <dt className="text-ink-muted">Promised</dt>
            <dd>{job.promisedOn ?? "No date set"}</dd>
            <dt className="text-ink-muted">Technician</dt>
            <dd>{job.technician?.name ?? "Unassigned"}</dd>
            <dt className="text-ink-muted">Serial / VIN</dt>
            <dd>{job.machine.serial ?? "Not recorded"}</dd>
          </dl>
        </Card>
        <Card as="section" title="Owner's concern">
          <p className="whitespace-pre-line">{job.concern}</p>
        </Card>
      </div>
      <Card as="section" title="Status history">
        <ol className="space-y-3">
          {history.map((h) => (
            <li key={h.id} className="border-l-2 border-line pl-3">
              <div className="text-sm text-ink-muted">
                <time dateTime={h.at.toISOString()}>{at.format(h.at)}</time> · {h.by ?? "a former user"}
              </div>
              <div>
                {h.from ? `${JOB_STATUS_LABEL[h.from]} → ` : ""}
                <strong>{JOB_STATUS_LABEL[h.to]}</strong>
              </div>
            </li>
          ))}
        </ol>
      </Card>
    </div>
  );
}
