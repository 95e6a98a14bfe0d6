// What the stage should do on paper (designed thresholds, gain, period) and how a run compares:
// checks with pass/fail and warnings in plain words. Pure functions, shared by the Readings
// panel, the run page and the printable summary.
import type { Scenario } from "@/lib/schemas/scenario";
import type { SimEvent, SimMetrics } from "@/lib/sim/types";
import { conditionsOf, oscillatorSwitchingPoints, outputSwing, stageFigures } from "@/lib/design/analysis";
import { KIND_INFO } from "./stage-kinds";
import { sourceTerms } from "./source-readings";

export interface Rails {
  high: number;
  low: number;
}

export interface Designed {
  upperThreshold: number | null;
  lowerThreshold: number | null;
  gain: number | null;
  period: number | null;
  /** Oscillator thresholds are at the capacitor node, not the (absent) input. */
  oscillator: boolean;
}

/** Output limits from the part profile: Voh = V+ − headroomHigh, Vol = V− + headroomLow (DEVELOPERS.md § Behavioural op-amp model). */
export function railsOf(s: Scenario): Rails {
  return outputSwing(s.opamp, s.supply);
}

/**
 * Input-referred switching points, gain and period from the network and the output limits,
 * by lib/design's closed forms (tests/REFERENCES.md: Schmitt-trigger equations, relaxation-oscillator
 * timing, finite-A closed-loop gain). The oscillator's points are those of its capacitor node.
 */
export function designedFigures(s: Scenario): Designed {
  const c = conditionsOf(s.opamp, s.supply);
  const f = stageFigures(s.stage, c);
  if (s.stage.kind === "relaxation-oscillator") {
    const p = oscillatorSwitchingPoints(s.stage, c);
    return {
      upperThreshold: p.upper,
      lowerThreshold: p.lower,
      gain: null,
      period: f.frequency ? 1 / f.frequency : null,
      oscillator: true,
    };
  }
  return {
    upperThreshold: f.upperThreshold,
    lowerThreshold: f.lowerThreshold,
    gain: f.gain,
    period: null,
    oscillator: false,
  };
}

/** The switching points worth drawing on the plots (none for oscillators: no input to compare). */
export function designedMarks(s: Scenario): { upper: number | null; lower: number | null } | null {
  const d = designedFigures(s);
  return d.oscillator ? null : { upper: d.upperThreshold, lower: d.lowerThreshold };
}

/**
 * Small-signal gain measured from the run: least-squares slope of output against input over
 * the samples where the output is clear of both limits (2 % of the swing) — the linear region.
 */
export function measuredGain(input: ArrayLike<number>, output: ArrayLike<number>, rails: Rails): number | null {
  const margin = 0.02 * (rails.high - rails.low);
  let n = 0;
  let sx = 0;
  let sy = 0;
  let sxx = 0;
  let sxy = 0;
  for (let i = 0; i < input.length; i++) {
    const y = output[i];
    if (y >= rails.high - margin || y <= rails.low + margin) continue;
    const x = input[i];
    n++;
    sx += x;
    sy += y;
    sxx += x * x;
    sxy += x * y;
  }
  if (n < 8) return null;
  const den = n * sxx - sx * sx;
  if (!(Math.abs(den) > 1e-30 * n * n)) return null;
  return (n * sxy - sx * sy) / den;
}

/** lib/schemas/README.md § Result JSON (additions): an amplifier's readings in place of switching metrics. */
export interface AmplifierReadings {
  gain: number | null;
  /** Input level at which the output first reaches Voh / Vol (null if it never does). */
  clipInputHigh: number | null;
  clipInputLow: number | null;
}

/** Metrics as the core reports them; amplifier kinds answer null for the switching ones. */
export type MetricsIn = Omit<SimMetrics, "transitions" | "chatter"> & {
  transitions: number | null;
  chatter: number | null;
  amplifier?: AmplifierReadings | null;
};

/** True for the two amplifier kinds (they do not switch: no edges, no switching rows). */
export function isAmplifierKind(kind: Scenario["stage"]["kind"]): boolean {
  return !KIND_INFO[kind].switching && kind !== "relaxation-oscillator";
}

/**
 * An amplifier's readings: the core's `metrics.amplifier` when present; otherwise the gain
 * measured here and the first input level at which the output comes within 0.1 % of the swing
 * of each limit (the same definition, taken from the samples).
 */
export function amplifierReadings(
  metrics: MetricsIn,
  input: ArrayLike<number> | null,
  output: ArrayLike<number> | null,
  rails: Rails,
): AmplifierReadings {
  if (metrics.amplifier) return metrics.amplifier;
  if (!input || !output) return { gain: null, clipInputHigh: null, clipInputLow: null };
  const tol = 1e-3 * (rails.high - rails.low);
  let clipInputHigh: number | null = null;
  let clipInputLow: number | null = null;
  for (let i = 0; i < output.length && (clipInputHigh === null || clipInputLow === null); i++) {
    if (clipInputHigh === null && output[i] >= rails.high - tol) clipInputHigh = input[i];
    if (clipInputLow === null && output[i] <= rails.low + tol) clipInputLow = input[i];
  }
  return { gain: measuredGain(input, output, rails), clipInputHigh, clipInputLow };
}

/** The oscillator's timing-capacitor samples (v−), whichever shape the result carries them in. */
export function capacitorOf(result: unknown): Float64Array | null {
  const r = result as { capacitor?: unknown; samples?: { capacitor?: unknown } } | null;
  const c = r?.capacitor ?? r?.samples?.capacitor;
  if (c instanceof Float64Array) return c;
  if (Array.isArray(c)) return Float64Array.from(c as number[]);
  return null;
}

export interface Check {
  label: string;
  designed: number;
  measured: number | null;
  unit: string;
  tolerance: number;
  pass: boolean | null;
  /** The same figure in the source unit, when the scenario has a `source` (shown first). */
  source?: {
    designed: number | null;
    measured: number | null;
    unit: string;
    quantity: string | null;
    difference: boolean;
  };
}

/**
 * Measured against designed. Tolerance: 1 % of the designed value or 0.2 % of the supply span,
 * whichever is larger (common practice, no source) — widened by 3 × noise rms for thresholds,
 * since noise moves each crossing.
 */
export function buildChecks(
  s: Scenario,
  metrics: MetricsIn | SimMetrics,
  gain: number | null,
  options: { chatterLimit?: number } = {},
): Check[] {
  const d = designedFigures(s);
  const span = s.supply.positive - s.supply.negative;
  const noise = s.input.noise?.rms ?? 0;
  const out: Check[] = [];
  const add = (label: string, designed: number | null, measured: number | null, unit: string, extra = 0) => {
    if (designed === null || !Number.isFinite(designed)) return;
    const tolerance = Math.max(0.01 * Math.abs(designed), 0.002 * span) + extra;
    const pass = measured === null ? null : Math.abs(measured - designed) <= tolerance;
    out.push({ label, designed, measured, unit, tolerance, pass });
  };
  if (d.oscillator) {
    d.upperThreshold = null;
    d.lowerThreshold = null;
  }
  // With a source the points are named in source terms: an inverted sensor's upper point is
  // the pin's lower threshold (lib/sim/circuit sourceReadings). Pass/fail stays on pin volts.
  const terms = d.oscillator ? null : sourceTerms(s);
  const swap = terms?.inverted ?? false;
  const pinUpper = swap ? d.lowerThreshold : d.upperThreshold;
  const pinLower = swap ? d.upperThreshold : d.lowerThreshold;
  const conv = (v: number | null) => (terms && v !== null ? terms.toSource(v) : null);
  const withSource = (designed: number | null, measured: number | null, difference = false) => {
    const c = out[out.length - 1];
    if (!terms || !c) return;
    c.source = { designed, measured, unit: terms.unit, quantity: terms.quantity, difference };
  };
  const n0 = out.length;
  add("Upper switching point", pinUpper, swap ? metrics.lowerThreshold : metrics.upperThreshold, "V", 3 * noise);
  if (out.length > n0) withSource(conv(pinUpper), conv(swap ? metrics.lowerThreshold : metrics.upperThreshold));
  const n1 = out.length;
  add("Lower switching point", pinLower, swap ? metrics.upperThreshold : metrics.lowerThreshold, "V", 3 * noise);
  if (out.length > n1) withSource(conv(pinLower), conv(swap ? metrics.upperThreshold : metrics.lowerThreshold));
  if (d.upperThreshold !== null && d.lowerThreshold !== null && d.upperThreshold !== d.lowerThreshold) {
    add("Deadband", d.upperThreshold - d.lowerThreshold, metrics.hysteresis, "V", 6 * noise);
    const su = conv(pinUpper);
    const sl = conv(pinLower);
    const mu = conv(swap ? metrics.lowerThreshold : metrics.upperThreshold);
    const ml = conv(swap ? metrics.upperThreshold : metrics.lowerThreshold);
    withSource(su !== null && sl !== null ? su - sl : null, mu !== null && ml !== null ? mu - ml : null, true);
  }
  // A switching stage must not add edges: chatter (edges within the hold-off of the previous
  // one) at most the limit the user sets, 0 by default (common practice, no source).
  if (KIND_INFO[s.stage.kind].switching) {
    const limit = Math.max(0, Math.floor(options.chatterLimit ?? 0));
    const measured = metrics.chatter ?? null;
    out.push({
      label: "No extra transitions",
      designed: limit,
      measured,
      unit: "edges",
      tolerance: 0,
      pass: measured === null ? null : measured <= limit,
    });
  }
  if (d.gain !== null) {
    const tolerance = 0.01 * Math.abs(d.gain);
    out.push({
      label: "Gain",
      designed: d.gain,
      measured: gain,
      unit: "V/V",
      tolerance,
      pass: gain === null ? null : Math.abs(gain - d.gain) <= tolerance,
    });
  }
  if (d.period !== null) {
    const tolerance = 0.02 * d.period;
    out.push({
      label: "Period",
      designed: d.period,
      measured: metrics.period,
      unit: "s",
      tolerance,
      pass: metrics.period === null ? null : Math.abs(metrics.period - d.period) <= tolerance,
    });
  }
  return out;
}

export type WarningLevel = "alert" | "caution" | "note";
export interface Warning {
  level: WarningLevel;
  text: string;
}

export interface WarningInputs {
  scenario: Scenario;
  metrics: MetricsIn | SimMetrics;
  rails: Rails;
  inputMin: number;
  inputMax: number;
}

const pct = (x: number) => `${(100 * x).toFixed(x < 0.01 ? 2 : 1)} %`;
const volts = (v: number) => `${Math.abs(v) < 0.1 ? (v * 1000).toFixed(1) + " mV" : v.toFixed(3) + " V"}`;

/** Plain-word warnings about a finished run. */
export function buildWarnings({ scenario: s, metrics: m, inputMin, inputMax }: WarningInputs): Warning[] {
  const w: Warning[] = [];
  const switching = KIND_INFO[s.stage.kind].switching;
  const noise = s.input.noise?.rms ?? 0;

  if (m.clippedFraction > 0.001) {
    w.push(
      switching
        ? {
            level: "note",
            text: `Output rests at a limit for ${pct(m.clippedFraction)} of the run, as a switching stage should.`,
          }
        : {
            level: "alert",
            text: `Clipping: the output is held at a limit for ${pct(m.clippedFraction)} of the run. Lower the gain or the input, or widen the supplies.`,
          },
    );
  }

  if (noise > 0 && switching) {
    const d = designedFigures(s);
    const deadband =
      m.hysteresis ??
      (d.upperThreshold !== null && d.lowerThreshold !== null ? d.upperThreshold - d.lowerThreshold : 0);
    const needed = 6.6 * noise;
    if (deadband < needed) {
      w.push({
        level: "alert",
        text: `Deadband ${volts(deadband)} is narrower than 6.6 × noise rms (${volts(needed)}): about 0.1 % or more of noise samples reach across it, so the output can chatter.`,
      });
    }
  }

  const sr = s.opamp.slewRate;
  const srFall = s.opamp.slewRateFall ?? sr;
  if (m.maxSlewRate >= 0.9 * Math.min(sr, srFall)) {
    w.push({
      level: switching ? "note" : "caution",
      text: `Slew-limited: the output moved at up to ${(m.maxSlewRate / 1e6).toPrecision(3)} V/µs, the part's slew-rate limit. Edges${switching ? "" : " and large swings"} are set by slew rate, not by the network.`,
    });
  }

  if (inputMin < s.supply.negative || inputMax > s.supply.positive) {
    w.push({
      level: "alert",
      text: `Input outside the supply span: it reaches ${inputMin.toFixed(3)} V … ${inputMax.toFixed(3)} V against supplies of ${s.supply.negative} V … ${s.supply.positive} V. Real inputs would be clamped or damaged; add a divider or clamp.`,
    });
  }

  if (m.chatter != null && m.chatter > 0) {
    w.push({
      level: "alert",
      text: `Chatter seen: ${m.chatter} transition${m.chatter === 1 ? "" : "s"} followed the previous one within the hold-off. A relay, lamp or motor on this output would toggle repeatedly.`,
    });
  }
  return w;
}

export { extent as minMax } from "./extent";

export type { SimEvent };
