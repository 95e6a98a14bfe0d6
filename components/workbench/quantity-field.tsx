"use client";
// A value typed the way engineers write it — 4.7k, 100n, 2.2M, 10µ or RKM 4K7, 2R2 — with the
// parsed value shown beside it. The text is local; only a value that parses reaches the store.
import { useEffect, useId, useRef, useState } from "react";
import { formatQuantity, parseQuantity, quantityProblem } from "@/lib/design/notation";
import { useReportFieldProblem } from "./field-problems";

export interface QuantityFieldProps {
  label: string;
  value: number | undefined;
  unit: string;
  onCommit: (v: number) => void;
  hint?: string;
  /** Extra acceptance rule; return a message to reject. */
  validate?: (v: number) => string | null;
  disabled?: boolean;
  name?: string;
  /** Plain number fields (seed, points) skip engineering formatting. */
  plain?: boolean;
  digits?: number;
  /** Optional parameters: an empty field clears the value. */
  onClear?: () => void;
  /** Shown while the optional field is empty. */
  placeholder?: string;
  /** Friendlier readout than SI with a prefix (e.g. slew rate in V/µs). */
  display?: (v: number) => string;
  /** The field's name in a "fix these fields" list when the label alone is ambiguous ("Component 2 Level"). */
  listLabel?: string;
}

function show(v: number | undefined, plain: boolean, digits: number): string {
  if (v === undefined) return "";
  if (plain) return String(v);
  return formatQuantity(v, "", digits).replace(" ", "");
}

export function QuantityField({
  label,
  value,
  unit,
  onCommit,
  hint,
  validate,
  disabled,
  name,
  plain = false,
  digits = 4,
  onClear,
  placeholder,
  display,
  listLabel,
}: QuantityFieldProps) {
  const id = useId();
  const [text, setText] = useState(() => show(value, plain, digits));
  const committed = useRef<number | undefined>(value);
  /** Typed text that parsed but broke the rule; it commits once the rule accepts it (another field moved). */
  const pending = useRef(false);

  // An outside change (design applied, version restored) replaces what the field shows.
  useEffect(() => {
    if (value !== committed.current) {
      committed.current = value;
      pending.current = false;
      setText(show(value, plain, digits));
    }
  }, [value, plain, digits]);

  const parsed = plain ? (text.trim() === "" ? null : Number(text)) : parseQuantity(text);
  const valid = parsed !== null && Number.isFinite(parsed);
  const empty = text.trim() === "";
  const problem =
    empty && onClear
      ? null
      : !valid
        ? empty
          ? "required"
          : plain
            ? "not a value"
            : (quantityProblem(text) ?? "not a value")
        : validate
          ? validate(parsed)
          : null;
  // Run, Save and Apply refuse while this is set (see field-problems.tsx).
  useReportFieldProblem(id, listLabel ?? label, disabled ? null : problem, id);
  useEffect(() => {
    if (pending.current && !problem && valid && !disabled) {
      pending.current = false;
      committed.current = parsed as number;
      onCommit(parsed as number);
    }
  });

  return (
    <label htmlFor={id} className="grid grid-cols-[7.5rem_minmax(0,1fr)] items-center gap-x-2 py-0.5">
      <span
        className="text-[13px] leading-tight break-words text-ink-soft"
        title={hint ? `${label}: ${hint}` : undefined}
      >
        {label}
      </span>
      <span className="flex min-w-0 flex-wrap items-center gap-x-2">
        <input
          id={id}
          name={name ?? label}
          data-field={name ?? label}
          type="text"
          inputMode="decimal"
          spellCheck={false}
          autoComplete="off"
          disabled={disabled}
          value={text}
          placeholder={placeholder}
          aria-invalid={problem ? true : undefined}
          onChange={(e) => {
            const t = e.target.value;
            setText(t);
            if (t.trim() === "" && onClear) {
              committed.current = undefined;
              onClear();
              return;
            }
            const v = plain ? (t.trim() === "" ? null : Number(t)) : parseQuantity(t);
            const ok = v !== null && Number.isFinite(v);
            pending.current = ok && !!validate?.(v);
            if (ok && !pending.current) {
              committed.current = v;
              onCommit(v);
            }
          }}
          onBlur={() => {
            if (!problem) setText(show(committed.current, plain, digits));
          }}
          className={`w-[5.5rem] shrink-0 rounded border bg-white px-1.5 py-0.5 font-mono text-[13px] text-ink outline-none focus:border-indigo disabled:bg-paper-sunk disabled:text-ink-mute ${
            problem ? "border-alert bg-alert-soft/40" : "border-paper-line"
          }`}
        />
        <span
          className={`min-w-0 font-mono text-[12px] ${problem ? "text-alert" : "whitespace-nowrap text-ink-mute"}`}
          data-parsed={name ?? label}
          aria-live="polite"
        >
          {problem
            ? problem
            : empty
              ? placeholder
                ? "not set"
                : ""
              : plain
                ? unit
                  ? `${parsed} ${unit}`
                  : ""
                : `= ${display ? display(parsed as number) : formatQuantity(parsed as number, unit, 4)}`}
        </span>
      </span>
    </label>
  );
}
