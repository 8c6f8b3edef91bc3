import type { Metadata } from "next";
import { forbidden, notFound } from "next/navigation";
import { getDropoff } from "@/db/queries/dropoff";
import { getShopBySlug } from "@/db/queries/shops";
import { DropoffSignForm } from "@/components/dropoff/sign-form";
import { DropoffSummary } from "@/components/dropoff/dropoff-summary";
import { Alert, Card, PageHeader } from "@/components/ui";
import { describeMachine } from "@/lib/machine";
import { can } from "@/lib/permissions";
import { formatJobNumber } from "@/lib/schemas/jobs";
import { loadPage } from "@/lib/server/page-access";
import { signDropoffOnlineAction } from "./actions";

export const metadata: Metadata = { title: "Authorisation at drop-off" };

/**
 * The drop-off authorisation for the machine's owner: what the shop may charge before asking
 * again, to sign online (the e-mailed link lands here) or, once signed, the record of it.
 * Followers never see it (money); the desk looking sees it as the owner does.
 */
export default async function DropoffAuthorisationPage({ params }: { params: Promise<{ job: string }> }) {
  const { job: publicId } = await params;
  const { actor, job, resource, audience, mayViewMoney } = await loadPage("job", { job: publicId }, "job:view", `/my/jobs/${publicId}/authorisation`);
  // As with invoices: followers aren't told it exists; staff without money rights are told no.
  if (audience === "follower") notFound();
  if (!mayViewMoney) forbidden();
  const dropoff = await getDropoff({ shopId: job.shopId, jobId: job.id });
  const shop = await getShopBySlug({ slug: job.shopSlug });
  const mayAnswer = can(actor, "approvals:answer", resource);
  return (
    <div className="space-y-4">
      <PageHeader title="Authorisation at drop-off" description={`${job.shopName} · ${formatJobNumber(job.number)} · ${describeMachine(job.machine)}`} back={{ href: `/my/jobs/${publicId}`, label: "Back to your job" }} />
      {!dropoff ? (
        <Alert tone="info" title="Nothing to sign yet">
          The shop hasn&apos;t prepared an authorisation for this job. They will ask you when it is ready.
        </Alert>
      ) : (
        <>
          {dropoff.signature ? (
            <Alert tone="success" title="Signed">
              This is what was agreed. Any work above the authorised amount needs your further consent.
            </Alert>
          ) : (
            <Alert tone="info" title="The shop asks you to sign">
              Read the wording below. Nothing is agreed until you sign.
            </Alert>
          )}
          <Card as="section" title="What you agree to" headingId="dropoff-heading">
            <DropoffSummary dropoff={dropoff} timeZone={shop?.timezone ?? "UTC"} showMoney reader="owner" />
          </Card>
          {!dropoff.signature && mayAnswer ? (
            <Card as="section" title="Sign" headingId="dropoff-sign-heading">
              <DropoffSignForm action={signDropoffOnlineAction} jobPublicId={publicId} hash={dropoff.hash} ownerName={dropoff.snapshot.owner} atCounter={false} />
            </Card>
          ) : null}
        </>
      )}
    </div>
  );
}
