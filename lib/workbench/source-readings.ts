// Readings in the sensor's units (lib/schemas/README.md § The circuit as built): when a scenario has a
// `source`, switching points and the deadband are given in the source unit first ("12.49 V
// battery"), volts at the stage-input pin second. Pure functions over lib/sim's source map.
import type { Scenario } from "@/lib/schemas/scenario";
import { sourceMap } from "@/lib/sim/circuit";

export interface SourceTerms {
  unit: string;
  /** The quantity label ("battery", "water temperature"), or null. */
  quantity: string | null;
  /** A rising source gives a falling pin voltage (NTC at the bottom of its divider). */
  inverted: boolean;
  /** Pin volts → source units; null outside what the sensor can produce. */
  toSource(v: number): number | null;
}

/** The source terms of a scenario, or null without a `source` (or when it cannot be mapped). */
export function sourceTerms(s: Scenario): SourceTerms | null {
  if (!s.source) return null;
  try {
    const m = sourceMap(s);
    if (!m) return null;
    return { unit: m.unit, quantity: m.quantity, inverted: m.inverted, toSource: (v) => m.toSource(v) };
  } catch {
    return null;
  }
}

/** Four significant figures in plain decimals (no SI prefix: "11.40", "19.02", "0.8700"). */
export function sourceNumber(v: number): string {
  if (!Number.isFinite(v)) return "—";
  if (v === 0) return "0.000";
  const decimals = Math.max(0, Math.min(4, 3 - Math.floor(Math.log10(Math.abs(v)))));
  return v.toFixed(decimals);
}

/** "11.40 V battery", "19.02 °C water temperature"; a difference drops the quantity. */
export function formatSource(
  v: number | null | undefined,
  terms: Pick<SourceTerms, "unit" | "quantity">,
  difference = false,
): string {
  if (v == null || !Number.isFinite(v)) return "—";
  const q = !difference && terms.quantity ? ` ${terms.quantity}` : "";
  return `${sourceNumber(v)} ${terms.unit}${q}`;
}

/** Pin volts, four significant figures: "2.385 V at the pin". */
export function formatPin(v: number | null | undefined): string {
  if (v == null || !Number.isFinite(v)) return "—";
  return `${sourceNumber(v)} V at the pin`;
}

/** Thresholds as the result gives them: `metrics.source` plus the pin's volt metrics. */
export interface SourceThresholds {
  unit: string;
  upperThreshold: number | null;
  lowerThreshold: number | null;
  hysteresis: number | null;
}

export interface SourceReadingRow {
  label: string;
  value: string;
  pin: string;
}

/**
 * Source-first rows of a switching run: upper and lower switching points and the deadband in
 * the source unit (the quantity is named once, in the caption), each with the pin voltage it corresponds to. An inverted sensor's source
 * upper point is the pin's lower threshold (lib/sim/circuit sourceReadings).
 */
export function sourceRows(
  src: SourceThresholds,
  pin: { upperThreshold: number | null; lowerThreshold: number | null; hysteresis: number | null },
  terms: Pick<SourceTerms, "quantity" | "inverted">,
): SourceReadingRow[] {
  const t = { unit: src.unit, quantity: terms.quantity };
  const pinUpper = terms.inverted ? pin.lowerThreshold : pin.upperThreshold;
  const pinLower = terms.inverted ? pin.upperThreshold : pin.lowerThreshold;
  return [
    { label: "Upper switching point", value: formatSource(src.upperThreshold, t, true), pin: formatPin(pinUpper) },
    { label: "Lower switching point", value: formatSource(src.lowerThreshold, t, true), pin: formatPin(pinLower) },
    { label: "Deadband", value: formatSource(src.hysteresis, t, true), pin: formatPin(pin.hysteresis) },
  ];
}

/**
 * One sentence for the top of the readings: "Switches at 12.49 V battery rising and 11.40 V
 * battery falling (deadband 1.090 V); at the pin 2.615 V and 2.385 V." Null without thresholds.
 */
export function sourceSentence(
  src: SourceThresholds,
  pin: { upperThreshold: number | null; lowerThreshold: number | null },
  terms: Pick<SourceTerms, "quantity" | "inverted">,
): string | null {
  if (src.upperThreshold == null && src.lowerThreshold == null) return null;
  const t = { unit: src.unit, quantity: terms.quantity };
  const parts: string[] = [];
  if (src.upperThreshold != null) parts.push(`${formatSource(src.upperThreshold, t)} rising`);
  if (src.lowerThreshold != null) parts.push(`${formatSource(src.lowerThreshold, t)} falling`);
  const band = src.hysteresis != null ? ` (deadband ${formatSource(src.hysteresis, t, true)})` : "";
  const pinUpper = terms.inverted ? pin.lowerThreshold : pin.upperThreshold;
  const pinLower = terms.inverted ? pin.upperThreshold : pin.lowerThreshold;
  const pins = [pinUpper, pinLower].filter((v): v is number => v != null).map((v) => `${sourceNumber(v)} V`);
  return `Switches at ${parts.join(" and ")}${band}; at the pin ${pins.join(" and ")}.`;
}

/** A CSV column-name piece: letters, digits and underscores ("water temperature" → water_temperature, °C → degC). */
export function csvName(s: string): string {
  return (
    s
      .replace(/°/g, "deg")
      .replace(/[^A-Za-z0-9]+/g, "_")
      .replace(/^_|_$/g, "") || "source"
  );
}

/** The samples CSV's further columns: the input in source units, the filter node, the capacitor. */
export function extraSampleColumns(
  s: Scenario,
  cols: {
    source?: ArrayLike<number> | null;
    filtered?: ArrayLike<number> | null;
    capacitor?: ArrayLike<number> | null;
  },
): { name: string; values: ArrayLike<number> }[] {
  const terms = sourceTerms(s);
  return [
    ...(terms && cols.source
      ? [{ name: `${csvName(terms.quantity ?? "source")}_${csvName(terms.unit)}`, values: cols.source }]
      : []),
    ...(cols.filtered ? [{ name: "filter_node_V", values: cols.filtered }] : []),
    ...(cols.capacitor ? [{ name: "capacitor_V", values: cols.capacitor }] : []),
  ];
}
