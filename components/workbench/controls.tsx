"use client";
// Compact form pieces for the dense workbench panels (the app-wide kit in components/ui is
// sized for ordinary forms).
import type { ComponentProps, ReactNode } from "react";
import { useId } from "react";
import { cx } from "@/components/ui/cx";

export function Section({
  title,
  aside,
  children,
  className,
}: {
  title: string;
  aside?: ReactNode;
  children: ReactNode;
  className?: string;
}) {
  return (
    <div className={cx("border-t border-paper-line px-3 py-2.5 first:border-t-0", className)}>
      <div className="mb-1.5 flex items-center justify-between gap-2">
        <h3 className="text-[11.5px] font-semibold uppercase tracking-wider text-ink-mute">{title}</h3>
        {aside}
      </div>
      {children}
    </div>
  );
}

export function SelectRow({
  label,
  children,
  ...rest
}: { label: string; children: ReactNode } & ComponentProps<"select">) {
  const id = useId();
  return (
    // On a phone the label sits above the list, so the options' words are not cut off.
    <label htmlFor={id} className="grid grid-cols-1 items-center gap-x-2 py-0.5 sm:grid-cols-[7.5rem_minmax(0,1fr)]">
      <span className="text-[13px] leading-tight break-words text-ink-soft">{label}</span>
      <select
        id={id}
        {...rest}
        className="h-[26px] min-w-0 rounded border border-paper-line bg-white px-1.5 text-[13px] text-ink outline-none focus:border-indigo disabled:bg-paper-sunk"
      >
        {children}
      </select>
    </label>
  );
}

export function MiniButton({ className, ...rest }: ComponentProps<"button">) {
  return (
    <button
      type="button"
      {...rest}
      className={cx(
        "inline-flex h-6 items-center rounded border border-paper-line bg-white px-2 text-[12px] text-ink-soft hover:border-ink-faint hover:text-ink disabled:cursor-not-allowed disabled:opacity-40",
        className,
      )}
    />
  );
}

export function Tabs<T extends string>({
  tabs,
  value,
  onChange,
  label,
}: {
  tabs: { id: T; label: string }[];
  value: T;
  onChange: (t: T) => void;
  label: string;
}) {
  return (
    <div role="tablist" aria-label={label} className="flex border-b border-paper-line px-1.5">
      {tabs.map((t) => (
        <button
          key={t.id}
          role="tab"
          type="button"
          aria-selected={value === t.id}
          onClick={() => onChange(t.id)}
          className={cx(
            "-mb-px border-b-2 px-2.5 py-2 text-[13px] font-medium",
            value === t.id ? "border-copper text-ink" : "border-transparent text-ink-mute hover:text-ink-soft",
          )}
        >
          {t.label}
        </button>
      ))}
    </div>
  );
}
