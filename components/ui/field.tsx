import type { ComponentProps, ReactNode } from "react";
import { cx } from "./cx";

export interface FieldProps {
  label: ReactNode;
  /** id of the control, so the label is clickable and read out with it. */
  htmlFor: string;
  hint?: ReactNode;
  /** Message naming what is wrong; shown in alert colour and linked by aria-describedby via `${htmlFor}-error`. */
  error?: ReactNode;
  className?: string;
  children: ReactNode;
}

/** Label + control + hint/error, stacked. */
export function Field({ label, htmlFor, hint, error, className, children }: FieldProps) {
  return (
    <div className={cx("flex flex-col gap-1", className)}>
      <label htmlFor={htmlFor} className="text-[12px] font-medium text-ink-soft">
        {label}
      </label>
      {children}
      {error ? (
        <p id={`${htmlFor}-error`} role="alert" className="text-[12px] text-alert">
          {error}
        </p>
      ) : hint ? (
        <p className="text-[12px] text-ink-mute">{hint}</p>
      ) : null}
    </div>
  );
}

const control =
  "h-9 w-full rounded-md border border-paper-line bg-paper-card px-2.5 text-sm text-ink " +
  "placeholder:text-ink-faint focus:border-indigo focus:outline-none focus:ring-2 focus:ring-indigo/20 " +
  "disabled:bg-paper-sunk disabled:text-ink-mute aria-[invalid=true]:border-alert";

export function TextInput({ className, ...rest }: ComponentProps<"input">) {
  return <input className={cx(control, className)} {...rest} />;
}

export function Select({ className, ...rest }: ComponentProps<"select">) {
  return <select className={cx(control, "pr-8", className)} {...rest} />;
}

export function TextArea({ className, ...rest }: ComponentProps<"textarea">) {
  return <textarea className={cx(control, "h-auto min-h-20 py-2", className)} {...rest} />;
}
