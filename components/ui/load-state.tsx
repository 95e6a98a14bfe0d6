import Link from "next/link";
import type { ReactNode } from "react";
import { HttpError, errorMessage } from "@/lib/client/fetcher";
import { EmptyState } from "./empty-state";
import { cx } from "./cx";

/** Placeholder rows while data loads (keeps the layout from jumping). */
export function LoadingRows({ rows = 3, className }: { rows?: number; className?: string }) {
  return (
    <div role="status" aria-busy="true" aria-label="Loading" className={cx("flex flex-col gap-2 p-4", className)}>
      {Array.from({ length: rows }, (_, k) => 90 - k * 12).map((width) => (
        <div key={width} className="h-5 animate-pulse rounded bg-paper-sunk" style={{ width: `${width}%` }} />
      ))}
    </div>
  );
}

/** A failed load, with the server's message and a retry. */
export function LoadError({ message, onRetry }: { message: string; onRetry?: () => void }) {
  return (
    <div
      role="alert"
      className="flex flex-wrap items-center justify-between gap-3 rounded-md border border-alert/30 bg-alert-soft px-4 py-3 text-[13px] text-alert"
    >
      <span>{message}</span>
      {onRetry && (
        <button type="button" onClick={onRetry} className="font-medium underline underline-offset-2">
          Try again
        </button>
      )}
    </div>
  );
}

export interface LoadGateProps<T> {
  /** The SWR triple of the resource (pass `useX()`'s fields straight through). */
  data: T | undefined;
  error: unknown;
  isLoading?: boolean;
  onRetry?: () => void;
  /** Title shown on a 404 ("Scenario not found"). */
  notFoundTitle: string;
  /** Placeholder rows while loading. */
  rows?: number;
  children: (data: T) => ReactNode;
}

/**
 * Loading → placeholder, 404 → "not found" card with a way back, other errors → message with
 * retry, data → children(data). One place for the states every resource page has.
 */
/**
 * The "not found" card with a way back: a malformed id, a deleted item and another team's id
 * all look the same (404). Shared by LoadGate, the routes' not-found pages and the run views.
 */
export function NotFoundCard({ title, children }: { title: string; children?: ReactNode }) {
  return (
    <div className="rounded-lg border border-paper-line bg-paper-card">
      <EmptyState
        title={title}
        action={
          <Link className="text-copper hover:underline" href="/boards">
            Back to boards
          </Link>
        }
      >
        {children ?? "It may have been deleted, or it belongs to another team."}
      </EmptyState>
    </div>
  );
}

export function LoadGate<T>({ data, error, onRetry, notFoundTitle, rows = 6, children }: LoadGateProps<T>) {
  if (error instanceof HttpError && error.status === 404) return <NotFoundCard title={notFoundTitle} />;
  if (error) return <LoadError message={errorMessage(error)} onRetry={onRetry} />;
  if (data === undefined) {
    return (
      <div className="rounded-lg border border-paper-line bg-paper-card">
        <LoadingRows rows={rows} />
      </div>
    );
  }
  return <>{children(data)}</>;
}
