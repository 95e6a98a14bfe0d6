"use client";

import { useEffect, useId, useRef, useState, type FormEvent, type ReactNode } from "react";
import { Button } from "./button";

export interface DialogProps {
  open: boolean;
  onClose: () => void;
  title: ReactNode;
  description?: ReactNode;
  /** Buttons row at the bottom, right-aligned. */
  footer?: ReactNode;
  children?: ReactNode;
  /** Width cap; forms want "md", confirmations "sm". */
  size?: "sm" | "md";
}

/**
 * Modal on the native <dialog> element: focus trap, Escape and the top layer come from the
 * browser, so there is no portal or focus-lock code to maintain.
 */
export function Dialog({ open, onClose, title, description, footer, children, size = "md" }: DialogProps) {
  const ref = useRef<HTMLDialogElement>(null);
  const titleId = useId();

  useEffect(() => {
    const el = ref.current;
    if (!el) return;
    if (open && !el.open) el.showModal();
    if (!open && el.open) el.close();
  }, [open]);

  return (
    // biome-ignore lint/a11y/useKeyWithClickEvents: a backdrop click is the mouse's way out; the keyboard's is Escape (the cancel event)
    <dialog
      ref={ref}
      aria-labelledby={titleId}
      onCancel={(e) => {
        e.preventDefault();
        onClose();
      }}
      onClick={(e) => {
        // A click on the backdrop lands on the <dialog> itself.
        if (e.target === ref.current) onClose();
      }}
      className={
        "m-auto w-[calc(100%-2rem)] rounded-lg border border-paper-line bg-paper-card p-0 text-ink shadow-xl " +
        "backdrop:bg-ink/30 " +
        (size === "sm" ? "max-w-sm" : "max-w-lg")
      }
    >
      {open && (
        <div className="flex flex-col">
          <div className="border-b border-paper-line px-5 py-3">
            <h2 id={titleId} className="text-base font-semibold">
              {title}
            </h2>
            {description && <p className="mt-0.5 text-[13px] text-ink-mute">{description}</p>}
          </div>
          {children && <div className="px-5 py-4">{children}</div>}
          {footer && (
            <div className="flex justify-end gap-2 border-t border-paper-line bg-paper/60 px-5 py-3">{footer}</div>
          )}
        </div>
      )}
    </dialog>
  );
}

export interface FormDialogProps extends Omit<DialogProps, "footer"> {
  submitLabel: string;
  /** Label while the submit runs (default "Working…"). */
  busyLabel?: string;
  cancelLabel?: string;
  /** "danger" for destructive confirmations. */
  tone?: "primary" | "danger";
  /**
   * Runs on submit. Throw (e.g. the HttpError from sendJson, or an Error naming the field)
   * to keep the dialog open with the message shown; resolve to let the caller close it.
   */
  onSubmit: () => Promise<void>;
}

/** A Dialog wrapping a form: Cancel + submit footer, busy state, and one place for the error message. */
export function FormDialog({
  submitLabel,
  busyLabel = "Working…",
  cancelLabel = "Cancel",
  tone = "primary",
  onSubmit,
  children,
  ...dialog
}: FormDialogProps) {
  const formId = useId();
  const [busy, setBusy] = useState(false);
  const [error, setError] = useState<string | null>(null);

  useEffect(() => {
    if (dialog.open) setError(null);
  }, [dialog.open]);

  async function submit(e: FormEvent) {
    e.preventDefault();
    setBusy(true);
    setError(null);
    try {
      await onSubmit();
    } catch (err) {
      setError(err instanceof Error ? err.message : String(err));
    } finally {
      setBusy(false);
    }
  }

  return (
    <Dialog
      {...dialog}
      footer={
        <>
          <Button onClick={dialog.onClose}>{cancelLabel}</Button>
          <Button variant={tone} type="submit" form={formId} disabled={busy}>
            {busy ? busyLabel : submitLabel}
          </Button>
        </>
      }
    >
      <form
        id={formId}
        onSubmit={submit}
        onChange={() => error && setError(null)}
        noValidate
        className="flex flex-col gap-3"
      >
        {children}
        {error && (
          <p role="alert" className="rounded-md border border-alert/30 bg-alert-soft px-3 py-2 text-[13px] text-alert">
            {error}
          </p>
        )}
      </form>
    </Dialog>
  );
}
