import { Card } from "@/components/ui";
import type { DecisionRow } from "@/db/queries/approvals";
import { METHOD_LABEL, type RequestSnapshot } from "@/lib/approvals";
import { formatMoney } from "@/lib/money";
import { RequestLines } from "./request-lines";

/**
 * The stored decision, read-only: who answered, how and when, each line's answer, the totals and
 * the proof hash. `showMoney={false}` (someone without `money:view`) leaves out every amount.
 */
export function DecisionRecord({
  decision,
  snapshot,
  timeZone,
  staff,
  headingLevel = 2,
  showMoney = true,
}: {
  decision: DecisionRow;
  snapshot: RequestSnapshot;
  timeZone: string;
  staff: boolean;
  headingLevel?: 2 | 3;
  showMoney?: boolean;
}) {
  const when = new Intl.DateTimeFormat("en-US", { timeZone, dateStyle: "medium", timeStyle: "short" });
  const money = (n: number) => formatMoney(n, snapshot.currency);
  const answers = Object.fromEntries(decision.lines.map((l) => [l.no, l.answer]));
  const rows: [string, string][] = [
    ["How", METHOD_LABEL[decision.method]],
    [decision.method === "online" ? "Signed as" : "Who gave the answer", decision.signatureName ?? decision.personName],
    ["When", when.format(new Date(decision.decidedAt))],
  ];
  if (decision.phoneCalled) rows.push(["Number called", decision.phoneCalled]);
  if (decision.method !== "online" && decision.recordedBy) rows.push(["Noted by", `${decision.recordedBy}, ${when.format(new Date(decision.recordedAt))}`]);
  rows.push(["Replaced parts", decision.wantsPartsBack ? "The owner wants the replaced parts back" : "Not asked for back"]);
  if (decision.note) rows.push(["Note", decision.note]);
  if (showMoney) rows.push(["Estimate for all lines", money(decision.estimateTotalMinor)], ["Authorised", `${money(decision.authorisedTotalMinor)} (${money(decision.authorisedPreTaxMinor)} before tax)`]);
  if (staff && decision.method === "online") rows.push(["Network address", decision.ip ?? "not recorded"], ["Browser", decision.userAgent ?? "not recorded"]);
  return (
    <Card as="section" title="The answer on record" headingLevel={headingLevel} headingId={`decision-${decision.id}`} description="Stored once and never changed.">
      <div className="space-y-4">
        <dl className="grid grid-cols-1 gap-x-4 gap-y-1 sm:grid-cols-[auto_1fr]">
          {rows.map(([term, value]) => (
            <div key={term} className="contents">
              <dt className="text-ink-muted">{term}</dt>
              <dd className="mb-2 break-words sm:mb-0">{value}</dd>
            </div>
          ))}
          <dt className="text-ink-muted">Fingerprint of what was shown</dt>
          <dd>
            <code className="break-all text-sm" data-testid="decision-hash">
              {decision.shownHash}
            </code>
            <span className="block text-sm text-ink-muted">SHA-256 of the request exactly as it was sent.</span>
          </dd>
        </dl>
        <RequestLines snapshot={snapshot} answers={answers} label="How each line was answered" showMoney={showMoney} />
      </div>
    </Card>
  );
}
