// Messages in the words of the screen: a zod issue from the scenario contract names its field by
// code path ("opamp.outputHeadroomHigh", "stage.rReference"); the Workbench shows the label of
// that field instead ("Headroom V+", "R reference"), and writes other code names inside the
// message the same way. Pure, no React; the panels take their labels from these tables too.
import { formatQuantity } from "../design/notation";
import { STAGE_KIND_LABEL, STAGE_ROLE_LABEL } from "./stage-labels";

/** Labels of the op-amp parameter fields (Stage tab, "Part"). */
export const OPAMP_LABEL = {
  openLoopGain: "A0",
  gainBandwidth: "GBW",
  slewRate: "Slew rate ↑",
  slewRateFall: "Slew rate ↓",
  outputHeadroomHigh: "Headroom V+",
  outputHeadroomLow: "Headroom V−",
  inputOffset: "Offset",
  propagationDelay: "Delay",
} as const;

/** Labels of an input component's fields (Signal tab). */
export const INPUT_FIELD_LABEL: Record<string, string> = {
  level: "Level",
  amplitude: "Amplitude (peak)",
  frequency: "Frequency",
  offset: "Offset",
  phase: "Phase (°)",
  from: "From",
  to: "To",
  start: "Starts at",
  duration: "Lasting",
  low: "Low",
  high: "High",
  period: "Period",
  duty: "Duty (0…1)",
  rise: "Rise",
  fall: "Fall",
  delay: "Delay",
  points: "Points",
  samples: "Capture samples",
};

/** Scenario fields by dotted path, as the Stage and Signal tabs label them. */
export const SCENARIO_LABEL: Record<string, string> = {
  "supply.positive": "V+",
  "supply.negative": "V−",
  "supply.tolerance": "Supply tolerance",
  ...Object.fromEntries(Object.entries(OPAMP_LABEL).map(([k, v]) => [`opamp.${k}`, v])),
  ...Object.fromEntries(Object.entries(STAGE_ROLE_LABEL).map(([k, v]) => [`stage.${k}`, v.name])),
  "stage.kind": "Kind",
  "stage.inputAt": "Input on",
  "stage.reference": "Reference",
  "stage.referenceDivider": "Reference from",
  "stage.referenceDivider.rTop": "Divider top",
  "stage.referenceDivider.rBottom": "Divider bottom",
  "stage.referenceDivider.top": "Divider top end",
  "stage.referenceDivider.bottom": "Divider bottom end",
  "input.components": "Waveform components",
  "input.noise.rms": "Noise rms",
  "input.noise.bandwidth": "Noise bandwidth",
  "input.noise.seed": "Noise seed",
  "run.duration": "Duration",
  "run.points": "Output points",
  "run.initialOutput": "Output starts",
  "run.holdOff": "Chatter hold-off",
  "run.solver": "Solver",
  filter: "RC filter",
  source: "Watched through",
  "source.sensor": "Watched through",
  "source.quantity": "Quantity",
  "source.unit": "Unit",
  "source.sensor.rTop": "Divider top",
  "source.sensor.rBottom": "Divider bottom",
  "source.sensor.rFixed": "Fixed resistor",
  "source.sensor.model.r25": "NTC at 25 °C",
  "source.sensor.model.beta": "NTC Beta",
  "source.sensor.voltsPerUnit": "Volts per unit",
  "source.sensor.offset": "Offset",
};

/** The screen label of a scenario path, or null when the path names no field on screen. */
export function scenarioLabel(path: readonly PropertyKey[]): string | null {
  const parts = path.map(String);
  if (parts[0] === "input" && parts[1] === "components" && parts.length >= 3 && /^\d+$/.test(parts[2])) {
    const n = Number(parts[2]) + 1;
    const field = parts[3] ? INPUT_FIELD_LABEL[parts[3]] : undefined;
    return field ? `Component ${n} ${field}` : `Component ${n}`;
  }
  for (let k = parts.length; k > 0; k--) {
    const label = SCENARIO_LABEL[parts.slice(0, k).join(".")];
    if (label) return label;
  }
  return null;
}

export const escapeRegExp = (s: string) => s.replace(/[.*+?^${}()|[\]\\]/g, "\\$&");

/** Code names → quoted labels: dotted paths first (longest first), then bare camelCase keys, then stage kinds. */
const REPLACEMENTS: [RegExp, string][] = (() => {
  const out: [RegExp, string][] = [];
  const dotted = Object.keys(SCENARIO_LABEL)
    .filter((k) => k.includes("."))
    .sort((a, b) => b.length - a.length);
  for (const k of dotted)
    out.push([new RegExp(`(?<![\\w.])${escapeRegExp(k)}(?![\\w])`, "g"), `“${SCENARIO_LABEL[k]}”`]);
  const bare = new Map<string, string>();
  for (const [k, v] of Object.entries(SCENARIO_LABEL)) {
    const last = k.split(".").pop()!;
    // Only camelCase keys: "reference" or "duration" are also plain English words.
    if (/[a-z][A-Z]/.test(last) && !bare.has(last)) bare.set(last, v);
  }
  for (const [k, v] of bare) out.push([new RegExp(`(?<![\\w.“])${escapeRegExp(k)}(?![\\w])`, "g"), `“${v}”`]);
  for (const [kind, label] of Object.entries(STAGE_KIND_LABEL))
    out.push([new RegExp(`(?<![\\w-])${escapeRegExp(kind)}(?![\\w-])`, "g"), label.toLowerCase()]);
  return out;
})();

export function inScreenWords(message: string): string {
  let text = message;
  for (const [re, label] of REPLACEMENTS) text = text.replace(re, label);
  return text;
}

export interface IssueLike {
  message: string;
  path?: readonly PropertyKey[];
}

/**
 * "Headroom V+: “Headroom V+” + “Headroom V−” (6 V) must be smaller…" would say the label twice;
 * a message that starts with its own field's label goes without the prefix.
 */
export function scenarioIssueText(issue: IssueLike): string {
  const label = issue.path?.length ? scenarioLabel(issue.path) : null;
  const text = inScreenWords(issue.message);
  if (!label) return text;
  if (text.startsWith(`“${label}”`)) return text;
  return `${label}: ${text}`;
}

export function scenarioIssuesText(issues: readonly IssueLike[], max = 5): string {
  const lines = issues.slice(0, max).map(scenarioIssueText);
  const more = issues.length - lines.length;
  return lines.join("; ") + (more > 0 ? ` (and ${more} more)` : "");
}

/**
 * A 400 answer's `{ message, issues: [{ path, message }] }` in screen words; null when the body
 * carries no issues. Paths inside a request body start with "scenario" (`PUT /api/scenarios/:id`).
 */
export function apiIssuesText(body: unknown): string | null {
  if (!body || typeof body !== "object") return null;
  const { message, issues } = body as { message?: unknown; issues?: unknown };
  if (!Array.isArray(issues) || issues.length === 0) return null;
  const list: IssueLike[] = issues.map((i) => {
    if (typeof i === "string") return { message: i };
    const o = (i ?? {}) as { path?: unknown; message?: unknown };
    const path = Array.isArray(o.path) ? (o.path as PropertyKey[]) : [];
    return { message: String(o.message ?? ""), path: path[0] === "scenario" ? path.slice(1) : path };
  });
  const head = typeof message === "string" && message ? inScreenWords(message) : "Refused";
  return `${head}: ${scenarioIssuesText(list)}`;
}

/** How a form field is named on screen, and the unit its value is typed in when it is not SI. */
export interface FieldWords {
  /** The field's name in the contract ("slewRate", "email"). */
  code: string;
  /** The label on the screen ("Slew rate (rising)", "E-mail"). */
  label: string;
  /** Typed in `unit`, stored as value × factor in SI (V/µs ↔ V/s). */
  scale?: { unit: string; factor: number };
}

/**
 * A schema message for one form field, said with the field's screen label: the code name at the
 * start ("slewRate (V/s) must be at most 1000000000000", "email must be an e-mail address") is
 * replaced by the label, and a limit is restated in the unit the field is typed in ("at most
 * 1000000 V/µs"). Used by forms whose messages come from lib/schemas (parts, invitations).
 */
export function fieldIssueText(message: string, field: FieldWords): string {
  const head = new RegExp(`^${escapeRegExp(field.code)}(?: \\(([^)]*)\\))?\\s+`);
  const m = head.exec(message);
  if (!m) return `${field.label}: ${inScreenWords(message)}`;
  let rest = message.slice(m[0].length);
  const siUnit = m[1];
  if (field.scale) {
    const { unit, factor } = field.scale;
    rest = rest.replace(
      /\b(at (?:most|least)|above|below) (-?\d+(?:\.\d+)?(?:e[+-]?\d+)?)(?: ?[^\s,;.]*\/[^\s,;.]*)?/,
      (_all, words: string, n: string) =>
        `${words} ${Number((Number(n) / factor).toPrecision(6)).toLocaleString("en")} ${unit}`,
    );
  } else if (siUnit) {
    rest = rest.replace(
      /\b(at (?:most|least)) (-?\d+(?:\.\d+)?(?:e[+-]?\d+)?)$/,
      (_all, words: string, n: string) => `${words} ${formatQuantity(Number(n), siUnit)}`,
    );
  }
  return `${field.label} ${rest}`;
}
