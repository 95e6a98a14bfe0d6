// Synthesis: from a target (thresholds, gain, frequency) to standard-value parts. Every kind first
// solves the ideal (continuous) network, refuses a spec that no network can meet (saying which
// figure and why), then searches the series over decades around the ideal values and keeps the
// combination with the smallest worst error; ties go to impedances near the middle of the range.
import type { OpAmp, Stage, Supply } from "@/lib/schemas/scenario";
import { type DesignSpec, type DesignSpecOf, thresholdsOf } from "@/lib/schemas/design";

type ThresholdPair = DesignSpecOf<"schmitt-inverting">["target"];
import { seriesInRange, type SeriesName } from "./eseries";
import {
  conditionsOf,
  oscillatorTiming,
  stageFigures,
  thevenin,
  type Conditions,
  type FigureName,
  type Figures,
  type ReferenceDivider,
} from "./analysis";

/** A spec that no network can meet; `figure` names the target field at fault. */
export class DesignError extends Error {
  constructor(
    readonly figure: string,
    readonly detail: string,
  ) {
    super(`${figure}: ${detail}`);
    this.name = "DesignError";
  }
}

export type Role = "rInput" | "rGround" | "rReference" | "rTop" | "rBottom" | "rFeedback" | "rTiming" | "cTiming";

export interface Candidate {
  stage: Stage;
  divider?: ReferenceDivider;
  values: Partial<Record<Role, number>>;
  figures: Figures;
  error: number;
  penalty: number;
  referenceMode: "given" | "auto" | "ground";
}

export interface SynthesisContext {
  spec: DesignSpec;
  supply: Supply;
  opamp: OpAmp;
  cond: Conditions;
  series: SeriesName;
  list: number[];
  range: { min: number; max: number };
  /** Target value per figure and the scale its error is measured against. */
  targets: Partial<Record<FigureName, { value: number; scale: number }>>;
  maxError: number;
  warnings: string[];
}

export const DEFAULT_RANGE = { min: 1e3, max: 1e6 };
export const DEFAULT_CAPACITOR_RANGE = { min: 1e-10, max: 1e-5 };
export const DEFAULT_MAX_ERROR = 0.02;
/** Feedback fraction of the oscillator's threshold network: thresholds at 1/3 and 2/3 of the swing (common practice). */
export const OSCILLATOR_FEEDBACK_FRACTION = 1 / 3;

const fmt = (v: number, digits = 4) => Number(v.toPrecision(digits)).toString();

export function worstError(figures: Figures, ctx: SynthesisContext): number {
  let worst = 0;
  for (const [name, t] of Object.entries(ctx.targets) as [FigureName, { value: number; scale: number }][]) {
    const a = figures[name];
    if (a === null || !Number.isFinite(a)) return Infinity;
    worst = Math.max(worst, Math.abs(a - t.value) / t.scale);
  }
  return worst;
}

function penaltyOf(values: number[], ctx: SynthesisContext): number {
  const mid = Math.sqrt(ctx.range.min * ctx.range.max);
  const gm = Math.exp(values.reduce((s, v) => s + Math.log(v), 0) / values.length);
  return Math.abs(Math.log(gm / mid));
}

function better(a: Candidate, b: Candidate | null): boolean {
  if (!b) return true;
  if (a.error < b.error - 1e-9) return true;
  return Math.abs(a.error - b.error) <= 1e-9 && a.penalty < b.penalty;
}

/** Indices of the `width` list values on each side of x. */
function around(x: number, list: number[], width = 2): number[] {
  let lo = 0;
  let hi = list.length;
  while (lo < hi) {
    const m = (lo + hi) >> 1;
    if (list[m] < x) lo = m + 1;
    else hi = m;
  }
  const out: number[] = [];
  for (let i = lo - width; i < lo + width; i++) if (i >= 0 && i < list.length) out.push(i);
  return out;
}

/** Pairs (a, b) from the list with a/b near `ratio`, one pair per distinct ratio, nearest first. */
function pairsNear(ratio: number, ctx: SynthesisContext, limit = 24): [number, number][] {
  const { list } = ctx;
  const byRatio = new Map<string, { a: number; b: number; pen: number }>();
  for (const b of list) {
    const ideal = ratio * b;
    if (ideal < list[0] / 1.5 || ideal > list[list.length - 1] * 1.5) continue;
    for (const i of around(ideal, list)) {
      const a = list[i];
      const key = (a / b).toPrecision(9);
      const pen = penaltyOf([a, b], ctx);
      const cur = byRatio.get(key);
      if (!cur || pen < cur.pen) byRatio.set(key, { a, b, pen });
    }
  }
  return [...byRatio.values()]
    .sort((x, y) => Math.abs(Math.log(x.a / x.b / ratio)) - Math.abs(Math.log(y.a / y.b / ratio)))
    .slice(0, limit)
    .map(({ a, b }) => [a, b]);
}

/**
 * The ends a reference divider may use for a node voltage: the two rails, and in a split supply
 * also 0 V and the rail on the voltage's side (far better ratio precision for a small voltage).
 */
export function dividerEnds(voltage: number, supply: Supply): { top: number; bottom: number }[] {
  const ends = [{ top: supply.positive, bottom: supply.negative }];
  if (supply.negative < 0 && supply.positive > 0) {
    if (voltage > 0) ends.push({ top: supply.positive, bottom: 0 });
    if (voltage < 0) ends.push({ top: 0, bottom: supply.negative });
  }
  return ends.filter((e) => voltage > e.bottom && voltage < e.top);
}

/** Dividers whose Thevenin voltage is near `voltage`, for every usable pair of ends. */
function dividersNear(voltage: number, ctx: SynthesisContext, limit = 24): ReferenceDivider[] {
  const out: ReferenceDivider[] = [];
  for (const { top, bottom } of dividerEnds(voltage, ctx.supply)) {
    const f = (voltage - bottom) / (top - bottom);
    for (const [rTop, rBottom] of pairsNear((1 - f) / f, ctx, limit)) out.push({ rTop, rBottom, top, bottom });
  }
  return out;
}

/** Thevenin form of a divider found by the search. */
function theveninOf(d: ReferenceDivider, ctx: SynthesisContext) {
  return thevenin(d.rTop, d.rBottom, ctx.supply, d);
}

function evaluate(
  stage: Stage,
  values: Partial<Record<Role, number>>,
  ctx: SynthesisContext,
  referenceMode: Candidate["referenceMode"],
  divider?: ReferenceDivider,
): Candidate {
  const figures = stageFigures(stage, ctx.cond);
  const resistors = Object.entries(values)
    .filter(([role]) => role !== "cTiming")
    .map(([, v]) => v as number);
  return {
    stage,
    divider,
    values,
    figures,
    error: worstError(figures, ctx),
    penalty: penaltyOf(resistors, ctx),
    referenceMode,
  };
}

/** Minimum over a log-spaced scan plus golden refinement of a 1-D function of x in [lo, hi]. */
export function continuousMinimum(fn: (x: number) => number, lo: number, hi: number): { x: number; value: number } {
  const n = 400;
  let bestI = 0;
  let best = Infinity;
  const xs: number[] = [];
  for (let i = 0; i <= n; i++) {
    const x = lo * (hi / lo) ** (i / n);
    xs.push(x);
    const v = fn(x);
    if (v < best) {
      best = v;
      bestI = i;
    }
  }
  let a = xs[Math.max(0, bestI - 1)];
  let b = xs[Math.min(n, bestI + 1)];
  const g = (Math.sqrt(5) - 1) / 2;
  for (let it = 0; it < 80; it++) {
    const c = b - g * (b - a);
    const d = a + g * (b - a);
    if (fn(c) < fn(d)) b = d;
    else a = c;
  }
  const x = (a + b) / 2;
  const v = fn(x);
  return v < best ? { x, value: v } : { x: xs[bestI], value: best };
}

function requireRatio(ratio: number, what: string, figure: string, ctx: SynthesisContext) {
  const maxRatio = ctx.range.max / ctx.range.min;
  if (!(ratio >= 1 / maxRatio && ratio <= maxRatio)) {
    throw new DesignError(
      figure,
      `needs ${what} = ${fmt(ratio)}, beyond what resistors between ${fmt(ctx.range.min)} Ω and ${fmt(ctx.range.max)} Ω allow (ratio ${fmt(1 / maxRatio)} … ${fmt(maxRatio)}); widen "range"`,
    );
  }
}

/** The Thevenin voltage an "auto" reference must reach; refuses one outside the rails. */
function requireReference(
  voltage: number,
  figureBelow: string,
  figureAbove: string,
  why: string,
  ctx: SynthesisContext,
) {
  const { positive, negative } = ctx.supply;
  const margin = 1e-6 * (positive - negative);
  if (voltage <= negative + margin)
    throw new DesignError(
      figureBelow,
      `${why} needs a reference of ${fmt(voltage)} V, at or below the negative supply (${negative} V)`,
    );
  if (voltage >= positive - margin)
    throw new DesignError(
      figureAbove,
      `${why} needs a reference of ${fmt(voltage)} V, at or above the positive supply (${positive} V)`,
    );
}

/** An "auto" reference that lands on ground in a split supply needs no divider. */
function isGround(voltage: number, ctx: SynthesisContext): boolean {
  const { positive, negative } = ctx.supply;
  return negative < 0 && positive > 0 && Math.abs(voltage) <= 1e-9 * (positive - negative);
}

function pick(cands: Iterable<Candidate>): Candidate | null {
  let best: Candidate | null = null;
  for (const c of cands) if (Number.isFinite(c.error) && better(c, best)) best = c;
  return best;
}

function referenceSetting(ctx: SynthesisContext): number | "auto" {
  const r = ctx.spec.reference;
  if (r !== undefined) return r;
  return ctx.spec.kind === "noninverting-amplifier" || ctx.spec.kind === "inverting-amplifier" ? 0 : "auto";
}

/** Refuse a fixed-reference spec whose ideal network already misses the target by more than maxError. */
function requireConsistent(bestContinuous: number, figure: string, why: string, ctx: SynthesisContext) {
  if (bestContinuous > ctx.maxError) {
    throw new DesignError(
      figure,
      `${why}: even ideal resistor values leave a ${fmt(100 * bestContinuous, 3)} % error (maxError ${fmt(100 * ctx.maxError, 3)} %); use reference "auto" or move the targets`,
    );
  }
}

// ---------------------------------------------------------------------------------------------

function comparator(ctx: SynthesisContext, target: DesignSpecOf<"comparator">["target"]): Candidate {
  const t = thresholdsOf(target).upper;
  const inputAt = ctx.spec.inputAt ?? "noninverting";
  const needed = inputAt === "inverting" ? t - ctx.cond.offset : t + ctx.cond.offset;
  const stageOf = (reference: number): Stage => ({ kind: "comparator", reference, inputAt });
  const ref = referenceSetting(ctx);
  if (ref !== "auto") {
    const c = evaluate(stageOf(ref), {}, ctx, "given");
    requireConsistent(
      c.error,
      "threshold",
      `reference ${ref} V with input offset ${ctx.cond.offset} V switches at ${fmt(c.figures.upperThreshold!)} V`,
      ctx,
    );
    return c;
  }
  requireReference(needed, "threshold", "threshold", `threshold ${t} V`, ctx);
  if (isGround(needed, ctx)) return evaluate(stageOf(0), {}, ctx, "ground");
  const best = pick(
    dividersNear(needed, ctx).map((d) => {
      const th = theveninOf(d, ctx);
      return evaluate(stageOf(th.voltage), { rTop: d.rTop, rBottom: d.rBottom }, ctx, "auto", d);
    }),
  );
  if (!best)
    throw new DesignError(
      "threshold",
      `no divider between ${ctx.range.min} Ω and ${ctx.range.max} Ω reaches ${fmt(needed)} V`,
    );
  return best;
}

function schmittNoninverting(ctx: SynthesisContext, target: ThresholdPair): Candidate {
  const { upperThreshold: U, lowerThreshold: L } = target;
  const { high, low, offset } = ctx.cond;
  const rIdeal = (U - L) / (high - low);
  requireRatio(rIdeal, "rInput/rFeedback", "lowerThreshold", ctx);
  const refFor = (r: number) => ((U + L) / 2 + (r * (high + low)) / 2) / (1 + r) + offset;
  const stageOf = (rInput: number, rFeedback: number, reference: number): Stage => ({
    kind: "schmitt-noninverting",
    rInput,
    rFeedback,
    reference,
  });
  const ref = referenceSetting(ctx);
  const maxRatio = ctx.range.max / ctx.range.min;
  if (ref !== "auto") {
    const cont = continuousMinimum(
      (r) => worstError(stageFigures(stageOf(r, 1, ref), ctx.cond), ctx),
      1 / maxRatio,
      maxRatio,
    );
    requireConsistent(cont.value, "upperThreshold", `with reference ${ref} V the thresholds cannot both be met`, ctx);
    const ratios = [...pairsNear(rIdeal, ctx), ...pairsNear(cont.x, ctx)];
    const best = pick(ratios.map(([a, b]) => evaluate(stageOf(a, b, ref), { rInput: a, rFeedback: b }, ctx, "given")));
    return best!;
  }
  requireReference(refFor(rIdeal), "lowerThreshold", "upperThreshold", `thresholds ${L} V … ${U} V`, ctx);
  const cands: Candidate[] = [];
  for (const [a, b] of pairsNear(rIdeal, ctx, 16)) {
    const need = refFor(a / b);
    if (isGround(refFor(rIdeal), ctx)) {
      cands.push(evaluate(stageOf(a, b, 0), { rInput: a, rFeedback: b }, ctx, "ground"));
      continue;
    }
    for (const d of dividersNear(need, ctx, 16)) {
      const th = theveninOf(d, ctx);
      cands.push(
        evaluate(
          stageOf(a, b, th.voltage),
          { rInput: a, rFeedback: b, rTop: d.rTop, rBottom: d.rBottom },
          ctx,
          "auto",
          d,
        ),
      );
    }
  }
  const best = pick(cands);
  if (!best) throw new DesignError("upperThreshold", "no standard values in range meet the thresholds");
  return best;
}

function schmittInverting(ctx: SynthesisContext, target: ThresholdPair): Candidate {
  const { upperThreshold: U, lowerThreshold: L } = target;
  const { high, low, offset } = ctx.cond;
  const k = (U - L) / (high - low);
  if (k >= 1) {
    throw new DesignError(
      "upperThreshold",
      `the deadband ${fmt(U - L)} V (upper − lower) must be narrower than the output swing Voh − Vol = ${fmt(high - low)} V`,
    );
  }
  const stageOf = (rReference: number, rFeedback: number, reference: number): Stage => ({
    kind: "schmitt-inverting",
    rReference,
    rFeedback,
    reference,
  });
  const ref = referenceSetting(ctx);
  const ratioIdeal = k / (1 - k); // rReference / rFeedback
  requireRatio(ratioIdeal, "rReference/rFeedback", "lowerThreshold", ctx);
  const maxRatio = ctx.range.max / ctx.range.min;
  const vth = (L - offset - k * low) / (1 - k);
  if (ref !== "auto" || isGround(vth, ctx)) {
    const fixed = ref === "auto" ? 0 : ref;
    const cont = continuousMinimum(
      (r) => worstError(stageFigures(stageOf(r, 1, fixed), ctx.cond), ctx),
      1 / maxRatio,
      maxRatio,
    );
    requireConsistent(cont.value, "upperThreshold", `with reference ${fixed} V the thresholds cannot both be met`, ctx);
    const ratios = [...pairsNear(ratioIdeal, ctx), ...pairsNear(cont.x, ctx)];
    return pick(
      ratios.map(([a, b]) =>
        evaluate(stageOf(a, b, fixed), { rReference: a, rFeedback: b }, ctx, ref === "auto" ? "ground" : "given"),
      ),
    )!;
  }
  // "auto": three resistors, rTop (V+ → node), rBottom (node → V−), rFeedback (output → node).
  requireReference(
    vth,
    "lowerThreshold",
    "upperThreshold",
    `thresholds ${L} V … ${U} V with output limits ${fmt(low)} V … ${fmt(high)} V`,
    ctx,
  );
  const { list } = ctx;
  let best: Candidate | null = null;
  for (const { top, bottom } of dividerEnds(vth, ctx.supply)) {
    for (const rf of list) {
      const rth = rf * ratioIdeal;
      const topIdeal = (rth * (top - bottom)) / (vth - bottom);
      const bottomIdeal = (rth * (top - bottom)) / (top - vth);
      for (const i of around(topIdeal, list)) {
        for (const j of around(bottomIdeal, list)) {
          const d = { rTop: list[i], rBottom: list[j], top, bottom };
          const th = theveninOf(d, ctx);
          const c = evaluate(
            stageOf(th.resistance, rf, th.voltage),
            { rTop: d.rTop, rBottom: d.rBottom, rFeedback: rf },
            ctx,
            "auto",
            d,
          );
          if (Number.isFinite(c.error) && better(c, best)) best = c;
        }
      }
    }
  }
  if (!best)
    throw new DesignError(
      "upperThreshold",
      `no divider and feedback resistor between ${ctx.range.min} Ω and ${ctx.range.max} Ω meet the thresholds`,
    );
  return best;
}

function amplifier(
  ctx: SynthesisContext,
  kind: "noninverting-amplifier" | "inverting-amplifier",
  gain: number,
): Candidate {
  const A0 = ctx.cond.openLoopGain;
  const ref = referenceSetting(ctx);
  if (kind === "noninverting-amplifier") {
    const g = gain;
    if (g >= A0) throw new DesignError("gain", `gain ${g} is not below the open-loop gain ${A0}`);
    const ideal = g / (1 - g / A0); // 1 + rF/rG before the finite-A0 loss
    requireRatio(ideal - 1, "rFeedback/rGround", "gain", ctx);
    const reference = ref === "auto" ? 0 : ref;
    return pick(
      pairsNear(ideal - 1, ctx).map(([rF, rG]) =>
        evaluate(
          { kind: "noninverting-amplifier", rGround: rG, rFeedback: rF, reference },
          { rGround: rG, rFeedback: rF },
          ctx,
          "given",
        ),
      ),
    )!;
  }
  const g = Math.abs(gain);
  if (g >= A0) throw new DesignError("gain", `gain magnitude ${g} is not below the open-loop gain ${A0}`);
  const ratio = (g * (1 + 1 / A0)) / (1 - g / A0);
  requireRatio(ratio, "rFeedback/rInput", "gain", ctx);
  const pairs = pairsNear(ratio, ctx);
  if (ref !== "auto") {
    return pick(
      pairs.map(([rF, rI]) =>
        evaluate(
          { kind: "inverting-amplifier", rInput: rI, rFeedback: rF, reference: ref },
          { rInput: rI, rFeedback: rF },
          ctx,
          "given",
        ),
      ),
    )!;
  }
  // "auto": bias v+ at the middle of the output swing (single-supply practice); v+ draws no current.
  const mid = (ctx.cond.high + ctx.cond.low) / 2;
  const cands: Candidate[] = [];
  const dividers = isGround(mid, ctx) ? [null] : dividersNear(mid, ctx, 4);
  for (const [rF, rI] of pairs) {
    for (const d of dividers) {
      const reference = d ? theveninOf(d, ctx).voltage : 0;
      const values = d
        ? { rInput: rI, rFeedback: rF, rTop: d.rTop, rBottom: d.rBottom }
        : { rInput: rI, rFeedback: rF };
      const c = evaluate(
        { kind: "inverting-amplifier", rInput: rI, rFeedback: rF, reference },
        values,
        ctx,
        d ? "auto" : "ground",
        d ?? undefined,
      );
      // The bias only has to be near the middle: rank by gain, then by how central the bias is.
      c.penalty += Math.abs(reference - mid) / (ctx.cond.high - ctx.cond.low);
      cands.push(c);
    }
  }
  return pick(cands)!;
}

function oscillator(ctx: SynthesisContext, target: DesignSpecOf<"relaxation-oscillator">["target"]): Candidate {
  const { frequency: f, duty } = target;
  const { high, low, offset } = ctx.cond;
  const { positive, negative } = ctx.supply;
  const ref = referenceSetting(ctx);
  const maxRatio = ctx.range.max / ctx.range.min;
  // Slew-dominated stages are not relaxation oscillators any more: the closed form (and the
  // stage) would be far off. Refuse when the two output edges fill more than 10 % of the period.
  const edges = (high - low) / ctx.opamp.slewRate + (high - low) / (ctx.opamp.slewRateFall ?? ctx.opamp.slewRate);
  if (edges * f > 0.1) {
    throw new DesignError(
      "frequency",
      `at ${f} Hz the output edges (${fmt(edges * 1e6, 3)} µs per period at the part's slew rate) would fill ${fmt(100 * edges * f, 3)} % of the period (limit 10 %); choose a faster part profile or a frequency below ${fmt(0.1 / edges, 3)} Hz`,
    );
  }

  const dutyOf = (k: number, reference: number) => {
    const base = reference * (1 - k) + offset;
    const t = oscillatorTiming(1, base + k * high, base + k * low, high, low);
    return t ? t.tHigh / t.period : NaN;
  };

  // 1. The threshold network: ideal feedback fraction and reference.
  type Net = {
    stage: Omit<Extract<Stage, { kind: "relaxation-oscillator" }>, "rTiming" | "cTiming">;
    values: Partial<Record<Role, number>>;
    divider?: ReferenceDivider;
    mode: Candidate["referenceMode"];
  };
  const nets: { net: Net; dutyErr: number; pen: number }[] = [];
  const addNet = (net: Net) => {
    const d = dutyOf(net.stage.rReference / (net.stage.rReference + net.stage.rFeedback), net.stage.reference);
    if (!Number.isFinite(d)) return;
    // Without a duty target the network still aims at a square wave (duty 0.5).
    const dutyErr = Math.abs(d - (duty ?? 0.5)) / (duty ?? 0.5);
    const k = net.stage.rReference / (net.stage.rReference + net.stage.rFeedback);
    nets.push({ net, dutyErr, pen: Math.abs(Math.log(k / OSCILLATOR_FEEDBACK_FRACTION)) });
  };
  const k0 = OSCILLATOR_FEEDBACK_FRACTION;
  let vth = NaN;
  if (ref === "auto") {
    // Solve the reference for the duty (default 0.5): duty rises with the reference.
    const want = duty ?? 0.5;
    let a = negative;
    let b = positive;
    const dA = dutyOf(k0, a + 1e-9 * (b - a));
    const dB = dutyOf(k0, b - 1e-9 * (b - a));
    const lo = Number.isFinite(dA) ? dA : 0;
    const hi = Number.isFinite(dB) ? dB : 1;
    if (!(want > lo && want < hi) && !(Number.isNaN(dA) || Number.isNaN(dB))) {
      throw new DesignError(
        "duty",
        `duty ${want} is out of reach: with thresholds at 1/3 and 2/3 of the swing and the reference inside the supply it lies between ${fmt(lo, 3)} and ${fmt(hi, 3)}`,
      );
    }
    for (let it = 0; it < 200; it++) {
      const m = (a + b) / 2;
      const dm = dutyOf(k0, m);
      if (Number.isNaN(dm)) {
        // Outside the swing: move toward the middle.
        if (m < (high + low) / 2) a = m;
        else b = m;
      } else if (dm < want) a = m;
      else b = m;
    }
    vth = (a + b) / 2;
    if (!Number.isFinite(dutyOf(k0, vth)) || Math.abs(dutyOf(k0, vth) - want) > 1e-6)
      throw new DesignError("duty", `duty ${want} is out of reach with the reference inside the supply`);
  }
  // Without a duty target, a split supply whose ideal reference is within 2 % of the span from
  // 0 V (only the offset moves it) uses ground: two resistors fewer for a duty off by a hair.
  const nearGround = duty === undefined && negative < 0 && positive > 0 && Math.abs(vth) < 0.02 * (positive - negative);
  if (ref !== "auto" || isGround(vth, ctx) || nearGround) {
    const fixed = ref === "auto" ? 0 : ref;
    let kIdeal = k0;
    if (duty !== undefined) {
      const cont = continuousMinimum(
        (r) => {
          const d = dutyOf(r / (1 + r), fixed);
          return Number.isFinite(d) ? Math.abs(d - duty) / duty : Infinity;
        },
        1 / maxRatio,
        maxRatio,
      );
      // Duty is set only by moving the switching points off the swing's centre (the reference).
      const centred = Math.abs(fixed + offset - (high + low) / 2) < 1e-3 * (high - low);
      requireConsistent(
        cont.value,
        "duty",
        centred
          ? `reference ${fixed} V sits at the centre of the output swing, so the duty stays at 0.5 whatever the resistor ratio (duty moves only when the reference moves the switching points off-centre)`
          : `with reference ${fixed} V this duty cannot be reached for any resistor ratio`,
        ctx,
      );
      kIdeal = cont.x / (1 + cont.x);
    }
    for (const [a, b] of pairsNear(kIdeal / (1 - kIdeal), ctx, 40)) {
      addNet({
        stage: { kind: "relaxation-oscillator", rReference: a, rFeedback: b, reference: fixed },
        values: { rReference: a, rFeedback: b },
        mode: ref === "auto" ? "ground" : "given",
      });
    }
  } else {
    const { list } = ctx;
    for (const { top, bottom } of dividerEnds(vth, ctx.supply)) {
      for (const rf of list) {
        const rth = (rf * k0) / (1 - k0);
        for (const i of around((rth * (top - bottom)) / (vth - bottom), list, 1)) {
          for (const j of around((rth * (top - bottom)) / (top - vth), list, 1)) {
            const d = { rTop: list[i], rBottom: list[j], top, bottom };
            const th = theveninOf(d, ctx);
            addNet({
              stage: { kind: "relaxation-oscillator", rReference: th.resistance, rFeedback: rf, reference: th.voltage },
              values: { rTop: d.rTop, rBottom: d.rBottom, rFeedback: rf },
              divider: d,
              mode: "auto",
            });
          }
        }
      }
    }
  }
  if (!nets.length) throw new DesignError("frequency", "no threshold network in range lets the stage oscillate");
  nets.sort((x, y) => x.dutyErr - y.dutyErr || x.pen - y.pen);
  const shortlist = nets.slice(0, 40);

  // 2. Timing: for each capacitor, the resistor that sets the frequency.
  const capSeries = (ctx.spec.capacitorSeries ?? "E6") as SeriesName;
  const capRange = ctx.spec.capacitorRange ?? DEFAULT_CAPACITOR_RANGE;
  const caps = seriesInRange(capSeries, capRange.min, capRange.max);
  const { list } = ctx;
  let fMin = Infinity;
  let fMax = 0;
  let best: Candidate | null = null;
  for (const { net } of shortlist) {
    const ideal = { ...ctx.cond, slewRate: undefined, slewRateFall: undefined };
    const periodPerRc = 1 / stageFigures({ ...net.stage, rTiming: 1, cTiming: 1 }, ideal).frequency!;
    // Slew-limited edges add a nearly constant time per period; correct the RC aim once for it.
    const rc0 = 1 / (f * periodPerRc);
    const withEdges = stageFigures({ ...net.stage, rTiming: rc0, cTiming: 1 }, ctx.cond).frequency;
    const extra = withEdges ? 1 / withEdges - 1 / f : 0;
    const rcAim = Math.max((1 / f - extra) / periodPerRc, rc0 * 1e-3);
    fMin = Math.min(fMin, 1 / (periodPerRc * list[list.length - 1] * caps[caps.length - 1]));
    fMax = Math.max(fMax, 1 / (periodPerRc * list[0] * caps[0]));
    for (const c of caps) {
      const rIdeal = rcAim / c;
      for (const i of around(rIdeal, list)) {
        const stage: Stage = { ...net.stage, rTiming: list[i], cTiming: c };
        const cand = evaluate(stage, { ...net.values, rTiming: list[i], cTiming: c }, ctx, net.mode, net.divider);
        if (Number.isFinite(cand.error) && better(cand, best)) best = cand;
      }
    }
  }
  if (f < fMin * (1 - ctx.maxError) || f > fMax * (1 + ctx.maxError)) {
    throw new DesignError(
      "frequency",
      `${f} Hz is outside what resistors ${fmt(ctx.range.min)}–${fmt(ctx.range.max)} Ω and capacitors ${fmt(capRange.min)}–${fmt(capRange.max)} F reach (about ${fmt(fMin, 3)} Hz … ${fmt(fMax, 3)} Hz); widen "range" or "capacitorRange"`,
    );
  }
  if (!best) throw new DesignError("frequency", "no timing resistor and capacitor in range reach the frequency");
  return best;
}

export function synthesize(ctx: SynthesisContext): Candidate {
  const spec = ctx.spec;
  switch (spec.kind) {
    case "comparator":
      return comparator(ctx, spec.target);
    case "schmitt-noninverting":
      return schmittNoninverting(ctx, spec.target);
    case "schmitt-inverting":
      return schmittInverting(ctx, spec.target);
    case "noninverting-amplifier":
    case "inverting-amplifier":
      return amplifier(ctx, spec.kind, spec.target.gain);
    case "relaxation-oscillator":
      return oscillator(ctx, spec.target);
  }
}

export function contextOf(spec: DesignSpec): SynthesisContext {
  const cond = conditionsOf(spec.opamp, spec.supply);
  const range = spec.range ?? DEFAULT_RANGE;
  const list = seriesInRange(spec.series, range.min, range.max);
  if (list.length < 2)
    throw new DesignError(
      "range",
      `fewer than two ${spec.series} values lie between ${range.min} Ω and ${range.max} Ω`,
    );
  const targets: SynthesisContext["targets"] = {};
  const span = spec.supply.positive - spec.supply.negative;
  switch (spec.kind) {
    case "comparator": {
      const v = thresholdsOf(spec.target).upper;
      const scale = Math.max(Math.abs(v), 0.01 * span);
      targets.upperThreshold = { value: v, scale };
      targets.lowerThreshold = { value: v, scale };
      break;
    }
    case "schmitt-inverting":
    case "schmitt-noninverting": {
      const { upperThreshold: U, lowerThreshold: L } = spec.target;
      const h = U - L;
      // Relative error, never stricter than relative to the deadband (thresholds near 0 V).
      targets.upperThreshold = { value: U, scale: Math.max(Math.abs(U), h) };
      targets.lowerThreshold = { value: L, scale: Math.max(Math.abs(L), h) };
      break;
    }
    case "noninverting-amplifier":
      targets.gain = { value: spec.target.gain, scale: Math.abs(spec.target.gain) };
      break;
    case "inverting-amplifier":
      // Documented choice: the inverting gain may be given signed (−10) or as a magnitude (10); both mean vo/vin = −10.
      targets.gain = { value: -Math.abs(spec.target.gain), scale: Math.abs(spec.target.gain) };
      break;
    case "relaxation-oscillator": {
      const { frequency, duty } = spec.target;
      targets.frequency = { value: frequency, scale: frequency };
      if (duty !== undefined) targets.dutyCycle = { value: duty, scale: duty };
      break;
    }
  }
  return {
    spec,
    supply: spec.supply,
    opamp: spec.opamp,
    cond,
    series: spec.series,
    list,
    range,
    targets,
    maxError: spec.maxError ?? DEFAULT_MAX_ERROR,
    warnings: [],
  };
}
