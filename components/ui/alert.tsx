import clsx from "clsx";
import {
  CircleCheck,
  CircleExclamationPoint,
  Info,
  TriangleExclamationPoint,
  type LucideIcon,
} from "lucide-react";
import type { ReactNode } from "react";

export type AlertTone = "error" | "warning" | "info" | "success";

const tones: Record<AlertTone, { box: string; icon: string; Icon: LucideIcon; word: string }> = {
  error: { box: "bg-rust-soft border-rust", icon: "text-rust", Icon: CircleExclamationPoint, word: "Problem" },
  warning: { box: "bg-signal-soft border-signal", icon: "text-signal", Icon: TriangleExclamationPoint, word: "Heads up" },
  info: { box: "bg-oil-soft border-oil", icon: "text-oil", Icon: Info, word: "Note" },
  success: { box: "bg-moss-soft border-moss", icon: "text-moss", Icon: CircleCheck, word: "Done" },
};

export type AlertProps = {
  tone?: AlertTone;
  /** Short heading; defaults to a plain word for the tone so meaning isn't colour-only. */
  title?: ReactNode;
  children?: ReactNode;
  /** Optional button or link placed under the text, e.g. "Try again". */
  action?: ReactNode;
  className?: string;
};

export function Alert({ tone = "info", title, children, action, className }: AlertProps) {
  const t = tones[tone];
  return (
    <div
      // Errors interrupt (read at once); other tones wait their turn.
      role={tone === "error" ? "alert" : "status"}
      className={clsx("flex gap-3 rounded-lg border-l-4 p-4 text-ink", t.box, className)}
    >
      <t.Icon aria-hidden className={clsx("mt-0.5 size-5 shrink-0", t.icon)} />
      <div className="flex min-w-0 flex-1 flex-col gap-1">
        <p className="font-semibold">{title ?? t.word}</p>
        {children ? <div className="text-ink">{children}</div> : null}
        {action ? <div className="mt-2">{action}</div> : null}
      </div>
    </div>
  );
}
