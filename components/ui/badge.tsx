import clsx from "clsx";
import type { LucideIcon } from "lucide-react";
import type { ReactNode } from "react";

export type BadgeTone = "neutral" | "oil" | "brass" | "rust" | "moss" | "signal" | "dusk";

// Soft tint + full-strength hue text: every pair is ≥ 4.5:1 (see globals.css).
export const badgeToneClasses: Record<BadgeTone, string> = {
  neutral: "bg-sunken text-ink border-line",
  oil: "bg-oil-soft text-oil border-oil/30",
  brass: "bg-brass-soft text-brass border-brass/30",
  rust: "bg-rust-soft text-rust border-rust/30",
  moss: "bg-moss-soft text-moss border-moss/30",
  signal: "bg-signal-soft text-signal border-signal/30",
  dusk: "bg-dusk-soft text-dusk border-dusk/30",
};

export type BadgeProps = {
  tone?: BadgeTone;
  /** Meaning must never rest on colour alone, so pair a tone with an icon or clear words. */
  icon?: LucideIcon;
  className?: string;
  children: ReactNode;
};

/** A small non-interactive label. */
export function Badge({ tone = "neutral", icon: Icon, className, children }: BadgeProps) {
  return (
    <span
      className={clsx(
        "inline-flex items-center gap-1.5 whitespace-nowrap rounded-full border px-2.5 py-1 text-sm font-semibold leading-none",
        badgeToneClasses[tone],
        className,
      )}
    >
      {Icon ? <Icon aria-hidden className="size-4 shrink-0" /> : null}
      {children}
    </span>
  );
}
