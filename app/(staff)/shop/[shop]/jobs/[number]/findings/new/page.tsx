import type { Metadata } from "next";
import { PageHeader } from "@/components/ui";
import { describeMachine } from "@/lib/machine";
import { formatJobNumber } from "@/lib/schemas/jobs";
import type { EvidenceChoices } from "@/db/queries/findings";
import { FindingEditor } from "../_components/finding-editor";
import type { EvidenceState } from "../_components/form-state";
import { readingLine } from "@/lib/reading-text";
import { momentAt } from "@/lib/clips";
import { loadFindingsJob } from "../load";

export const metadata: Metadata = { title: "Draft a finding" };

type Props = { params: Promise<{ shop: string; number: string }>; searchParams: Promise<{ photo?: string; reading?: string; clip?: string; at?: string }> };

/**
 * A technician (or the desk) drafts a finding from the job: what was found, evidence, proposed
 * lines. Other screens start it from a piece of evidence: ?photo=ID, ?reading=ID, ?clip=ID&at=SECONDS.
 */
export default async function NewFindingPage({ params, searchParams }: Props) {
  const { shop: slug, number } = await params;
  const { shop, job, settings, choices, pickable, basePath, mayPrice } = await loadFindingsJob(slug, number, "/findings/new");
  const start = startingPoint(await searchParams, choices);
  return (
    <div className="space-y-6">
      <PageHeader title="Draft a finding" description={`${formatJobNumber(job.number)} · ${describeMachine(job.machine)} · owner ${job.customerName}`} back={{ href: basePath, label: `Back to ${formatJobNumber(job.number)}` }} />
      <FindingEditor
        jobPublicId={job.publicId}
        basePath={basePath}
        finding={null}
        initial={{ title: start.title, found: start.found, whyItMatters: "", safety: "none", evidence: start.evidence, lines: [] }}
        choices={choices}
        mayPrice={mayPrice}
        locked={false}
        currency={shop.currency}
        settings={settings}
        pickable={pickable}
      />
    </div>
  );
}

/** The evidence a finding was started from, if it is this job's, with words to begin from. */
function startingPoint(q: { photo?: string; reading?: string; clip?: string; at?: string }, choices: EvidenceChoices): { title: string; found: string; evidence: EvidenceState[] } {
  const reading = q.reading ? choices.readings.find((r) => r.id === q.reading) : undefined;
  if (reading) {
    // The owner reads this: the value with its limit, source and verdict (lib/reading-text.ts).
    return { title: `${reading.label} out of limit`, found: `${readingLine(reading)}.`, evidence: [{ kind: "reading", ref: reading.id, momentMs: null }] };
  }
  const photo = q.photo ? choices.photos.find((p) => p.id === q.photo) : undefined;
  if (photo) return { title: "", found: photo.caption ?? "", evidence: [{ kind: "photo", ref: photo.id, momentMs: null }] };
  const clip = q.clip ? choices.clips.find((c) => c.id === q.clip) : undefined;
  if (clip) {
    const at = q.at && /^\d{1,5}$/.test(q.at) ? Number(q.at) * 1000 : null;
    // Paused on a marked moment: that moment, with the technician's words to begin from.
    const moment = momentAt(clip.moments, at);
    return { title: "", found: moment?.label ?? clip.caption ?? "", evidence: [{ kind: "clip", ref: clip.id, momentMs: moment?.atMs ?? at }] };
  }
  return { title: "", found: "", evidence: [] };
}
