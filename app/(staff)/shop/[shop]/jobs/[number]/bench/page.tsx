import type { Metadata } from "next";
import { BookOpen } from "lucide-react";
import { Alert, ButtonLink, Caution, PageHeader } from "@/components/ui";
import { BenchQuickPost } from "@/components/bench-quick-post";
import { OutboxPanel } from "@/components/journal/outbox-panel";
import { getBenchSettings, listJobPhotos, listReadings, listTeardownSteps, listTorqueRecords } from "@/db/queries/bench";
import { listParts } from "@/db/queries/bench-parts";
import { listFindingClearance } from "@/db/queries/workflow";
import { listSpecs } from "@/db/queries/bench-specs";
import { listMeasurementSets } from "@/db/queries/measurements";
import { listTeardownRevisions } from "@/db/queries/teardown-history";
import { nextStepSeq } from "@/lib/teardown-history";
import { CAUTIONS, type CautionKey } from "@/lib/cautions";
import { describeMachine } from "@/lib/machine";
import { collectedJobRefusal } from "@/lib/job-status";
import { can } from "@/lib/permissions";
import { formatJobNumber, jobNumberParamSchema } from "@/lib/schemas/jobs";
import { isTorqueUnit } from "@/lib/torque";
import { staffJobPage } from "@/lib/server/page-access";
import { PartsSection } from "./_components/parts-section";
import { shopToday } from "@/lib/jobs-view";
import { PartOrdering } from "./_components/part-ordering";
import { MeasurementsSection } from "./_components/measurements-section";
import { ReadingsSection } from "./_components/readings-section";
import { ReassemblySection } from "./_components/reassembly-section";
import { TeardownSection } from "./_components/teardown-section";
import { TorqueSection } from "./_components/torque-section";

type Props = { params: Promise<{ shop: string; number: string }> };

export async function generateMetadata({ params }: Props): Promise<Metadata> {
  const n = jobNumberParamSchema.safeParse((await params).number);
  return { title: n.success ? `Bench tools · ${formatJobNumber(n.data)}` : "Bench tools" };
}

const SECTIONS = [
  ["#torque", "Torque"],
  ["#readings", "Readings"],
  ["#measurements", "Measurement sets"],
  ["#teardown", "Teardown"],
  ["#reassembly", "Reassembly"],
  ["#parts", "Parts"],
] as const;

// Torque has its own caution beside the torque log; these cover the rest of the bench.
const BENCH_CAUTIONS: CautionKey[] = ["lifting", "hot_oil", "used_oil", "fuel", "brakes"];

/** A job's bench tools, phone-first: torque, readings, teardown → reassembly, parts. */
export default async function BenchPage({ params }: Props) {
  const { shop: slug, number } = await params;
  const { actor, shop, job, resource } = await staffJobPage(slug, number, "journal:view-shop-only", "/bench");

  const key = { shopId: shop.id, jobId: job.id };
  const [settings, records, readings, steps, parts, specs, photos, findings, revisions, measurementSets] = await Promise.all([
    getBenchSettings({ shopId: shop.id }),
    listTorqueRecords(key),
    listReadings(key),
    listTeardownSteps(key),
    listParts(key),
    listSpecs({ shopId: shop.id, make: job.machine.make, model: job.machine.model }),
    listJobPhotos(key),
    listFindingClearance(key),
    listTeardownRevisions(key),
    listMeasurementSets(key),
  ]);
  const torqueSpecs = specs.flatMap((s) =>
    s.kind === "torque" && s.value != null && s.unit && isTorqueUnit(s.unit) ? [{ id: s.id, label: s.label, value: s.value, unit: s.unit, boltCount: s.boltCount, source: s.source }] : [],
  );
  const limitSpecs = specs.filter((s) => s.kind === "limit").map((s) => ({ id: s.id, label: s.label, unit: s.unit, min: s.min, max: s.max, source: s.source, decimals: { min: s.decimals.min, max: s.decimals.max } }));
  const mayRecord = can(actor, "bench:record", resource);
  const jobPath = `/shop/${shop.slug}/jobs/${job.number}`;

  return (
    // Room at the bottom on a phone for the quick-post bar, which sits there.
    <div className="space-y-6 max-sm:pb-24">
      <PageHeader
        title={`Bench tools · ${formatJobNumber(job.number)}`}
        description={`${describeMachine(job.machine)} · owner ${job.customerName}`}
        back={{ href: jobPath, label: `Back to ${formatJobNumber(job.number)}` }}
        actions={
          <ButtonLink href={`/shop/${shop.slug}/specs`} variant="secondary" icon={<BookOpen aria-hidden className="size-5" />}>
            Shop specs
          </ButtonLink>
        }
      />
      {job.status === "picked_up" ? (
        <Alert tone="info" title="This machine has been collected">
          {collectedJobRefusal(job.status, "nothing new can be recorded on it")}
        </Alert>
      ) : (
        <BenchQuickPost jobPath={jobPath} on="bench" mayRecord={mayRecord} />
      )}
      <OutboxPanel jobPublicId={job.publicId} />
      <nav aria-label="Bench sections" className="-mt-2 flex flex-wrap gap-2">
        {SECTIONS.map(([href, label]) => (
          <a key={href} href={href} className="inline-flex min-h-tap items-center rounded-full border border-line-strong bg-surface px-4 font-semibold text-ink hover:bg-sunken">
            {label}
          </a>
        ))}
      </nav>
      <Caution title="Working safely at the bench" rememberAs="bench">
        <ul className="list-disc space-y-1 pl-5">
          {BENCH_CAUTIONS.map((k) => (
            <li key={k}>
              <strong>{CAUTIONS[k].title}:</strong> {CAUTIONS[k].text}
            </li>
          ))}
        </ul>
      </Caution>
      <TorqueSection
        jobPublicId={job.publicId}
        currency={shop.currency}
        shopUnit={settings.torqueUnit}
        shopWrench={settings.wrenchClass}
        passPercents={settings.passPercents}
        specs={torqueSpecs}
        records={records}
        timeZone={shop.timezone}
        mayRecord={mayRecord}
        viewerUserId={actor.userId}
        mayModerate={can(actor, "journal:moderate", resource)}
      />
      <ReadingsSection jobPublicId={job.publicId} currency={shop.currency} readings={readings} specs={limitSpecs} chainLimitPct={settings.chainLimitPct} timeZone={shop.timezone} mayRecord={mayRecord} />
      <MeasurementsSection jobPublicId={job.publicId} currency={shop.currency} sets={measurementSets} timeZone={shop.timezone} mayRecord={mayRecord} mayDraft={can(actor, "approvals:draft", resource)} />
      <TeardownSection
        jobPublicId={job.publicId}
        currency={shop.currency}
        steps={steps}
        photos={photos}
        shopUnit={settings.torqueUnit}
        mayRecord={mayRecord}
        revisions={revisions}
        timeZone={shop.timezone}
        nextSeq={nextStepSeq(steps, revisions)}
      />
      <ReassemblySection jobPublicId={job.publicId} steps={steps} passPercents={settings.passPercents} shopUnit={settings.torqueUnit} timeZone={shop.timezone} mayRecord={mayRecord} />
      <PartsSection jobPublicId={job.publicId} parts={parts} currency={shop.currency} timeZone={shop.timezone} mayManage={can(actor, "parts:manage", resource)} findings={findings} />
      {can(actor, "parts:manage", resource) ? (
        <PartOrdering jobPublicId={job.publicId} shopId={shop.id} jobId={job.id} parts={parts} currency={shop.currency} today={shopToday(shop.timezone)} mayMoney={can(actor, "invoice:create", resource)} />
      ) : null}
    </div>
  );
}
