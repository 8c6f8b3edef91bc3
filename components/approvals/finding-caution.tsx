import { Caution } from "@/components/ui";
import { FINDING_CAUTIONS, SAFETY_LABEL, type SafetyCategory } from "@/lib/approvals";

/** The safety caution for a finding on a part a rider's safety rests on (SAFETY_CATEGORIES; the box adds the deferral). */
export function FindingCaution({ safety, className }: { safety: SafetyCategory; className?: string }) {
  if (safety === "none") return null;
  return (
    <Caution title={`Safety: ${SAFETY_LABEL[safety].toLowerCase()}`} className={className}>
      {FINDING_CAUTIONS[safety]}
    </Caution>
  );
}
