import type { ReactNode } from "react";
import { cx } from "./cx";

export type BadgeTone = "neutral" | "copper" | "indigo" | "moss" | "alert" | "caution";

const tones: Record<BadgeTone, string> = {
  neutral: "bg-paper-sunk text-ink-soft border-paper-line",
  copper: "bg-copper-soft text-copper-deep border-copper/30",
  indigo: "bg-indigo-soft text-indigo border-indigo/25",
  moss: "bg-moss-soft text-moss border-moss/30",
  alert: "bg-alert-soft text-alert border-alert/30",
  caution: "bg-caution-soft text-caution border-caution/30",
};

export interface BadgeProps {
  tone?: BadgeTone;
  className?: string;
  title?: string;
  children: ReactNode;
}

/** Small status label: roles, stage kinds, review decisions, pass/fail. */
export function Badge({ tone = "neutral", className, title, children }: BadgeProps) {
  return (
    <span
      title={title}
      className={cx(
        "inline-flex items-center rounded border px-1.5 py-px text-[11px] font-medium leading-4 whitespace-nowrap",
        tones[tone],
        className,
      )}
    >
      {children}
    </span>
  );
}

export type Role = "owner" | "designer" | "reviewer" | "viewer";

const roleTone: Record<Role, BadgeTone> = { owner: "copper", designer: "indigo", reviewer: "moss", viewer: "neutral" };

/** The member's role, coloured the same everywhere. */
export function RoleBadge({ role, className }: { role: Role; className?: string }) {
  return (
    <Badge tone={roleTone[role] ?? "neutral"} className={className}>
      {role}
    </Badge>
  );
}
