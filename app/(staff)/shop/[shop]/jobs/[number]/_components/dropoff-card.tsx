import { getDropoff, jobOwnerEmail } from "@/db/queries/dropoff";
import { getMoneySettings } from "@/db/queries/findings";
import { Card } from "@/components/ui";
import { DropoffSignForm } from "@/components/dropoff/sign-form";
import { DropoffSummary } from "@/components/dropoff/dropoff-summary";
import { amountText } from "@/lib/invoices";
import { formatHours, formatMoney } from "@/lib/money";
import { type Actor, type Resource, can } from "@/lib/permissions";
import { signDropoffAtCounterAction } from "../dropoff-actions";
import { DropoffPrepareForm, DropoffSendLink, type PrepareDefaults } from "./dropoff-forms";

// The staff job page's card for the authorisation signed at drop-off: prepare it (right after
// check-in), have the owner sign on this screen or e-mail the link, then the signed record.

type Props = {
  actor: Actor;
  resource: Resource;
  job: { id: number; shopId: number; publicId: string; customerName: string };
  currency: string;
  timeZone: string;
};

export async function DropoffCard({ actor, resource, job, currency, timeZone }: Props) {
  const key = { shopId: job.shopId, jobId: job.id };
  const [dropoff, settings, email] = await Promise.all([getDropoff(key), getMoneySettings({ shopId: job.shopId }), jobOwnerEmail(key)]);
  const mayPrepare = can(actor, "approvals:send", resource);
  const mayWitness = can(actor, "approvals:record-decision", resource);
  const showMoney = can(actor, "money:view", resource);
  const labourRate = settings.labourRateMinor == null ? null : formatMoney(settings.labourRateMinor, currency);
  const title = "Authorisation at drop-off";

  if (!dropoff) {
    return (
      <Card as="section" title={title} headingId="dropoff-heading" description="Before work starts: the diagnosis charge and the amount the owner authorises, signed by the owner.">
        {mayPrepare ? <DropoffPrepareForm jobPublicId={job.publicId} labourRate={labourRate} defaults={null} submitLabel="Prepare for signing" /> : <p>Not prepared yet: the service desk prepares it with the owner.</p>}
      </Card>
    );
  }
  const s = dropoff.snapshot;
  const defaults: PrepareDefaults = {
    chargeKind: s.diagnosis.kind === "labour" ? "time" : "amount",
    chargeAmount: s.diagnosis.kind === "fee" ? amountText(s.diagnosis.amountMinor, s.currency) : "",
    chargeHours: s.diagnosis.kind === "labour" ? formatHours(s.diagnosis.hoursTenths) : "",
    description: s.diagnosis.description,
    authorisedUpTo: amountText(s.authorisedUpToMinor, s.currency),
    terms: s.terms ?? "",
  };
  return (
    <Card as="section" title={title} headingId="dropoff-heading">
      <div className="space-y-4">
        <DropoffSummary dropoff={dropoff} timeZone={timeZone} showMoney={showMoney} reader="shop" />
        {!dropoff.signature && mayWitness ? <DropoffSignForm action={signDropoffAtCounterAction} jobPublicId={job.publicId} hash={dropoff.hash} ownerName={job.customerName} atCounter /> : null}
        {!dropoff.signature && mayPrepare && email ? <DropoffSendLink jobPublicId={job.publicId} email={email} /> : null}
        {!dropoff.signature && mayPrepare ? (
          <details className="rounded-lg border border-line p-3">
            <summary className="min-h-tap cursor-pointer font-semibold text-ink">Change it before it is signed</summary>
            <div className="mt-3">
              <DropoffPrepareForm jobPublicId={job.publicId} labourRate={labourRate} defaults={defaults} submitLabel="Save the new version" />
            </div>
          </details>
        ) : null}
      </div>
    </Card>
  );
}
