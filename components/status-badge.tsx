import {
  CircleCheck,
  ClipboardList,
  KeyRound,
  MessageCircleQuestionMark,
  Package,
  ScanSearch,
  Wrench,
  type LucideIcon,
} from "lucide-react";
import { JOB_STATUS_LABEL, type JobStatus } from "@/lib/job-status";
import { Badge, type BadgeTone } from "@/components/ui/badge";

// One icon and tone per status. The label always shows too, so colour is only a hint:
// brass/signal flag "someone else must act", oil is active work, moss is done for the owner.
const STATUS_LOOK: Record<JobStatus, { icon: LucideIcon; tone: BadgeTone }> = {
  checked_in: { icon: ClipboardList, tone: "neutral" },
  inspecting: { icon: ScanSearch, tone: "dusk" },
  waiting_approval: { icon: MessageCircleQuestionMark, tone: "brass" },
  waiting_parts: { icon: Package, tone: "signal" },
  in_progress: { icon: Wrench, tone: "oil" },
  ready: { icon: CircleCheck, tone: "moss" },
  picked_up: { icon: KeyRound, tone: "neutral" },
};

export function StatusBadge({ status, className }: { status: JobStatus; className?: string }) {
  const look = STATUS_LOOK[status];
  return (
    <Badge tone={look.tone} icon={look.icon} className={className}>
      {JOB_STATUS_LABEL[status]}
    </Badge>
  );
}
