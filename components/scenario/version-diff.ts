// Which fields of a railwise.scenario/1 document changed between two versions, old → new, in
// the UI's units and notation (engineering prefixes, RKM codes beside resistances).
import { formatQuantity, formatRkm } from "@/lib/design/notation";
import { STAGE_ROLE_LABEL, type StageRole } from "@/lib/workbench/stage-labels";

export interface FieldChange {
  /** Dotted path in the document, e.g. "stage.rFeedback", "input.components.0.amplitude". */
  path: string;
  /** The field in words: "Stage · feedback resistor". */
  label: string;
  before: string;
  after: string;
  kind: "changed" | "added" | "removed";
}

const UNIT_OF: Record<string, string> = {
  positive: "V",
  negative: "V",
  outputHeadroomHigh: "V",
  outputHeadroomLow: "V",
  inputOffset: "V",
  reference: "V",
  level: "V",
  amplitude: "V",
  offset: "V",
  from: "V",
  to: "V",
  low: "V",
  high: "V",
  rms: "V",
  supplyVoltage: "V",
  gainBandwidth: "Hz",
  frequency: "Hz",
  bandwidth: "Hz",
  slewRate: "V/s",
  slewRateFall: "V/s",
  duration: "s",
  start: "s",
  period: "s",
  delay: "s",
  rise: "s",
  fall: "s",
  propagationDelay: "s",
  openLoopGain: "V/V",
  phase: "°",
  c: "F",
  cTiming: "F",
};
const PERCENT = new Set(["duty", "tolerance", "resistor", "capacitor", "ntcR25", "ntcBeta"]);
const PLAIN = new Set(["points", "seed", "version"]);

const SECTION: Record<string, string> = {
  supply: "Supplies",
  opamp: "Part profile",
  stage: "Stage",
  input: "Input signal",
  run: "Run",
  source: "Source",
  filter: "Filter",
  output: "Output",
  tolerances: "Tolerances",
  spec: "Spec",
};

function isResistance(key: string): boolean {
  return /^r[A-Z]/.test(key) || key === "r" || key === "pullUp" || key === "r25" || key === "rFixed";
}

/** One value in the UI's notation. */
export function formatField(key: string, value: unknown): string {
  if (value === undefined) return "—";
  if (value === null) return "none";
  if (typeof value === "number") {
    if (PLAIN.has(key)) return value.toLocaleString("en");
    if (PERCENT.has(key)) return `${Number((value * 100).toPrecision(4))} %`;
    if (isResistance(key) && value > 0) return `${formatQuantity(value, "Ω", 4)} (${formatRkm(value)})`;
    if (key === "slewRate" || key === "slewRateFall") return `${Number((value / 1e6).toPrecision(4))} V/µs`;
    const unit = UNIT_OF[key];
    return unit ? formatQuantity(value, unit, 4) : String(Number(value.toPrecision(6)));
  }
  if (typeof value === "string") return value;
  if (typeof value === "boolean") return value ? "yes" : "no";
  if (Array.isArray(value)) return `${value.length} point${value.length === 1 ? "" : "s"}`;
  return JSON.stringify(value);
}

function labelOf(path: string[]): string {
  const [top, ...rest] = path;
  const section = SECTION[top] ?? top;
  const words = rest.map((k, i) => {
    if (/^\d+$/.test(k)) return `component ${Number(k) + 1}`;
    if (top === "stage" && i === 0 && k in STAGE_ROLE_LABEL) return STAGE_ROLE_LABEL[k as StageRole].name;
    return k.replace(/([A-Z])/g, " $1").toLowerCase();
  });
  return [section, ...words].join(" · ");
}

// Arrays of numbers/pairs (pwl points, capture samples) compare as one value.
const isLeafArray = (v: unknown) => Array.isArray(v) && v.every((x) => typeof x === "number" || Array.isArray(x));

function walk(a: unknown, b: unknown, path: string[], out: FieldChange[]): void {
  const key = path[path.length - 1] ?? "";
  const objA = a !== null && typeof a === "object" && !isLeafArray(a);
  const objB = b !== null && typeof b === "object" && !isLeafArray(b);
  if (objA || objB) {
    const ra = (objA ? a : {}) as Record<string, unknown>;
    const rb = (objB ? b : {}) as Record<string, unknown>;
    const keys = [...new Set([...Object.keys(ra), ...Object.keys(rb)])];
    for (const k of keys) walk(ra[k], rb[k], [...path, k], out);
    if (!objA && a !== undefined)
      out.push({
        path: path.join("."),
        label: labelOf(path),
        before: formatField(key, a),
        after: "(section)",
        kind: "changed",
      });
    return;
  }
  if (JSON.stringify(a) === JSON.stringify(b)) return;
  if (path[0] === "schema") return;
  out.push({
    path: path.join("."),
    label: labelOf(path),
    before: formatField(key, a),
    after: formatField(key, b),
    kind: a === undefined ? "added" : b === undefined ? "removed" : "changed",
  });
}

/** Fields that differ between two scenario documents (the name included), in document order. */
export function diffScenarios(before: unknown, after: unknown): FieldChange[] {
  const out: FieldChange[] = [];
  walk(before ?? {}, after ?? {}, [], out);
  return out.map((c) => (c.path === "name" ? { ...c, label: "Name" } : c));
}
