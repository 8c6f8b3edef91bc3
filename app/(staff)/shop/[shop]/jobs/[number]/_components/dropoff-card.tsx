import { getCustomer } from "@/db/queries/customers";
import { getDropoff } from "@/db/queries/dropoff";
import { Card } from "@/components/ui";
import { DropoffSignForm } from "@/components/dropoff/sign-form";
import { DropoffSummary } from "@/components/dropoff/dropoff-summary";
import { amountText } from "@/lib/invoices";
import { formatHours, formatMoney } from "@/lib/money";
import { type Actor, type Resource, can } from "@/lib/permissions";
import { moneySettingsOf } from "@/lib/server/request-cache";
import { signDropoffAtCounterAction } from "../dropoff-actions";
import { type DropoffStandard, getDropoffStandard } from "@/db/queries/shop-settings";
import { DEFAULT_DIAGNOSIS_DESCRIPTION } from "@/lib/dropoff";
import { DropoffPrepareForm, DropoffSendLink, DropoffStandardButton, type PrepareDefaults } from "./dropoff-forms";

// The staff job page's card for the authorisation signed at drop-off: prepare it (right after
// check-in), have the owner sign on this screen or e-mail the link, then the signed record.

type Props = {
  actor: Actor;
  resource: Resource;
  job: { id: number; shopId: number; publicId: string; customerId: number; customerName: string };
  currency: string;
  timeZone: string;
};

/** The desk's form starts from the shop's standard terms when it has them. */
const standardDefaults = (standard: DropoffStandard, currency: string): PrepareDefaults => ({
  chargeKind: "amount",
  chargeAmount: amountText(standard.chargeMinor, currency),
  chargeHours: "",
  description: DEFAULT_DIAGNOSIS_DESCRIPTION,
  authorisedUpTo: amountText(standard.upToMinor, currency),
  terms: "",
});

export async function DropoffCard({ actor, resource, job, currency, timeZone }: Props) {
  const key = { shopId: job.shopId, jobId: job.id };
  // The owner's address from their row (the page has read the job already); the money settings
  // are the approvals panel's too (one read per render, lib/server/request-cache.ts).
  const [dropoff, settings, customer, standard] = await Promise.all([
    getDropoff(key),
    moneySettingsOf(job.shopId),
    getCustomer({ shopId: job.shopId, customerId: job.customerId }),
    getDropoffStandard({ shopId: job.shopId }),
  ]);
  const email = customer?.email ?? null;
  const mayPrepare = can(actor, "approvals:send", resource);
  // Anyone at the counter may put the standard terms up and witness the owner's typed signature.
  const mayWitness = can(actor, "dropoff:standard", resource);
  const showMoney = can(actor, "money:view", resource);
  const labourRate = settings.labourRateMinor == null ? null : formatMoney(settings.labourRateMinor, currency);
  const title = "Authorisation at drop-off";

  if (!dropoff) {
    return (
      <Card as="section" title={title} headingId="dropoff-heading" description="Before work starts: the diagnosis charge and the amount the owner authorises, signed by the owner.">
        <div className="space-y-4">
          {standard && mayWitness && !mayPrepare ? (
            <DropoffStandardButton jobPublicId={job.publicId} terms={`diagnosis ${formatMoney(standard.chargeMinor, currency)}, work authorised up to ${formatMoney(standard.upToMinor, currency)}, before tax`} />
          ) : null}
          {mayPrepare ? (
            <DropoffPrepareForm jobPublicId={job.publicId} labourRate={labourRate} defaults={standard ? standardDefaults(standard, currency) : null} submitLabel="Prepare for signing" />
          ) : standard ? null : (
            <p>Not prepared yet: the service desk prepares it with the owner (the shop has no standard terms to use).</p>
          )}
        </div>
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
        {/* Before it is signed, whoever witnesses sees the wording the owner reads; after, amounts are for money people. */}
        <DropoffSummary dropoff={dropoff} timeZone={timeZone} showMoney={showMoney || (!dropoff.signature && mayWitness)} reader="shop" />
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
