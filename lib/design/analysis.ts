// Closed-form figures of a stage (thresholds, gain, oscillation) and the tolerance spread:
// worst case over corners and a seeded Monte Carlo. Formulas: tests/REFERENCES.md (Schmitt trigger,
// relaxation oscillator, single-pole op-amp); the offset enters as in the op-amp model of DEVELOPERS.md,
// vd = v+ − v− + Vos, so every threshold below is the input at which vd crosses zero.
import { xoroshiro128plus } from "pure-rand/generator/xoroshiro128plus";
import { uniformFloat64 } from "pure-rand/distribution/uniformFloat64";
import type { RandomGenerator } from "pure-rand/types/RandomGenerator";
import type { OpAmp, Stage, Supply } from "@/lib/schemas/scenario";

export interface Conditions {
  /** Output limits Voh and Vol (V). */
  high: number;
  low: number;
  /** Input offset Vos (V), signed as in the model. */
  offset: number;
  /** Open-loop gain A0 (V/V). */
  openLoopGain: number;
  /** Output slew rates (V/s); when given, the oscillator's period includes the edges. */
  slewRate?: number;
  slewRateFall?: number;
  /** Gain-bandwidth (Hz); when given with the slew rates, the regenerative start of each edge is included. */
  gainBandwidth?: number;
}

export interface Figures {
  upperThreshold: number | null;
  lowerThreshold: number | null;
  hysteresis: number | null;
  gain: number | null;
  frequency: number | null;
  dutyCycle: number | null;
}

export type FigureName = keyof Figures;
export const FIGURE_NAMES: FigureName[] = [
  "upperThreshold",
  "lowerThreshold",
  "hysteresis",
  "gain",
  "frequency",
  "dutyCycle",
];

/** Voh = V+ − headroomHigh, Vol = V− + headroomLow (DEVELOPERS.md § Behavioural op-amp model). */
export function outputSwing(opamp: OpAmp, supply: Supply): { high: number; low: number } {
  return { high: supply.positive - opamp.outputHeadroomHigh, low: supply.negative + opamp.outputHeadroomLow };
}

export function conditionsOf(opamp: OpAmp, supply: Supply): Conditions {
  const { high, low } = outputSwing(opamp, supply);
  return {
    high,
    low,
    offset: opamp.inputOffset,
    openLoopGain: opamp.openLoopGain,
    slewRate: opamp.slewRate,
    slewRateFall: opamp.slewRateFall ?? opamp.slewRate,
    gainBandwidth: opamp.gainBandwidth,
  };
}

/**
 * Divider rTop from its top end to the node, rBottom from the node to its bottom end, in Thevenin
 * form. The ends default to the rails; in a split supply a divider may also run to 0 V.
 */
export function thevenin(
  rTop: number,
  rBottom: number,
  supply: Supply,
  ends: { top?: number; bottom?: number } = {},
): { voltage: number; resistance: number } {
  const top = ends.top ?? supply.positive;
  const bottom = ends.bottom ?? supply.negative;
  return {
    voltage: bottom + ((top - bottom) * rBottom) / (rTop + rBottom),
    resistance: (rTop * rBottom) / (rTop + rBottom),
  };
}

const NONE: Figures = {
  upperThreshold: null,
  lowerThreshold: null,
  hysteresis: null,
  gain: null,
  frequency: null,
  dutyCycle: null,
};

/** Capacitor-node switching points of the relaxation oscillator (input-referred to v−). */
export function oscillatorSwitchingPoints(stage: Extract<Stage, { kind: "relaxation-oscillator" }>, c: Conditions) {
  const k = stage.rReference / (stage.rReference + stage.rFeedback);
  const base = stage.reference * (1 - k) + c.offset;
  return { upper: base + k * c.high, lower: base + k * c.low, k };
}

/**
 * Period parts of the relaxation oscillator (tests/REFERENCES.md, [derived]):
 * t_high = RC·ln((Voh − VL)/(Voh − VH)), t_low = RC·ln((VH − Vol)/(VL − Vol)).
 * Null when the switching points are not strictly inside the output swing (no oscillation).
 */
export function oscillatorTiming(rc: number, upper: number, lower: number, high: number, low: number) {
  if (!(lower > low && upper < high && upper > lower)) return null;
  const tHigh = rc * Math.log((high - lower) / (high - upper));
  const tLow = rc * Math.log((upper - low) / (lower - low));
  return { tHigh, tLow, period: tHigh + tLow };
}

/**
 * The same with real edges [derived from the op-amp model in DEVELOPERS.md, confirmed against lib/sim]:
 * 1. Regenerative start: after v− crosses v+, vd = v+ − v− + Vos grows as e^(λt), λ = 2π·GBW·k
 *    (positive feedback k), from the capacitor's slope c until 2π·GBW·|vd| reaches the slew rate
 *    (|vd| = SR/(2π·GBW)): t1 = ln(1 + λ·vs/c)/λ, while the output moves Δ = (vs + c·t1)/k.
 *    Treated as a pure delay t1 − Δ/SR of the ideal ramp.
 * 2. Slew: the output ramps rail to rail in te = (Voh − Vol)/SR while RC·dv/dt = vo − v gives
 *    v(te) = Vol + s·τ + (v0 − Voh − s·τ)·e^(−te/τ) (s = SR, τ = RC) for the falling half.
 * 3. The settled exponential from v(te) to the other switching point. The rising half mirrors it.
 */
export function oscillatorTimingWithSlew(
  rc: number,
  upper: number,
  lower: number,
  high: number,
  low: number,
  slewRate: number,
  slewRateFall: number,
  gainBandwidth?: number,
) {
  if (!(lower > low && upper < high && upper > lower)) return null;
  const swing = high - low;
  const k = (upper - lower) / swing;
  const startDelay = (slew: number, capSlope: number) => {
    if (!gainBandwidth || !(capSlope > 0) || !(k > 0)) return 0;
    const w = 2 * Math.PI * gainBandwidth;
    const lambda = w * k;
    const vs = slew / w;
    const t1 = Math.log(1 + (lambda * vs) / capSlope) / lambda;
    const moved = (vs + capSlope * t1) / k;
    return Math.max(0, t1 - Math.min(moved, swing) / slew);
  };
  // Falling half: the switch at v = upper; the capacitor still charges toward Voh during the delay.
  const dF = startDelay(slewRateFall, (high - upper) / rc);
  const v0F = high - (high - upper) * Math.exp(-dF / rc);
  const teF = swing / slewRateFall;
  const sF = slewRateFall * rc;
  const vF = low + sF + (v0F - high - sF) * Math.exp(-teF / rc);
  // Rising half: the switch at v = lower.
  const dR = startDelay(slewRate, (lower - low) / rc);
  const v0R = low + (lower - low) * Math.exp(-dR / rc);
  const teR = swing / slewRate;
  const sR = slewRate * rc;
  const vR = high - sR + (v0R - low + sR) * Math.exp(-teR / rc);
  // If the capacitor already crossed the far switching point during the edge, the closed form no
  // longer holds (the stage is slew-dominated); fall back to the ideal timing.
  if (!(vF > lower) || !(vR < upper)) return oscillatorTiming(rc, upper, lower, high, low);
  const tLow = dF + teF + rc * Math.log((vF - low) / (lower - low));
  const tHigh = dR + teR + rc * Math.log((high - vR) / (high - upper));
  return { tHigh, tLow, period: tHigh + tLow };
}

export function stageFigures(stage: Stage, c: Conditions): Figures {
  switch (stage.kind) {
    case "noninverting-amplifier": {
      // Closed-loop gain with finite A: A/(1 + Aβ), β = rG/(rG + rF) (tests/REFERENCES.md, single-pole op-amp).
      const ideal = 1 + stage.rFeedback / stage.rGround;
      return { ...NONE, gain: ideal / (1 + ideal / c.openLoopGain) };
    }
    case "inverting-amplifier": {
      // −(rF/rI)/(1 + noise gain/A), noise gain 1 + rF/rI (tests/REFERENCES.md, from memory there).
      const ratio = stage.rFeedback / stage.rInput;
      return { ...NONE, gain: -ratio / (1 + (1 + ratio) / c.openLoopGain) };
    }
    case "comparator": {
      const t = stage.inputAt === "inverting" ? stage.reference + c.offset : stage.reference - c.offset;
      return { ...NONE, upperThreshold: t, lowerThreshold: t, hysteresis: 0 };
    }
    case "schmitt-noninverting": {
      // upper = Vref(1 + rIn/rFb) − Vol·rIn/rFb, lower with Voh; the pin switches at v+ = Vref − Vos.
      const r = stage.rInput / stage.rFeedback;
      const v = stage.reference - c.offset;
      const upper = v * (1 + r) - c.low * r;
      const lower = v * (1 + r) - c.high * r;
      return { ...NONE, upperThreshold: upper, lowerThreshold: lower, hysteresis: upper - lower };
    }
    case "schmitt-inverting": {
      // upper = (Vref·rFb + Voh·rRef)/(rRef + rFb), lower with Vol; input switches at v+ + Vos.
      const k = stage.rReference / (stage.rReference + stage.rFeedback);
      const upper = stage.reference * (1 - k) + k * c.high + c.offset;
      const lower = stage.reference * (1 - k) + k * c.low + c.offset;
      return { ...NONE, upperThreshold: upper, lowerThreshold: lower, hysteresis: upper - lower };
    }
    case "relaxation-oscillator": {
      const p = oscillatorSwitchingPoints(stage, c);
      const rc = stage.rTiming * stage.cTiming;
      const timing =
        c.slewRate && c.slewRateFall
          ? oscillatorTimingWithSlew(rc, p.upper, p.lower, c.high, c.low, c.slewRate, c.slewRateFall, c.gainBandwidth)
          : oscillatorTiming(rc, p.upper, p.lower, c.high, c.low);
      if (!timing) return { ...NONE, frequency: 0, dutyCycle: null };
      return { ...NONE, frequency: 1 / timing.period, dutyCycle: timing.tHigh / timing.period };
    }
  }
}

// ---------------------------------------------------------------------------------------------
// Tolerance spread

/** A reference divider that feeds the stage (its Thevenin form is in the stage). */
export interface ReferenceDivider {
  rTop: number;
  rBottom: number;
  /** Voltages of the divider's ends; default the positive and negative supply. */
  top?: number;
  bottom?: number;
}

export interface SpreadOptions {
  /** Capacitor tolerance (fraction); defaults to the resistor tolerance. */
  capacitorTolerance?: number;
  /** Offset magnitude swept ±; defaults to |opamp.inputOffset|. */
  offset?: number;
  /** Output headroom spread as a fraction of each nominal headroom (± this share); default 0.2. */
  headroomSpread?: number;
  /** When the reference comes from a divider, its parts vary instead of the Thevenin values. */
  divider?: ReferenceDivider;
}

export const DEFAULT_HEADROOM_SPREAD = 0.2;

interface Variable {
  name: string;
  /** Applies a unit deviation u ∈ [−1, 1] to the working copies. */
  apply: (u: number, w: Working) => void;
}

interface Working {
  r: Record<string, number>;
  offset: number;
  headroomHigh: number;
  headroomLow: number;
}

const RESISTOR_ROLES = ["rInput", "rFeedback", "rGround", "rReference", "rTiming"] as const;

function spreadModel(stage: Stage, opamp: OpAmp, supply: Supply, tolerance: number, options: SpreadOptions) {
  if (!(tolerance >= 0 && tolerance < 1))
    throw new RangeError(`tolerance must be a fraction in [0, 1) (got ${tolerance})`);
  const nominal: Record<string, number> = {};
  const s = stage as Record<string, unknown>;
  for (const role of RESISTOR_ROLES) if (typeof s[role] === "number") nominal[role] = s[role] as number;
  if (stage.kind === "relaxation-oscillator") nominal.cTiming = stage.cTiming;
  const divider = options.divider;
  if (divider) {
    nominal.rTop = divider.rTop;
    nominal.rBottom = divider.rBottom;
    // rReference is the divider's Thevenin resistance, not a part of its own.
    delete nominal.rReference;
  }
  const capTol = options.capacitorTolerance ?? tolerance;
  const offsetMag = Math.abs(options.offset ?? opamp.inputOffset);
  const hs = options.headroomSpread ?? DEFAULT_HEADROOM_SPREAD;

  const variables: Variable[] = [];
  for (const role of Object.keys(nominal)) {
    const tol = role === "cTiming" ? capTol : tolerance;
    if (tol > 0) variables.push({ name: role, apply: (u, w) => void (w.r[role] = nominal[role] * (1 + tol * u)) });
  }
  if (offsetMag > 0) variables.push({ name: "inputOffset", apply: (u, w) => void (w.offset = offsetMag * u) });
  if (hs > 0 && opamp.outputHeadroomHigh > 0)
    variables.push({
      name: "outputHeadroomHigh",
      apply: (u, w) => void (w.headroomHigh = opamp.outputHeadroomHigh * (1 + hs * u)),
    });
  if (hs > 0 && opamp.outputHeadroomLow > 0)
    variables.push({
      name: "outputHeadroomLow",
      apply: (u, w) => void (w.headroomLow = opamp.outputHeadroomLow * (1 + hs * u)),
    });

  // An explicit offset magnitude means "spread around zero" (as the tolerance study draws it);
  // otherwise the part's own signed offset is the nominal and ±|Vos| the corners.
  const baseOffset = options.offset !== undefined ? 0 : opamp.inputOffset;
  const fresh = (): Working => ({
    r: { ...nominal },
    offset: baseOffset,
    headroomHigh: opamp.outputHeadroomHigh,
    headroomLow: opamp.outputHeadroomLow,
  });

  const evaluate = (w: Working): Figures => {
    const st: Record<string, unknown> = { ...stage };
    for (const role of RESISTOR_ROLES) if (role in w.r) st[role] = w.r[role];
    if (stage.kind === "relaxation-oscillator") st.cTiming = w.r.cTiming;
    if (divider) {
      const th = thevenin(w.r.rTop, w.r.rBottom, supply, divider);
      st.reference = th.voltage;
      if ("rReference" in stage) st.rReference = th.resistance;
    }
    return stageFigures(st as Stage, {
      high: supply.positive - w.headroomHigh,
      low: supply.negative + w.headroomLow,
      offset: w.offset,
      openLoopGain: opamp.openLoopGain,
      slewRate: opamp.slewRate,
      slewRateFall: opamp.slewRateFall ?? opamp.slewRate,
      gainBandwidth: opamp.gainBandwidth,
    });
  };

  return { variables, fresh, evaluate, nominalFigures: evaluate(fresh()) };
}

export type Interval = [number, number];
export type WorstCase = Record<FigureName, Interval | null> & { corners: number; varied: string[] };

/**
 * Worst case over every corner (each varied quantity at −tol or +tol, plus nominal): resistor
 * tolerance, ±|input offset| and the headroom spread. The figures are monotonic in each quantity,
 * so the extremes lie at corners (checked against the Monte Carlo in the tests).
 */
export function worstCase(
  stage: Stage,
  opamp: OpAmp,
  supply: Supply,
  tolerance: number,
  options: SpreadOptions = {},
): WorstCase {
  const model = spreadModel(stage, opamp, supply, tolerance, options);
  const n = model.variables.length;
  if (n > 16) throw new RangeError("too many varied quantities for a corner search");
  const acc = new Map<FigureName, Interval>();
  const take = (f: Figures) => {
    for (const name of FIGURE_NAMES) {
      const v = f[name];
      if (v === null || !Number.isFinite(v)) continue;
      const cur = acc.get(name);
      if (!cur) acc.set(name, [v, v]);
      else {
        if (v < cur[0]) cur[0] = v;
        if (v > cur[1]) cur[1] = v;
      }
    }
  };
  take(model.nominalFigures);
  const total = 1 << n;
  for (let mask = 0; mask < total; mask++) {
    const w = model.fresh();
    model.variables.forEach((v, i) => v.apply(mask & (1 << i) ? 1 : -1, w));
    take(model.evaluate(w));
  }
  const out = { corners: total, varied: model.variables.map((v) => v.name) } as WorstCase;
  for (const name of FIGURE_NAMES) out[name] = model.nominalFigures[name] === null ? null : (acc.get(name) ?? null);
  return out;
}

export interface MonteCarloOptions extends SpreadOptions {
  tolerance: number;
  draws: number;
  seed: number;
  distribution: "uniform" | "normal";
  /** Histogram bins per figure (default 20). */
  bins?: number;
  /** Spec window per figure; a draw is "inside" when every windowed figure lies in its window. */
  window?: Partial<Record<FigureName, Interval>>;
}

export interface FigureSpread {
  mean: number;
  std: number;
  min: number;
  max: number;
  histogram: { edges: number[]; counts: number[] };
  /** Share of draws inside this figure's window (when one was given). */
  insideShare?: number;
}

export interface MonteCarloResult {
  draws: number;
  seed: number;
  distribution: "uniform" | "normal";
  varied: string[];
  figures: Partial<Record<FigureName, FigureSpread>>;
  /** Share of draws with every windowed figure inside its window (null without a window). */
  insideShare: number | null;
}

/**
 * Unit deviation in [−1, 1]. "normal": tolerance read as 3σ, truncated at ±1 (parts outside
 * their tolerance are rejected by the maker's test) — common practice, no source.
 */
function deviate(rng: RandomGenerator, distribution: "uniform" | "normal"): number {
  if (distribution === "uniform") return 2 * uniformFloat64(rng) - 1;
  for (;;) {
    // Box–Muller; redraw the rare value beyond 3σ.
    const u1 = 1 - uniformFloat64(rng);
    const u2 = uniformFloat64(rng);
    const z = Math.sqrt(-2 * Math.log(u1)) * Math.cos(2 * Math.PI * u2);
    if (Math.abs(z) <= 3) return z / 3;
  }
}

export function monteCarlo(stage: Stage, opamp: OpAmp, supply: Supply, options: MonteCarloOptions): MonteCarloResult {
  const { tolerance, distribution } = options;
  const draws = Math.floor(options.draws);
  if (!(draws >= 1 && draws <= 1_000_000))
    throw new RangeError(`draws must be between 1 and 1,000,000 (got ${options.draws})`);
  const seed = options.seed >>> 0;
  const bins = Math.max(1, Math.min(200, Math.floor(options.bins ?? 20)));
  const model = spreadModel(stage, opamp, supply, tolerance, options);
  const rng = xoroshiro128plus(seed);
  const names = FIGURE_NAMES.filter((n) => model.nominalFigures[n] !== null);
  const samples: Record<string, Float64Array> = {};
  for (const n of names) samples[n] = new Float64Array(draws);
  const window = options.window ?? {};
  const windowed = names.filter((n) => window[n]);
  const insideCount: Record<string, number> = {};
  for (const n of windowed) insideCount[n] = 0;
  let allInside = 0;

  for (let d = 0; d < draws; d++) {
    const w = model.fresh();
    for (const v of model.variables) v.apply(deviate(rng, distribution), w);
    const f = model.evaluate(w);
    let ok = true;
    for (const n of names) {
      const x = f[n] ?? NaN;
      samples[n][d] = x;
      const win = window[n];
      if (win) {
        const inside = x >= win[0] && x <= win[1];
        if (inside) insideCount[n]++;
        else ok = false;
      }
    }
    if (ok && windowed.length) allInside++;
  }

  const figures: Partial<Record<FigureName, FigureSpread>> = {};
  for (const n of names) {
    const xs = samples[n];
    let min = Infinity;
    let max = -Infinity;
    let sum = 0;
    for (const x of xs) {
      if (x < min) min = x;
      if (x > max) max = x;
      sum += x;
    }
    const mean = sum / draws;
    let ss = 0;
    for (const x of xs) ss += (x - mean) ** 2;
    const std = draws > 1 ? Math.sqrt(ss / (draws - 1)) : 0;
    const edges: number[] = [];
    const counts = new Array<number>(bins).fill(0);
    const width = (max - min) / bins;
    for (let i = 0; i <= bins; i++) edges.push(min + i * width);
    for (const x of xs) {
      const i = width > 0 ? Math.min(bins - 1, Math.floor((x - min) / width)) : 0;
      counts[i]++;
    }
    const spread: FigureSpread = { mean, std, min, max, histogram: { edges, counts } };
    if (window[n]) spread.insideShare = insideCount[n] / draws;
    figures[n] = spread;
  }
  return {
    draws,
    seed,
    distribution,
    varied: model.variables.map((v) => v.name),
    figures,
    insideShare: windowed.length ? allInside / draws : null,
  };
}
