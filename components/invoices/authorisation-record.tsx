import { METHOD_LABEL } from "@/lib/approvals";
import { formatMoney } from "@/lib/money";
import { withdrawnText } from "@/lib/invoices";
import type { AuthorisationEntry } from "@/lib/server/authorised-work";

// Who approved what, when and how: printed on the invoice as the consent rules ask a shop to keep
// it (REFERENCES §6), from the stored approval decisions.

export function formatWhen(iso: string, timeZone: string): string {
  return new Intl.DateTimeFormat("en-US", { timeZone, dateStyle: "medium", timeStyle: "short" }).format(new Date(iso));
}

export function AuthorisationRecord({ record, timeZone, headingLevel = 2 }: { record: AuthorisationEntry[]; timeZone: string; headingLevel?: 2 | 3 }) {
  const H = `h${headingLevel}` as const;
  return (
    <section aria-labelledby="authorisation-record" className="space-y-3 break-inside-avoid">
      <H id="authorisation-record" className="text-lg font-bold text-ink">
        Authorisation record
      </H>
      {record.length === 0 ? <p className="text-ink-muted">No approval has been recorded on this job.</p> : null}
      <ol className="space-y-3">
        {record.map((e) => (
          <li key={e.request} className="rounded-lg border border-line p-3 print:border-ink-muted">
            <p className="font-semibold text-ink">
              {e.title}
              {e.version > 1 ? ` (version ${e.version})` : ""}
            </p>
            <p>
              {e.kind === "dropoff"
                ? `${e.method === "online" ? "Signed online" : "Signed at the counter"} by ${e.personName}`
                : e.method === "online"
                  ? `Approved online by ${e.personName}, signed “${e.signatureName ?? e.personName}”`
                  : `${METHOD_LABEL[e.method]}: ${e.personName}${e.phoneCalled ? ` at ${e.phoneCalled}` : ""}`}
              {" on "}
              <time dateTime={e.decidedAt}>{formatWhen(e.decidedAt, timeZone)}</time>
              {e.method !== "online" && e.recordedBy ? `, ${e.kind === "dropoff" ? "witnessed" : "noted"} by ${e.recordedBy}` : ""}.
            </p>
            {e.approved.length ? (
              <p>
                <span className="font-semibold">Approved:</span> {e.approved.map((l) => `${l.description} (${formatMoney(l.netMinor, e.currency)})`).join("; ")}.
              </p>
            ) : null}
            {e.declined.length ? (
              <p>
                <span className="font-semibold">Declined:</span> {e.declined.map((l) => l.description).join("; ")}.
              </p>
            ) : null}
            {e.withdrawn.length ? (
              <p data-testid="withdrawn-lines">
                <span className="font-semibold">Withdrawn since, not billed:</span> {e.withdrawn.map((w) => withdrawnText(w, formatWhen(w.at, timeZone))).join(" ")}
              </p>
            ) : null}
            <p className="text-sm text-ink-muted">
              {e.kind === "dropoff" ? `Authorised up to ${formatMoney(e.authorisedTotalMinor, e.currency)} before tax` : `Authorised total ${formatMoney(e.authorisedTotalMinor, e.currency)}`} · {e.wantsPartsBack ? "asked for the replaced parts back" : "did not ask for the parts back"} · record {e.shownHash.slice(0, 12)}
            </p>
            {e.note ? <p className="whitespace-pre-line text-sm">{e.kind === "dropoff" ? `Wording signed: ${e.note}` : e.note}</p> : null}
          </li>
        ))}
      </ol>
    </section>
  );
}
