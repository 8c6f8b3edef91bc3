import { FileSignature } from "lucide-react";
import { ButtonLink } from "@/components/ui";
import { formatWhen } from "@/components/invoices/authorisation-record";
import { formatMoney } from "@/lib/money";
import { type Actor, type Resource, can } from "@/lib/permissions";
import { authorisedWorkOf } from "@/lib/server/request-cache";

/**
 * The owner's job page: the drop-off authorisation to sign, or what they signed and when.
 * Money, so the machine's owner only (and staff with money:view looking at it), never followers.
 */
export async function DropoffNotice({ actor, job, resource, timeZone }: { actor: Actor; job: { id: number; shopId: number; publicId: string }; resource: Resource; timeZone: string }) {
  if (!can(actor, "money:view", resource)) return null;
  // Read with the rest of what the owner authorised: the page reads that once (request cache).
  const { dropoff } = await authorisedWorkOf(job.shopId, job.id);
  if (!dropoff) return null;
  const href = `/my/jobs/${job.publicId}/authorisation`;
  const upTo = formatMoney(dropoff.authorisedUpToMinor, dropoff.currency);
  const sig = dropoff.signature;
  return (
    <section aria-labelledby="dropoff-notice-heading" className={sig ? "space-y-2 rounded-xl border border-line bg-surface p-4" : "space-y-2 rounded-xl border-2 border-brass bg-brass-soft p-4"}>
      <h2 id="dropoff-notice-heading" className="flex items-center gap-2 text-lg font-bold text-ink">
        <FileSignature aria-hidden className="size-6 text-oil" />
        {sig ? "Authorisation at drop-off" : "Please sign before work starts"}
      </h2>
      <p data-testid="dropoff-notice">
        {sig ? (
          <>
            Signed “{sig.signatureName}” {sig.method === "online" ? "online" : "at the counter"} on <time dateTime={sig.signedAt}>{formatWhen(sig.signedAt, timeZone)}</time>: work up to {upTo} before tax.
          </>
        ) : (
          <>The shop asks you to authorise work up to {upTo} before tax, diagnosis included.</>
        )}
      </p>
      <ButtonLink href={href} variant={sig ? "secondary" : "primary"}>
        {sig ? "See what you signed" : "Read and sign"}
      </ButtonLink>
    </section>
  );
}
