import { ListChecks, Sparkles, SquareCheck, TriangleExclamationPoint } from "lucide-react";
import { BoltPattern } from "@/components/bench/bolt-pattern";
import { PassTable, TorqueValue } from "@/components/bench/torque-value";
import { ReassemblyProgress } from "@/components/journal/reassembly-progress";
import { Badge, Card, Caution, EmptyState } from "@/components/ui";
import type { TeardownRow } from "@/db/queries/bench";
import { checklistFromSteps } from "@/lib/bench";
import { checklistCautions } from "@/lib/checklist-cautions";
import { CAUTIONS } from "@/lib/cautions";
import { photoUrl } from "@/lib/journal";
import { checklistProgress } from "@/lib/reassembly";
import type { TorqueUnit } from "@/lib/torque";
import { REPLACE_WITH_NEW, stepTorqueNote } from "@/lib/torque-special";
import { ReassemblyMarks } from "./reassembly-marks";
import { whenText } from "./when";

type Props = { jobPublicId: string; steps: TeardownRow[]; passPercents: number[]; shopUnit: TorqueUnit; timeZone: string; mayRecord: boolean };

/** The teardown log played backwards: last off, first on, each with its notes and torque. */
export function ReassemblySection({ jobPublicId, steps, passPercents, shopUnit, timeZone, mayRecord }: Props) {
  const items = checklistFromSteps(steps, passPercents);
  const byId = new Map(steps.map((s) => [s.id, s]));
  const progress = checklistProgress(items, steps.filter((s) => s.checked).map((s) => s.id));
  return (
    <section aria-labelledby="reassembly" className="scroll-mt-4 space-y-4" id="reassembly-checklist">
      <h2 id="reassembly" className="text-xl font-bold text-ink">
        Reassembly checklist
      </h2>
      {items.length === 0 ? (
        <EmptyState icon={ListChecks} title="No checklist yet" description="It builds itself from the teardown log: log steps as parts come off." />
      ) : (
        <>
          <ReassemblyProgress {...progress} headingId="reassembly-progress-bench" />
          <ol className="space-y-3" aria-label="Reassembly steps, in order">
            {items.map((item) => {
              const step = byId.get(Number(item.id))!;
              const size = [item.count ? `${item.count} ×` : null, item.size].filter(Boolean).join(" ");
              const cautions = checklistCautions(item);
              return (
                <li key={item.id}>
                  <Card as="article" className={step.checked ? "border-moss" : undefined}>
                    <div className="space-y-2">
                      <p className="flex flex-wrap items-center gap-2 font-semibold text-ink">
                        <span>
                          {item.position}. Refit: {item.removed}
                          {size ? <span className="font-normal text-ink-muted"> ({size})</span> : null}
                        </span>
                        {step.checked ? (
                          <Badge tone="moss" icon={SquareCheck}>
                            Done
                          </Badge>
                        ) : null}
                        {item.replaceWithNew ? (
                          <Badge tone="rust" icon={TriangleExclamationPoint}>
                            Replace with new
                          </Badge>
                        ) : null}
                        {step.replacedNew ? (
                          <Badge tone="dusk" icon={Sparkles}>
                            Replaced with new
                          </Badge>
                        ) : null}
                      </p>
                      {item.replaceWithNew ? <p className="font-semibold text-ink">{REPLACE_WITH_NEW}.</p> : null}
                      {item.notes ? <p className="whitespace-pre-line">{item.notes}</p> : null}
                      {item.storage ? <p className="text-sm text-ink-muted">Kept in: {item.storage}</p> : null}
                      {item.photoIds.length ? (
                        // eslint-disable-next-line @next/next/no-img-element -- served by our authorised photo route, already resized
                        <img src={photoUrl(String(item.photoIds[0]), "thumb")} alt={`Photo taken when ${item.removed} came off`} className="h-32 w-auto rounded-lg border border-line" loading="lazy" />
                      ) : null}
                      {item.torque ? (
                        <div className="space-y-3 rounded-lg bg-sunken p-3">
                          <TorqueValue value={item.torque.value} unit={item.torque.unit} displayUnit={shopUnit} />
                          {stepTorqueNote({ ...item.torque, oneTime: false }) ? <p>{stepTorqueNote({ ...item.torque, oneTime: false })}</p> : null}
                          <PassTable value={item.torque.value} unit={item.torque.unit} displayUnit={shopUnit} passPercents={passPercents} label={`Pass schedule: ${item.removed}`} />
                          {item.torque.tighteningOrder && item.torque.boltCount ? <BoltPattern count={item.torque.boltCount} order={item.torque.tighteningOrder} size={240} /> : null}
                        </div>
                      ) : null}
                      {cautions.length ? (
                        <Caution title={cautions.length === 1 ? CAUTIONS[cautions[0]!].title : "Safety cautions"} className="text-sm">
                          {/* Paragraphs, not a list: the checklist's items stay the only list items in it. */}
                          {cautions.map((k) => (
                            <p key={k}>
                              {cautions.length > 1 ? <strong>{CAUTIONS[k].title}: </strong> : null}
                              {CAUTIONS[k].text}
                            </p>
                          ))}
                        </Caution>
                      ) : null}
                      {step.checked ? (
                        <p className="text-sm text-ink-muted">
                          Done by {step.checked.by ?? "someone"} · {whenText(step.checked.at, timeZone)}
                        </p>
                      ) : null}
                      {mayRecord ? (
                        <ReassemblyMarks
                          key={`${item.id}-${!!step.checked}-${step.replacedNew}`}
                          jobPublicId={jobPublicId}
                          stepId={String(item.id)}
                          removed={item.removed}
                          done={!!step.checked}
                          replacedNew={step.replacedNew}
                        />
                      ) : null}
                    </div>
                  </Card>
                </li>
              );
            })}
          </ol>
        </>
      )}
    </section>
  );
}
