import type { ComponentProps, ReactNode } from "react";
import { cx } from "./cx";
import { contentKeys } from "@/lib/workbench/row-ids";

/**
 * Scrolls sideways on narrow screens instead of squeezing columns; with `stack`, each row becomes
 * a block on a phone instead (first cell as its title, the others as "label … value" lines, the
 * label from each TD's `label`; app/globals.css .rw-stack).
 */
export function Table({ className, children, stack, ...rest }: ComponentProps<"table"> & { stack?: boolean }) {
  return (
    <div className="w-full overflow-x-auto">
      <table className={cx("w-full border-collapse text-left text-[13px]", stack && "rw-stack", className)} {...rest}>
        {children}
      </table>
    </div>
  );
}

export function THead({ className, ...rest }: ComponentProps<"thead">) {
  return <thead className={cx("border-b border-paper-line bg-paper-sunk/60", className)} {...rest} />;
}

export function TBody({ className, ...rest }: ComponentProps<"tbody">) {
  return <tbody className={cx("divide-y divide-paper-line", className)} {...rest} />;
}

export function TR({ className, ...rest }: ComponentProps<"tr">) {
  return <tr className={cx("align-middle", className)} {...rest} />;
}

type CellExtras = { /** Right-aligned tabular numbers in the mono face. */ numeric?: boolean };

export function TH({ numeric, className, ...rest }: ComponentProps<"th"> & CellExtras) {
  return (
    <th
      scope="col"
      className={cx(
        "px-3 py-2 text-[11px] font-semibold uppercase tracking-wide text-ink-mute whitespace-nowrap",
        numeric && "text-right",
        className,
      )}
      {...rest}
    />
  );
}

export function TD({
  numeric,
  label,
  className,
  ...rest
}: ComponentProps<"td"> &
  CellExtras & { /** The column's heading, shown beside the value when a `stack` table stacks. */ label?: string }) {
  return (
    <td
      data-label={label}
      className={cx("px-3 py-2", numeric && "text-right font-mono whitespace-nowrap", className)}
      {...rest}
    />
  );
}

export interface KeyValueRow {
  label: ReactNode;
  value: ReactNode;
  /** Small grey note after the value (e.g. the SI value or the role's position). */
  note?: ReactNode;
}

/** Two-column "label | value" table for reading parameters. */
export function KeyValueTable({ rows, caption }: { rows: KeyValueRow[]; caption?: string }) {
  const keys = contentKeys(rows, (r) => (typeof r.label === "string" ? r.label : "row"));
  return (
    <table className="w-full border-collapse text-[13px]">
      {caption && <caption className="sr-only">{caption}</caption>}
      <tbody className="divide-y divide-paper-line">
        {rows.map((r, i) => (
          <tr key={keys[i]}>
            <th scope="row" className="w-[45%] py-1.5 pr-3 text-left font-normal text-ink-mute">
              {r.label}
            </th>
            <td className="py-1.5 font-mono text-ink">
              {r.value}
              {r.note !== undefined && <span className="ml-2 font-sans text-[12px] text-ink-faint">{r.note}</span>}
            </td>
          </tr>
        ))}
      </tbody>
    </table>
  );
}
