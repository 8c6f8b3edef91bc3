import { Clock, FileCheck2 } from "lucide-react";
import type { DropoffRow } from "@/db/queries/dropoff";
import { Badge } from "@/components/ui";
import { formatWhen } from "@/components/invoices/authorisation-record";
import { DROPOFF_METHOD_LABEL, describeCharge } from "@/lib/dropoff";
import { formatMoney } from "@/lib/money";

// What the drop-off authorisation says and, once signed, the record of the signature: the same
// block on the staff job page, the owner's page and (through the authorisation record) the invoice.
// `showMoney` false (technicians): whether and how it was signed, without amounts or wording.

export type DropoffSummaryProps = {
  dropoff: Pick<DropoffRow, "snapshot" | "hash" | "signature" | "sentTo" | "sentAt">;
  timeZone: string;
  showMoney: boolean;
  /** The owner reads "you"; staff read the owner's name. */
  reader: "shop" | "owner";
};

export function DropoffSummary({ dropoff, timeZone, showMoney, reader }: DropoffSummaryProps) {
  const s = dropoff.snapshot;
  const sig = dropoff.signature;
  return (
    <div className="space-y-3">
      <p>
        {sig ? (
          <Badge tone="moss" icon={FileCheck2}>{DROPOFF_METHOD_LABEL[sig.method]}</Badge>
        ) : (
          <Badge tone="brass" icon={Clock}>Not signed yet</Badge>
        )}
      </p>
      {showMoney ? (
        <>
          <dl className="grid grid-cols-[auto_1fr] gap-x-4 gap-y-2">
            <dt className="text-ink-muted">{s.diagnosis.description}</dt>
            <dd className="tabular-nums" data-testid="dropoff-diagnosis">
              {s.diagnosis.netMinor === 0 ? "No charge" : describeCharge(s.diagnosis, s.currency)}
            </dd>
            <dt className="text-ink-muted">Authorised up to</dt>
            <dd className="tabular-nums" data-testid="dropoff-up-to">
              {formatMoney(s.authorisedUpToMinor, s.currency)} before tax
            </dd>
          </dl>
          <blockquote className="whitespace-pre-line border-l-4 border-line pl-3 text-ink">{s.wording}</blockquote>
          {s.terms ? (
            <p className="whitespace-pre-line">
              <span className="font-semibold">Also agreed:</span> {s.terms}
            </p>
          ) : null}
        </>
      ) : null}
      {sig ? (
        <p data-testid="dropoff-signature">
          Signed “{sig.signatureName}” {sig.method === "online" ? "online" : "at the counter"} on <time dateTime={sig.signedAt}>{formatWhen(sig.signedAt, timeZone)}</time>
          {sig.method === "in_person" && sig.recordedBy ? `, witnessed by ${sig.recordedBy}` : ""}.{" "}
          {sig.wantsPartsBack ? (reader === "owner" ? "You asked for the replaced parts back." : "The owner asked for the replaced parts back.") : ""}
        </p>
      ) : dropoff.sentAt && dropoff.sentTo && reader === "shop" ? (
        <p>
          Link e-mailed to {dropoff.sentTo} on <time dateTime={dropoff.sentAt}>{formatWhen(dropoff.sentAt, timeZone)}</time>.
        </p>
      ) : null}
      {showMoney ? <p className="text-sm text-ink-muted">Record {(sig?.shownHash ?? dropoff.hash).slice(0, 12)} (SHA-256 of the text shown)</p> : null}
    </div>
  );
}
