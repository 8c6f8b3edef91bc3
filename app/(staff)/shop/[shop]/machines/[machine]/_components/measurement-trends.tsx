import { ReadingVerdictBadge } from "@/components/bench/reading-verdict";
import { TBody, TD, TH, THead, TR, Table } from "@/components/ui";
import { type Trend, sparkline } from "@/lib/measurement-trends";
import { itemLimitText, typedText } from "@/lib/measurements";
import { JobLink } from "../../../customers/_components/jobs-table";

// The same measured item (e.g. exhaust valve, cylinder 1, left) across this machine's jobs: a small
// inline SVG drawn on the server (no chart library reaches the browser) with the limits as dashed
// lines, and the values in a table beside it for screen readers and for reading exact numbers.

const W = 240;
const H = 64;

function TrendLine({ trend }: { trend: Trend }) {
  const values = trend.points.map((p) => p.value.value);
  const last = trend.points[trend.points.length - 1]!;
  const limits = [last.limit.min?.value, last.limit.max?.value].filter((n): n is number => n != null);
  const { points, y } = sparkline(values, limits, W, H, 6);
  return (
    <svg aria-hidden="true" focusable="false" viewBox={`0 0 ${W} ${H}`} className="h-16 w-full max-w-xs text-oil">
      {limits.map((l) => (
        <line key={l} x1="0" x2={W} y1={y(l)} y2={y(l)} stroke="currentColor" strokeOpacity="0.45" strokeDasharray="4 3" className="text-rust" />
      ))}
      <polyline points={points} fill="none" stroke="currentColor" strokeWidth="2" strokeLinejoin="round" />
      {points.split(" ").map((pt, i) => {
        const [cx, cy] = pt.split(",");
        return <circle key={i} cx={cx} cy={cy} r="3" fill="currentColor" />;
      })}
    </svg>
  );
}

export function MeasurementTrends({ trends, shopSlug, timeZone }: { trends: Trend[]; shopSlug: string; timeZone: string }) {
  const day = new Intl.DateTimeFormat("en-US", { timeZone, month: "short", day: "numeric", year: "numeric" });
  if (!trends.length) return <p className="text-ink-muted">No item has been measured on two jobs of this machine yet.</p>;
  return (
    <div className="space-y-6">
      {trends.map((t) => (
        <div key={`${t.kind}|${t.key}|${t.unit}`} className="space-y-2" data-testid="measurement-trend">
          <TrendLine trend={t} />
          <Table label={`${t.label} across jobs`} caption={`${t.label} (${t.unit}) across jobs, oldest first`}>
            <THead>
              <TR>
                <TH>Date</TH>
                <TH>Measured</TH>
                <TH>Limit</TH>
                <TH>Verdict</TH>
                <TH>Job</TH>
              </TR>
            </THead>
            <TBody>
              {t.points.map((p, i) => (
                <TR key={i}>
                  <TD className="whitespace-nowrap">{day.format(new Date(p.at))}</TD>
                  <TD className="whitespace-nowrap">
                    {typedText(p.value)} {t.unit}
                  </TD>
                  <TD className="whitespace-nowrap">{itemLimitText(p.limit, t.unit)}</TD>
                  <TD>
                    <ReadingVerdictBadge verdict={p.verdict} />
                  </TD>
                  <TD>
                    <JobLink shopSlug={shopSlug} number={p.jobNumber} />
                  </TD>
                </TR>
              ))}
            </TBody>
          </Table>
        </div>
      ))}
    </div>
  );
}
