import type { ReactNode } from "react";

export interface PageHeaderProps {
  title: ReactNode;
  /** Breadcrumb-style line above the title (links back up). */
  eyebrow?: ReactNode;
  description?: ReactNode;
  actions?: ReactNode;
}

/** Title row of a page: where you are, what this is, and the page's main actions. */
export function PageHeader({ title, eyebrow, description, actions }: PageHeaderProps) {
  return (
    <div className="mb-4 flex flex-wrap items-end justify-between gap-x-6 gap-y-3">
      <div className="min-w-0">
        {eyebrow && <div className="mb-1 text-[12px] text-ink-mute">{eyebrow}</div>}
        <h1 className="text-[22px] leading-tight font-semibold tracking-tight text-ink">{title}</h1>
        {description && <div className="mt-1 text-[13px] text-ink-mute">{description}</div>}
      </div>
      {actions && <div className="flex flex-wrap items-center gap-2">{actions}</div>}
    </div>
  );
}
