import type { Metadata } from "next";
import { notFound } from "next/navigation";
import { Alert, PageHeader } from "@/components/ui";
import { listDecisions, listRequests } from "@/db/queries/approvals";
import { getCustomerContact, getFinding } from "@/db/queries/findings";
import { partsOfFindingLines } from "@/db/queries/parts-pricing";
import { formatMoney } from "@/lib/money";
import { formatJobNumber } from "@/lib/schemas/jobs";
import { JOB_STATUS_LABEL, statusMoveError } from "@/lib/job-status";
import { ids } from "@/lib/server/access";
import { jobApprovals } from "@/lib/server/approval-views";
import { AutoRefresh } from "../_components/auto-refresh";
import { FindingEditor } from "../_components/finding-editor";
import { toLineState } from "../_components/form-state";
import { RequestHistory } from "../_components/request-history";
import { SendPanel } from "../_components/send-panel";
import { loadFindingsJob } from "../load";
import { ownerReach } from "@/lib/server/texts";

export const metadata: Metadata = { title: "Finding" };

type Props = { params: Promise<{ shop: string; number: string; finding: string }> };

/** One finding: its requests and answers, the editor (draft or price), and sending. */
export default async function FindingPage({ params }: Props) {
  const { shop: slug, number, finding: raw } = await params;
  const { shop, job, settings, choices, pickable, basePath, mayPrice, mayRecord, mayViewMoney } = await loadFindingsJob(slug, number, `/findings/${raw}`);
  const parsed = ids.row.safeParse(raw);
  const id = parsed.success ? parsed.data : notFound();
  const finding = await getFinding({ shopId: shop.id, jobId: job.id, id });
  if (!finding) notFound();
  const [overview, allRequests, contact, reach, lineParts] = await Promise.all([
    jobApprovals(job),
    listRequests({ shopId: shop.id, jobId: job.id }),
    getCustomerContact({ shopId: shop.id, customerId: job.customerId }),
    ownerReach({ shopId: shop.id, customerId: job.customerId }),
    // Part costs are staff money: only for people who see it.
    mayViewMoney ? partsOfFindingLines({ shopId: shop.id, lineIds: finding.lines.map((l) => l.id) }) : new Map(),
  ]);
  const requests = allRequests.filter((r) => r.findingId === id).reverse();
  const decisions = await listDecisions({ shopId: shop.id, requestIds: requests.map((r) => r.id) });
  const summary = overview.findings.find((f) => f.id === id)!;
  const open = requests.find((r) => r.status === "sent");
  const locked = summary.state === "answered";
  const refusal = job.status === "waiting_approval" ? null : statusMoveError(job.status, "waiting_approval");

  return (
    <div className="space-y-6">
      {open ? <AutoRefresh /> : null}
      <PageHeader title={finding.title} description={`${formatJobNumber(job.number)} · owner ${job.customerName}${finding.createdBy ? ` · drafted by ${finding.createdBy}` : ""}`} back={{ href: basePath, label: `Back to ${formatJobNumber(job.number)}` }} />
      {/* Warnings quote amounts: the desk's, not the bench's. */}
      {(mayViewMoney ? overview.warnings : [])
        .filter((w) => w.findingId === id)
        .map((w) => (
          <Alert key={w.findingId} tone="warning" title="Needs the owner's approval">
            {w.message}
          </Alert>
        ))}
      {requests.length ? <RequestHistory requests={requests} decisions={decisions} timeZone={shop.timezone} mayPrice={mayPrice} mayRecord={mayRecord} showMoney={mayViewMoney} owner={{ name: job.customerName, phone: contact.phone }} /> : null}
      <FindingEditor
        key={finding.version}
        jobPublicId={job.publicId}
        basePath={basePath}
        finding={{ id: finding.id, version: finding.version }}
        initial={{
          title: finding.title,
          found: finding.found,
          whyItMatters: finding.whyItMatters ?? "",
          safety: finding.safety,
          evidence: finding.evidence,
          lines: finding.lines.map((l) => toLineState(l, shop.currency, mayViewMoney, lineParts.get(l.id))),
        }}
        choices={choices}
        mayPrice={mayPrice}
        locked={locked}
        currency={shop.currency}
        settings={settings}
        pickable={pickable}
      />
      {mayPrice && !locked ? (
        <SendPanel
          jobPublicId={job.publicId}
          findingId={finding.id}
          findingVersion={finding.version}
          estimate={"totals" in summary.draft ? formatMoney(summary.draft.totals.totalMinor, shop.currency) : null}
          missing={refusal ? `The job is "${JOB_STATUS_LABEL[job.status]}": ${refusal}` : "missing" in summary.draft ? summary.draft.missing : null}
          to={reach.email ? contact.email : null}
          textTo={reach.textTo}
          openVersion={open?.version ?? null}
          upToDate={!!open && !summary.changedSinceSent}
          statusNote={job.status === "waiting_approval" ? null : `Sending moves the job from "${JOB_STATUS_LABEL[job.status]}" to "${JOB_STATUS_LABEL.waiting_approval}".`}
        />
      ) : null}
    </div>
  );
}
