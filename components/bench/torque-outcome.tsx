import { CircleCheck, CircleMinus, TriangleExclamationPoint, type LucideIcon } from "lucide-react";
import { Badge, type BadgeTone } from "@/components/ui";
import { type TorqueBody, toleranceOf } from "@/lib/bench";
import { OUTCOME_LABEL, type TorqueOutcome, torqueOutcome } from "@/lib/torque-check";

// Applied against spec as a word plus an icon, never colour alone (staff and owner views alike).
const LOOK: Record<TorqueOutcome["kind"], { tone: BadgeTone; icon: LucideIcon }> = {
  within: { tone: "moss", icon: CircleCheck },
  under: { tone: "rust", icon: TriangleExclamationPoint },
  over: { tone: "rust", icon: TriangleExclamationPoint },
  not_recorded: { tone: "neutral", icon: CircleMinus },
};

export function TorqueOutcomeBadge({ record }: { record: Pick<TorqueBody, "specValue" | "appliedValue" | "tolerancePct" | "wrenchClass"> }) {
  const outcome = torqueOutcome({ specValue: record.specValue, appliedValue: record.appliedValue, tolerancePct: toleranceOf(record) });
  const look = LOOK[outcome.kind];
  return (
    <Badge tone={look.tone} icon={look.icon}>
      {OUTCOME_LABEL[outcome.kind]}
    </Badge>
  );
}
