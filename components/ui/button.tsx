import Link from "next/link";
import { LoaderCircle } from "lucide-react";
import type { ComponentProps, ReactNode } from "react";
import { type ButtonSize, type ButtonVariant, buttonClasses } from "./button-classes";

export { type ButtonSize, type ButtonVariant, buttonClasses };

export type ButtonProps = ComponentProps<"button"> & {
  variant?: ButtonVariant;
  size?: ButtonSize;
  /** Shows a spinner, sets aria-busy and blocks further presses (no double submits). */
  loading?: boolean;
  fullWidth?: boolean;
  /** Icon shown before the label; replaced by the spinner while loading. */
  icon?: ReactNode;
};

export function Button({
  variant = "primary",
  size = "md",
  loading = false,
  fullWidth = false,
  icon,
  type = "button",
  disabled,
  className,
  children,
  ...rest
}: ButtonProps) {
  return (
    <button
      type={type}
      disabled={disabled || loading}
      aria-busy={loading || undefined}
      className={buttonClasses(variant, size, fullWidth, className)}
      {...rest}
    >
      {loading ? (
        <LoaderCircle aria-hidden className="size-5 shrink-0 animate-spin" />
      ) : (
        icon
      )}
      {children}
    </button>
  );
}

export type ButtonLinkProps = ComponentProps<typeof Link> & {
  variant?: ButtonVariant;
  size?: ButtonSize;
  fullWidth?: boolean;
  icon?: ReactNode;
};

/** A link that looks like a button — for navigation, never for actions that change data. */
export function ButtonLink({
  variant = "primary",
  size = "md",
  fullWidth = false,
  icon,
  className,
  children,
  ...rest
}: ButtonLinkProps) {
  return (
    <Link className={buttonClasses(variant, size, fullWidth, className)} {...rest}>
      {icon}
      {children}
    </Link>
  );
}
