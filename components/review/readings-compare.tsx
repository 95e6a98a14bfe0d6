// Readings of two runs side by side; rows that differ are highlighted (Δ shown).
import { formatQuantity } from "@/lib/design/notation";
import type { ResultJson } from "@/lib/sim/types";
import { Table, TBody, TD, TH, THead, TR } from "@/components/ui/table";

export interface ReadingDef {
  key: string;
  label: string;
  get: (r: ResultJson) => number | null | undefined;
  format: (v: number) => string;
}

const q = (unit: string) => (v: number) => formatQuantity(v, unit, 4);
const pct = (v: number) => `${Number((v * 100).toPrecision(4))} %`;
const count = (v: number) => v.toLocaleString("en");

export const READINGS: ReadingDef[] = [
  { key: "upperThreshold", label: "Upper switching point", get: (r) => r.metrics.upperThreshold, format: q("V") },
  { key: "lowerThreshold", label: "Lower switching point", get: (r) => r.metrics.lowerThreshold, format: q("V") },
  { key: "hysteresis", label: "Deadband", get: (r) => r.metrics.hysteresis, format: q("V") },
  { key: "transitions", label: "Output transitions", get: (r) => r.metrics.transitions, format: count },
  { key: "chatter", label: "Chatter (extra transitions)", get: (r) => r.metrics.chatter, format: count },
  { key: "period", label: "Period", get: (r) => r.metrics.period, format: q("s") },
  { key: "dutyCycle", label: "Duty cycle", get: (r) => r.metrics.dutyCycle, format: pct },
  {
    key: "gain",
    label: "Gain (linear region)",
    get: (r) => r.metrics.amplifier?.gain ?? null,
    format: (v) => `${Number(v.toPrecision(4))} V/V`,
  },
  { key: "clippedFraction", label: "Time clipped at a limit", get: (r) => r.metrics.clippedFraction, format: pct },
  {
    key: "maxSlewRate",
    label: "Fastest output edge",
    get: (r) => r.metrics.maxSlewRate,
    format: (v) => `${Number((v / 1e6).toPrecision(4))} V/µs`,
  },
  { key: "railHigh", label: "Output high level", get: (r) => r.rails.high, format: q("V") },
  { key: "railLow", label: "Output low level", get: (r) => r.rails.low, format: q("V") },
];

/** Two readings differ when one is missing or they are apart by more than 0.01 % of the larger. */
export function readingsDiffer(a: number | null | undefined, b: number | null | undefined): boolean {
  const na = a == null || !Number.isFinite(a);
  const nb = b == null || !Number.isFinite(b);
  if (na || nb) return na !== nb;
  return Math.abs(a - b) > 1e-4 * Math.max(Math.abs(a), Math.abs(b), 1e-12);
}

export function ReadingsCompare({
  a,
  b,
  aTitle,
  bTitle,
}: {
  a: ResultJson;
  b: ResultJson;
  aTitle: string;
  bTitle: string;
}) {
  const rows = READINGS.filter((d) => d.get(a) != null || d.get(b) != null);
  return (
    <Table aria-label="Readings side by side" data-testid="readings-compare">
      <THead>
        <TR>
          <TH>Reading</TH>
          <TH numeric>{aTitle}</TH>
          <TH numeric>{bTitle}</TH>
          <TH numeric>Difference</TH>
        </TR>
      </THead>
      <TBody>
        {rows.map((d) => {
          const va = d.get(a);
          const vb = d.get(b);
          const differs = readingsDiffer(va, vb);
          const delta = va != null && vb != null && differs ? d.format(va - vb) : differs ? "one run only" : "same";
          return (
            <TR
              key={d.key}
              data-differs={differs ? "yes" : "no"}
              className={differs ? "bg-caution-soft/70" : undefined}
            >
              <TD className={differs ? "font-medium text-ink" : "text-ink-soft"}>{d.label}</TD>
              <TD numeric className="font-mono text-[12px]">
                {va != null ? d.format(va) : "—"}
              </TD>
              <TD numeric className="font-mono text-[12px]">
                {vb != null ? d.format(vb) : "—"}
              </TD>
              <TD
                numeric
                className={`font-mono text-[12px] ${differs ? "font-semibold text-caution" : "text-ink-faint"}`}
              >
                {delta}
              </TD>
            </TR>
          );
        })}
      </TBody>
    </Table>
  );
}
