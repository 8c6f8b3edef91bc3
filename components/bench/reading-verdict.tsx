import { CircleCheck, CircleMinus, TriangleExclamationPoint, type LucideIcon } from "lucide-react";
import { Badge, type BadgeTone } from "@/components/ui";
import type { ReadingVerdict } from "@/lib/readings";

// A reading's verdict as a word plus an icon, never colour alone.
const LOOK: Record<ReadingVerdict, { label: string; tone: BadgeTone; icon: LucideIcon }> = {
  within: { label: "Within limit", tone: "moss", icon: CircleCheck },
  above: { label: "Out of limit: over", tone: "rust", icon: TriangleExclamationPoint },
  below: { label: "Out of limit: under", tone: "rust", icon: TriangleExclamationPoint },
  no_limit: { label: "No limit given", tone: "neutral", icon: CircleMinus },
};

export const isOutOfLimit = (v: ReadingVerdict) => v === "above" || v === "below";

export function ReadingVerdictBadge({ verdict }: { verdict: ReadingVerdict }) {
  const look = LOOK[verdict];
  return (
    <Badge tone={look.tone} icon={look.icon}>
      {look.label}
    </Badge>
  );
}
