import type { ReactNode } from "react";
import { cx } from "./cx";

export interface CardProps {
  /** Short heading in the card's top bar. */
  title?: ReactNode;
  /** One line under the title. */
  description?: ReactNode;
  /** Controls at the right of the top bar (buttons, badges). */
  actions?: ReactNode;
  /** Pad the body (default). Tables usually want `padded={false}` to run edge to edge. */
  padded?: boolean;
  className?: string;
  id?: string;
  children?: ReactNode;
}

/** White panel with a thin line border; the basic container of every screen. */
export function Card({ title, description, actions, padded = true, className, id, children }: CardProps) {
  const hasHead = title !== undefined || actions !== undefined || description !== undefined;
  return (
    <section id={id} className={cx("min-w-0 rounded-lg border border-paper-line bg-paper-card", className)}>
      {hasHead && (
        <header className="flex flex-wrap items-start justify-between gap-x-4 gap-y-2 border-b border-paper-line px-4 py-2.5">
          <div className="min-w-0">
            {title !== undefined && (
              <h2 className="text-[13px] font-semibold uppercase tracking-wide text-ink-soft">{title}</h2>
            )}
            {description !== undefined && <p className="mt-0.5 text-[13px] text-ink-mute">{description}</p>}
          </div>
          {/* max-w-full: on a narrow card the actions take their own line and wrap inside it. */}
          {actions !== undefined && (
            <div className="flex max-w-full shrink-0 flex-wrap items-center gap-2">{actions}</div>
          )}
        </header>
      )}
      <div className={padded ? "p-4" : undefined}>{children}</div>
    </section>
  );
}
