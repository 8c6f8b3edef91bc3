import { CircleCheck, CircleX } from "lucide-react";
import { Badge, TBody, TD, TH, THead, TR, Table } from "@/components/ui";
import { LINE_KIND_LABEL, type LineAnswer, type RequestSnapshot, type SnapshotLine } from "@/lib/approvals";
import { formatHours, formatMoney, formatQuantity, taxLabel } from "@/lib/money";

/**
 * How a line is priced, in words: "2 × $21.25 · part FBP-220", "1.5 h at $115.00/h"; nothing for a fee.
 * Without `money` (a technician), only how much: "2 · part FBP-220", "1.5 h".
 */
export function lineDetail(line: SnapshotLine, currency: string, money = true): string {
  const qty = formatQuantity(line.qtyThousandths ?? 0);
  const hours = `${formatHours(line.hoursTenths ?? 0)} h`;
  if (line.kind === "part") return [money ? `${qty} × ${formatMoney(line.unitPriceMinor ?? 0, currency)}` : qty, line.partNumber ? `part ${line.partNumber}` : null].filter(Boolean).join(" · ");
  if (line.kind === "labour") return money ? `${hours} at ${formatMoney(line.rateMinor ?? 0, currency)}/h` : hours;
  return "";
}

export function AnswerBadge({ answer }: { answer: LineAnswer }) {
  return answer === "approved" ? (
    <Badge tone="moss" icon={CircleCheck}>
      Approved
    </Badge>
  ) : (
    <Badge tone="rust" icon={CircleX}>
      Declined
    </Badge>
  );
}

/**
 * The request's lines as sent, with the estimate's totals; with `answers`, how each line was
 * answered. `showMoney={false}` (someone without `money:view`) leaves out every amount.
 */
export function RequestLines({ snapshot, answers, label = "Lines of the request", showMoney = true }: { snapshot: RequestSnapshot; answers?: Record<number, LineAnswer>; label?: string; showMoney?: boolean }) {
  const money = (n: number) => formatMoney(n, snapshot.currency);
  const t = snapshot.totals;
  if (!showMoney) return <LinesWithoutMoney snapshot={snapshot} answers={answers} label={label} />;
  return (
    <Table label={label}>
      <THead>
        <TR>
          <TH>Line</TH>
          {answers ? <TH>Answer</TH> : null}
          <TH className="text-right">Amount</TH>
        </TR>
      </THead>
      <TBody>
        {snapshot.lines.map((line) => (
          <TR key={line.no}>
            <TD>
              <span className="font-semibold">{line.description}</span>
              <span className="block text-sm text-ink-muted">{[LINE_KIND_LABEL[line.kind], lineDetail(line, snapshot.currency), line.taxable ? "" : "not taxed"].filter(Boolean).join(" · ")}</span>
            </TD>
            {answers ? <TD>{answers[line.no] ? <AnswerBadge answer={answers[line.no]!} /> : "—"}</TD> : null}
            <TD className="text-right tabular-nums">{money(line.netMinor)}</TD>
          </TR>
        ))}
        {t.suppliesMinor ? (
          <TR>
            <TD colSpan={answers ? 2 : 1}>Shop supplies</TD>
            <TD className="text-right tabular-nums">{money(t.suppliesMinor)}</TD>
          </TR>
        ) : null}
        <TR>
          <TD colSpan={answers ? 2 : 1}>{taxLabel(snapshot.pricing.tax)}</TD>
          <TD className="text-right tabular-nums">{money(t.taxMinor)}</TD>
        </TR>
        <TR>
          <TD colSpan={answers ? 2 : 1} className="font-bold">
            Estimate for all lines
          </TD>
          <TD className="text-right font-bold tabular-nums">{money(t.totalMinor)}</TD>
        </TR>
      </TBody>
    </Table>
  );
}

/** The same lines for the bench: what was asked for and how it was answered, no amounts. */
function LinesWithoutMoney({ snapshot, answers, label }: { snapshot: RequestSnapshot; answers?: Record<number, LineAnswer>; label: string }) {
  return (
    <Table label={label}>
      <THead>
        <TR>
          <TH>Line</TH>
          {answers ? <TH>Answer</TH> : null}
        </TR>
      </THead>
      <TBody>
        {snapshot.lines.map((line) => (
          <TR key={line.no}>
            <TD>
              <span className="font-semibold">{line.description}</span>
              <span className="block text-sm text-ink-muted">{[LINE_KIND_LABEL[line.kind], lineDetail(line, snapshot.currency, false)].filter(Boolean).join(" · ")}</span>
            </TD>
            {answers ? <TD>{answers[line.no] ? <AnswerBadge answer={answers[line.no]!} /> : "—"}</TD> : null}
          </TR>
        ))}
      </TBody>
    </Table>
  );
}
