import Link from "next/link";
import type { ComponentProps } from "react";
import { cx } from "./cx";

export type ButtonVariant = "primary" | "secondary" | "ghost" | "danger" | "quiet-danger";
export type ButtonSize = "sm" | "md";

const base =
  "inline-flex items-center justify-center gap-1.5 rounded-md font-medium whitespace-nowrap " +
  "transition-colors disabled:cursor-not-allowed disabled:opacity-50 focus-visible:outline-2";

const variants: Record<ButtonVariant, string> = {
  primary: "bg-copper text-white hover:bg-copper-deep border border-copper-deep/40",
  secondary: "bg-paper-card text-ink border border-paper-line hover:bg-paper-sunk",
  ghost: "text-ink-soft hover:bg-paper-sunk hover:text-ink",
  danger: "bg-paper-card text-alert border border-alert/40 hover:bg-alert-soft",
  // Row actions such as Delete in a table: no border, red text.
  "quiet-danger": "text-alert hover:bg-alert-soft",
};

const sizes: Record<ButtonSize, string> = {
  sm: "h-7 px-2.5 text-[13px]",
  md: "h-9 px-3.5 text-sm",
};

/** Class string of a button, for elements that must look like one (links, labels). */
export function buttonClasses(
  variant: ButtonVariant = "secondary",
  size: ButtonSize = "md",
  className?: string,
): string {
  return cx(base, variants[variant], sizes[size], className);
}

export type ButtonProps = ComponentProps<"button"> & { variant?: ButtonVariant; size?: ButtonSize };

export function Button({ variant = "secondary", size = "md", className, type = "button", ...rest }: ButtonProps) {
  return <button type={type} className={buttonClasses(variant, size, className)} {...rest} />;
}

export type ButtonLinkProps = ComponentProps<typeof Link> & { variant?: ButtonVariant; size?: ButtonSize };

export function ButtonLink({ variant = "secondary", size = "md", className, ...rest }: ButtonLinkProps) {
  return <Link className={buttonClasses(variant, size, className)} {...rest} />;
}
