import { Ban, CircleCheck, Clock, Eye, EyeOff, Hourglass, Undo2, type LucideIcon } from "lucide-react";
import { Badge, type BadgeTone } from "@/components/ui";
import { STORY_STATUS_LABEL, type StoryStatus } from "@/lib/portfolio";

// A story's status as a word and an icon (never colour alone).
const LOOK: Record<StoryStatus, { icon: LucideIcon; tone: BadgeTone }> = {
  proposed: { icon: Clock, tone: "neutral" },
  consent_requested: { icon: Hourglass, tone: "brass" },
  consented: { icon: CircleCheck, tone: "moss" },
  declined: { icon: Ban, tone: "rust" },
  published: { icon: Eye, tone: "oil" },
  withdrawn: { icon: Undo2, tone: "rust" },
  unpublished: { icon: EyeOff, tone: "neutral" },
};

export function StoryStatusBadge({ status }: { status: StoryStatus }) {
  const look = LOOK[status];
  return (
    <Badge tone={look.tone} icon={look.icon}>
      {STORY_STATUS_LABEL[status]}
    </Badge>
  );
}
