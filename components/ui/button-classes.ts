import clsx from "clsx";

// The look of a button, apart from button.tsx so that a screen can style a plain <button> or <a>
// like one without loading next/link (which button.tsx imports for ButtonLink): the error screens
// ship with every page.

export type ButtonVariant = "primary" | "secondary" | "ghost" | "danger";
export type ButtonSize = "md" | "lg";

const base =
  "inline-flex min-h-tap min-w-tap select-none items-center justify-center gap-2 rounded-lg font-semibold leading-tight transition-colors disabled:cursor-not-allowed disabled:opacity-60 aria-disabled:cursor-not-allowed aria-disabled:opacity-60";

const variants: Record<ButtonVariant, string> = {
  primary: "bg-oil text-oil-on hover:bg-oil/90 active:bg-oil/80",
  secondary: "border border-line-strong bg-surface text-ink hover:bg-sunken active:bg-sunken/70",
  ghost: "text-oil hover:bg-oil-soft active:bg-oil-soft/70",
  danger: "bg-rust text-rust-on hover:bg-rust/90 active:bg-rust/80",
};

const sizes: Record<ButtonSize, string> = {
  md: "px-4 py-2 text-base",
  // lg is for the one main action on a bench screen: bigger thumb target.
  lg: "min-h-14 px-6 py-3 text-lg",
};

/** Shared so other components (e.g. a form's submit link) can look like a button. */
export function buttonClasses(
  variant: ButtonVariant = "primary",
  size: ButtonSize = "md",
  fullWidth = false,
  className?: string,
) {
  return clsx(base, variants[variant], sizes[size], fullWidth && "w-full", className);
}
