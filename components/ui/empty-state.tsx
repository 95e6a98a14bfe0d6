import type { ReactNode } from "react";

export interface EmptyStateProps {
  title: ReactNode;
  children?: ReactNode;
  /** Usually one primary button. */
  action?: ReactNode;
}

/** What a list shows when it has nothing yet: what belongs here and how to add it. */
export function EmptyState({ title, children, action }: EmptyStateProps) {
  return (
    <div className="flex flex-col items-center gap-2 px-6 py-10 text-center">
      <svg aria-hidden width="44" height="20" viewBox="0 0 44 20" className="text-ink-faint">
        <path
          d="M2 16 H14 L18 4 H30 L34 16 H42"
          fill="none"
          stroke="currentColor"
          strokeWidth="1.5"
          strokeDasharray="3 3"
        />
      </svg>
      <p className="font-medium text-ink">{title}</p>
      {children && <div className="max-w-md text-[13px] text-ink-mute">{children}</div>}
      {action && <div className="mt-2">{action}</div>}
    </div>
  );
}
