import type { Metadata } from "next";
import { Card, Caution, PageHeader, TBody, TD, TH, THead, TR, Table } from "@/components/ui";
import { getMachineHistory } from "@/db/queries/machines";
import { listMachineMeasurements } from "@/db/queries/measurements";
import { groupTrends } from "@/lib/measurement-trends";
import { PART_STATUS_LABEL, plainNumber, torqueText } from "@/lib/bench";
import { MACHINE_KIND_LABEL, describeMachine } from "@/lib/machine";
import { atResolution } from "@/lib/reading-text";
import { formatMoney, formatQuantity } from "@/lib/money";
import { can } from "@/lib/permissions";
import { loadPage } from "@/lib/server/page-access";
import { JobLink, JobsTable } from "../../customers/_components/jobs-table";
import { MeasurementTrends } from "./_components/measurement-trends";
import { ReadingTrend } from "./_components/reading-trend";
import { TorqueOutcomeBadge } from "@/components/bench/torque-outcome";

export const metadata: Metadata = { title: "Machine history" };

const VERDICT_TEXT = {
  within: "Within limits",
  below: "Below limit",
  above: "Above limit",
  no_limit: "No limit given",
} as const;

/** A machine's service history across its jobs, newest first. Part costs only for staff who see money. */
export default async function MachinePage({ params }: { params: Promise<{ shop: string; machine: string }> }) {
  const { shop: slug, machine: id } = await params;
  const { actor, shop, machine } = await loadPage("machine", { shop: slug, machine: id }, "customer:view", `/shop/${slug}/machines/${id}`);
  const [history, measured] = await Promise.all([getMachineHistory({ shopId: shop.id, machineId: machine.id }), listMachineMeasurements({ shopId: shop.id, machineId: machine.id })]);
  const trends = groupTrends(measured);
  const mayViewMoney = can(actor, "money:view", { shopId: shop.id });
  const currency = mayViewMoney ? shop.currency : null;
  const base = `/shop/${shop.slug}`;
  const day = new Intl.DateTimeFormat("en-US", {
    timeZone: shop.timezone,
    month: "short",
    day: "numeric",
    year: "numeric",
  });
  const jobLink = (n: number) => <JobLink shopSlug={shop.slug} number={n} />;
  // Readings of one kind together (chain wear, pad thickness…), each newest first.
  const byLabel = new Map<string, typeof history.readings>();
  for (const r of history.readings) byLabel.set(r.label, [...(byLabel.get(r.label) ?? []), r]);
  const facts = [
    MACHINE_KIND_LABEL[machine.kind],
    machine.engineCc ? `${machine.engineCc} cc` : null,
    machine.serial ? `serial ${machine.serial}` : null,
    machine.hours != null ? `${plainNumber(machine.hours)} h at check-in` : null,
    machine.odometer != null ? `${machine.odometer.toLocaleString("en")} ${machine.odometerUnit ?? ""} at check-in` : null,
  ].filter(Boolean);

  return (
    <div className="space-y-6">
      <PageHeader
        title={describeMachine(machine)}
        description={facts.join(" · ")}
        back={{
          href: `${base}/customers/${machine.customerId}`,
          label: machine.customerName,
        }}
      />

      <Card as="section" title="Jobs" headingId="machine-jobs">
        {history.jobs.length === 0 ? (
          <p className="text-ink-muted">No jobs yet.</p>
        ) : (
          <JobsTable label="Jobs on this machine" shopSlug={shop.slug} timeZone={shop.timezone} jobs={history.jobs} />
        )}
      </Card>

      <Card as="section" title="Readings over time" headingId="machine-readings">
        {byLabel.size === 0 ? (
          <p className="text-ink-muted">No readings recorded yet.</p>
        ) : (
          <div className="space-y-4">
            {[...byLabel.entries()].map(([label, rows]) => (
              <div key={label} className="space-y-2">
                <ReadingTrend points={rows} />
                <Table label={`${label} by date`} caption={label}>
                  <THead>
                    <TR>
                      <TH>Date</TH>
                      <TH>Reading</TH>
                      <TH>Against the limit</TH>
                      <TH>Job</TH>
                    </TR>
                  </THead>
                  <TBody>
                    {rows.map((r) => (
                      <TR key={r.id}>
                        <TD className="whitespace-nowrap">{day.format(r.at)}</TD>
                        <TD className="whitespace-nowrap">
                          {atResolution(r.value, r.valueDecimals)}
                          {r.unit ? ` ${r.unit}` : ""}
                        </TD>
                        <TD>{VERDICT_TEXT[r.verdict]}</TD>
                        <TD>{jobLink(r.jobNumber)}</TD>
                      </TR>
                    ))}
                  </TBody>
                </Table>
              </div>
            ))}
          </div>
        )}
      </Card>

      <Card as="section" title="Measurements across jobs" headingId="machine-measurements" description="The same valve, plate, disc or cylinder from the measurement sets of each job, with the limit it was judged by.">
        <MeasurementTrends trends={trends} shopSlug={shop.slug} timeZone={shop.timezone} />
      </Card>

      <Card as="section" title="Parts fitted" headingId="machine-parts" description="Parts received for or fitted to this machine.">
        {history.parts.length === 0 ? (
          <p className="text-ink-muted">No parts yet.</p>
        ) : (
          <Table label="Parts fitted to this machine">
            <THead>
              <TR>
                <TH>Date</TH>
                <TH>Part</TH>
                <TH>Qty</TH>
                <TH>Status</TH>
                {currency ? <TH>Cost</TH> : null}
                <TH>Job</TH>
              </TR>
            </THead>
            <TBody>
              {history.parts.map((p) => (
                <TR key={p.id}>
                  <TD className="whitespace-nowrap">{day.format(p.at)}</TD>
                  <TD>
                    {p.description}
                    {p.partNumber ? <span className="block text-sm text-ink-muted">{p.partNumber}</span> : null}
                  </TD>
                  <TD>{formatQuantity(p.qtyThousandths)}</TD>
                  <TD>{PART_STATUS_LABEL[p.status]}</TD>
                  {currency ? <TD className="whitespace-nowrap">{p.costMinor == null ? "—" : formatMoney(p.costMinor, currency)}</TD> : null}
                  <TD>{jobLink(p.jobNumber)}</TD>
                </TR>
              ))}
            </TBody>
          </Table>
        )}
      </Card>

      <Card as="section" title="Torque records" headingId="machine-torque">
        {history.torque.length === 0 ? (
          <p className="text-ink-muted">No torque records yet.</p>
        ) : (
          <>
            <Caution title="A record, not a spec" className="mb-3">
              These are the values used on earlier jobs. Torque to the maker&apos;s current spec for this machine, not to a past record.
            </Caution>
            <Table label="Torque records on this machine">
              <THead>
                <TR>
                  <TH>Date</TH>
                  <TH>Fastener</TH>
                  <TH>Spec</TH>
                  <TH>Applied</TH>
                  <TH>Job</TH>
                </TR>
              </THead>
              <TBody>
                {history.torque.map((t) => (
                  <TR key={t.id}>
                    <TD className="whitespace-nowrap">{day.format(t.at)}</TD>
                    <TD>{t.fastener}</TD>
                    <TD className="whitespace-nowrap">{torqueText(t.specValue, t.unit)}</TD>
                    <TD className="whitespace-nowrap">
                      {t.appliedValue == null ? null : `${torqueText(t.appliedValue, t.unit)} `}<TorqueOutcomeBadge record={{ ...t, tolerancePct: t.tolerancePct ?? undefined }} />
                    </TD>
                    <TD>{jobLink(t.jobNumber)}</TD>
                  </TR>
                ))}
              </TBody>
            </Table>
          </>
        )}
      </Card>
    </div>
  );
}
