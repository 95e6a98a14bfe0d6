// One worst case for the circuit as built (lib/schemas/README.md): the spread of a scenario's figures over
// every part of the network — stage resistors, the reference divider, the source divider or NTC
// (R25, Beta, fixed resistor), the filter resistor where the input draws current, the pull-up —
// plus the supply tolerance, a numeric reference's tolerance, ±|input offset| and the output
// headroom spread. The design panel, the design summary and the tolerance spread study all use
// these functions, so their figures agree. Closed forms: lib/design/analysis (tests/REFERENCES.md).
import { xoroshiro128plus } from "pure-rand/generator/xoroshiro128plus";
import { uniformFloat64 } from "pure-rand/distribution/uniformFloat64";
import {
  CURRENT_DRAWING_KINDS,
  DEFAULT_TOLERANCES,
  dividerEndVolts,
  type Scenario,
  type Stage,
} from "@/lib/schemas/scenario";
import {
  DEFAULT_HEADROOM_SPREAD,
  FIGURE_NAMES,
  stageFigures,
  type FigureName,
  type Figures,
  type Interval,
} from "./analysis";
import { sensorFrontEnd, type SensorSpec } from "./sensors";

export interface SpreadVariable {
  /** Field it varies, e.g. "stage.rFeedback", "supply.positive", "source.sensor.model.beta". */
  name: string;
  /** ± fraction (or, for the input offset, ± volts). */
  tolerance: number;
}

export interface CircuitSpreadOptions {
  /** ± share of each output headroom; default 0.2 (as lib/design/analysis). */
  headroomSpread?: number;
  /** Offset magnitude swept ± around 0 V; default: the part's own offset, corners at ±|Vos|. */
  offset?: number;
  /**
   * Also vary the parts that do not move the DC figures but do move a simulated run (the filter
   * capacitor, the filter resistor on high-impedance inputs): the tolerance spread study draws
   * every resistor and capacitor.
   */
  everyPart?: boolean;
}

export interface CircuitFigures extends Figures {
  /** Thresholds in source units (sorted as source quantities), when the scenario has a source. */
  sourceUpperThreshold: number | null;
  sourceLowerThreshold: number | null;
}

export type CircuitFigureName = keyof CircuitFigures;
export const CIRCUIT_FIGURE_NAMES: CircuitFigureName[] = [
  ...FIGURE_NAMES,
  "sourceUpperThreshold",
  "sourceLowerThreshold",
];

const STAGE_RESISTORS = ["rInput", "rFeedback", "rGround", "rReference", "rTiming"] as const;
const par = (a: number, b: number) => (a * b) / (a + b);

/** Every quantity that moves the figures, with its tolerance (zero-tolerance ones left out). */
export function spreadVariables(scenario: Scenario, options: CircuitSpreadOptions = {}): SpreadVariable[] {
  const tol = { ...DEFAULT_TOLERANCES, ...(scenario.tolerances ?? {}) };
  const vars: SpreadVariable[] = [];
  const add = (name: string, t: number) => {
    if (t > 0) vars.push({ name, tolerance: t });
  };
  const st = scenario.stage as Record<string, unknown>;
  const div = scenario.stage.referenceDivider;
  for (const role of STAGE_RESISTORS) {
    if (role === "rReference" && div) continue;
    if (typeof st[role] === "number") add(`stage.${role}`, tol.resistor);
  }
  if (scenario.stage.kind === "relaxation-oscillator") add("stage.cTiming", tol.capacitor);
  if (div) {
    add("stage.referenceDivider.rTop", tol.resistor);
    add("stage.referenceDivider.rBottom", tol.resistor);
  } else if (scenario.stage.reference !== 0) add("stage.reference", tol.reference);
  const sensor = scenario.source?.sensor;
  if (sensor?.kind === "divider") {
    add("source.sensor.rTop", tol.resistor);
    add("source.sensor.rBottom", tol.resistor);
  } else if (sensor?.kind === "ntc") {
    add("source.sensor.rFixed", tol.resistor);
    // R25 and Beta tolerances apply to a Beta-model NTC (the maker's data); a curve given by
    // Steinhart–Hart coefficients or points is taken as measured.
    if ("beta" in sensor.model) {
      add("source.sensor.model.r25", tol.ntcR25);
      add("source.sensor.model.beta", tol.ntcBeta);
    }
  }
  if (scenario.filter && (options.everyPart || CURRENT_DRAWING_KINDS.includes(scenario.stage.kind)))
    add("filter.r", tol.resistor);
  if (scenario.filter && options.everyPart) add("filter.c", tol.capacitor);
  if (scenario.output?.kind === "open-drain") add("output.pullUp", tol.resistor);
  const supplyTol = scenario.supply.tolerance ?? 0;
  if (scenario.supply.positive !== 0) add("supply.positive", supplyTol);
  if (scenario.supply.negative !== 0) add("supply.negative", supplyTol);
  const offset = Math.abs(options.offset ?? scenario.opamp.inputOffset);
  add("opamp.inputOffset", offset);
  const hs = options.headroomSpread ?? DEFAULT_HEADROOM_SPREAD;
  if (scenario.opamp.outputHeadroomHigh > 0) add("opamp.outputHeadroomHigh", hs);
  if (scenario.opamp.outputHeadroomLow > 0) add("opamp.outputHeadroomLow", hs);
  return vars;
}

/**
 * The figures with each variable at nominal·(1 + tolerance·u), u ∈ [−1, 1] per name (absent: 0,
 * the nominal). The input offset is |Vos|·u (the part's signed offset when u is absent).
 */
export function circuitFigures(
  scenario: Scenario,
  u: Record<string, number> = {},
  options: CircuitSpreadOptions = {},
): CircuitFigures {
  const tol = { ...DEFAULT_TOLERANCES, ...(scenario.tolerances ?? {}) };
  const hs = options.headroomSpread ?? DEFAULT_HEADROOM_SPREAD;
  const f = (name: string, nominal: number, t: number) => nominal * (1 + t * (u[name] ?? 0));
  const supplyTol = scenario.supply.tolerance ?? 0;
  const supply = {
    positive: f("supply.positive", scenario.supply.positive, supplyTol),
    negative: f("supply.negative", scenario.supply.negative, supplyTol),
  };
  const op = scenario.opamp;
  const offset =
    u["opamp.inputOffset"] !== undefined
      ? Math.abs(options.offset ?? op.inputOffset) * u["opamp.inputOffset"]
      : options.offset !== undefined
        ? 0
        : op.inputOffset;
  const driveHigh = supply.positive - f("opamp.outputHeadroomHigh", op.outputHeadroomHigh, hs);
  const low = supply.negative + f("opamp.outputHeadroomLow", op.outputHeadroomLow, hs);

  const src = scenario.stage as Record<string, unknown>;
  const st: Record<string, unknown> = { ...src };
  delete st.referenceDivider;
  for (const role of STAGE_RESISTORS)
    if (typeof src[role] === "number") st[role] = f(`stage.${role}`, src[role] as number, tol.resistor);
  if (scenario.stage.kind === "relaxation-oscillator")
    st.cTiming = f("stage.cTiming", scenario.stage.cTiming, tol.capacitor);
  const div = scenario.stage.referenceDivider;
  if (div) {
    const rTop = f("stage.referenceDivider.rTop", div.rTop, tol.resistor);
    const rBottom = f("stage.referenceDivider.rBottom", div.rBottom, tol.resistor);
    const top = dividerEndVolts(div.top, supply, "positive");
    const bottom = dividerEndVolts(div.bottom, supply, "ground");
    st.reference = bottom + ((top - bottom) * rBottom) / (rTop + rBottom);
    const rth = par(rTop, rBottom);
    if (scenario.stage.kind === "schmitt-inverting" || scenario.stage.kind === "relaxation-oscillator")
      st.rReference = rth;
    else if (scenario.stage.kind === "noninverting-amplifier") st.rGround = (st.rGround as number) + rth;
  } else {
    st.reference = f("stage.reference", scenario.stage.reference, tol.reference);
  }

  // The source, with its own parts varied; its Thevenin resistance joins rInput (and the filter
  // resistor, open at DC) where the input draws current.
  const sensor = scenario.source?.sensor;
  let fe: ReturnType<typeof sensorFrontEnd> | null = null;
  let rSource: (x: number) => number = () => 0;
  if (sensor) {
    let s: SensorSpec = sensor as SensorSpec;
    if (sensor.kind === "divider") {
      s = {
        ...sensor,
        rTop: f("source.sensor.rTop", sensor.rTop, tol.resistor),
        rBottom: f("source.sensor.rBottom", sensor.rBottom, tol.resistor),
      };
      const r = par(s.rTop, s.rBottom);
      rSource = () => r;
    } else if (sensor.kind === "ntc") {
      const m = sensor.model;
      const k25 = 1 + tol.ntcR25 * (u["source.sensor.model.r25"] ?? 0);
      const model =
        "beta" in m
          ? { ...m, r25: m.r25 * k25, beta: f("source.sensor.model.beta", m.beta, tol.ntcBeta) }
          : "points" in m
            ? { points: m.points.map(([c, r]) => [c, r * k25] as [number, number]) }
            : { ...m, a: m.a - Math.log(k25) * m.b }; // R·k in S–H: approximately a shift of A (first order in ln k)
      const rFixed = f("source.sensor.rFixed", sensor.rFixed, tol.resistor);
      s = { ...sensor, model, rFixed, supplyVoltage: sensor.supplyVoltage ?? supply.positive } as SensorSpec;
      const exc = sensor.supplyVoltage ?? supply.positive;
      const feN = sensorFrontEnd(s, exc);
      rSource = (x) => {
        const v = feN.toVolts(x);
        const rt = sensor.position === "bottom" ? (rFixed * v) / (exc - v) : (rFixed * (exc - v)) / v;
        return par(rt, rFixed);
      };
    }
    fe = sensorFrontEnd(s, sensor.kind === "ntc" ? (sensor.supplyVoltage ?? supply.positive) : supply.positive);
  }
  const draws = CURRENT_DRAWING_KINDS.includes(scenario.stage.kind);
  const rFilter = scenario.filter && draws ? f("filter.r", scenario.filter.r, tol.resistor) : 0;
  const rIn0 = typeof st.rInput === "number" ? (st.rInput as number) : 0;

  // Open drain: while released, the pin sits where the pull-up, the load and the feedback put it.
  const out = scenario.output;
  const openDrain = out?.kind === "open-drain";
  const pullUp = openDrain ? f("output.pullUp", out.pullUp, tol.resistor) : 0;
  const pullTo = openDrain
    ? out.pullUpTo === undefined || out.pullUpTo === "positive"
      ? supply.positive
      : out.pullUpTo
    : 0;
  const pinThevenin = () => {
    if (!openDrain) return { v: driveHigh, r: 0 };
    if (!out.load) return { v: pullTo, r: pullUp };
    const lt = out.load.to ?? 0;
    return { v: (pullTo * out.load.r + lt * pullUp) / (pullUp + out.load.r), r: par(pullUp, out.load.r) };
  };

  const evaluate = (rExtra: number): Figures => {
    const stage = { ...st } as Record<string, unknown>;
    if (draws) stage.rInput = rIn0 + rExtra + rFilter;
    const plain = stage as Stage;
    let high = driveHigh;
    if (openDrain) {
      const p = pinThevenin();
      // Loaded high level (a Thevenin source p.v, p.r driving the feedback network) [derived].
      if (plain.kind === "schmitt-inverting") {
        const rr = plain.rReference,
          rf = plain.rFeedback;
        high = Math.min(high, (p.v * (rr + rf) + plain.reference * p.r) / (p.r + rr + rf));
      } else if (plain.kind === "schmitt-noninverting") {
        // Released pin: vo = (p.v·(rI + rF) + u·p.r)/(p.r + rI + rF); v+ = (u·rF + vo·rI)/(rI + rF).
        // The lower threshold is the u at which v+ = reference − offset; solve the affine v+(u).
        const ri = plain.rInput,
          rf = plain.rFeedback,
          s = ri + rf;
        const vp = (x: number) => (x * rf + ((p.v * s + x * p.r) / (p.r + s)) * ri) / s;
        const target = plain.reference - offset;
        const a0 = vp(0),
          a1 = vp(1) - a0;
        const lower = (target - a0) / a1;
        const fig = stageFigures(plain, { high, low, offset, openLoopGain: op.openLoopGain });
        return { ...fig, lowerThreshold: lower, hysteresis: fig.upperThreshold! - lower };
      } else {
        high = Math.min(high, p.v);
      }
    }
    return stageFigures(plain, {
      high,
      low,
      offset,
      openLoopGain: op.openLoopGain,
      slewRate: op.slewRate,
      slewRateFall: op.slewRateFall ?? op.slewRate,
      gainBandwidth: op.gainBandwidth,
    });
  };

  let fig: Figures;
  if (sensor?.kind === "ntc" && draws) {
    // The NTC's resistance depends on the temperature at the threshold: a few fixed-point steps.
    // Start at 25 °C (any point inside the curve converges: the resistance moves the threshold little).
    let r = rSource(25);
    fig = evaluate(r);
    for (let i = 0; i < 6 && fe; i++) {
      const x = fig.upperThreshold !== null ? fe.toUnits(fig.upperThreshold) : null;
      if (x === null) break;
      r = rSource(x);
      fig = evaluate(r);
    }
  } else {
    fig = evaluate(rSource(0));
  }

  let sourceUpper: number | null = null;
  let sourceLower: number | null = null;
  if (fe) {
    const conv = (v: number | null) => (v === null ? null : fe.toUnits(v));
    sourceUpper = conv(fe.inverted ? fig.lowerThreshold : fig.upperThreshold);
    sourceLower = conv(fe.inverted ? fig.upperThreshold : fig.lowerThreshold);
  }
  return { ...fig, sourceUpperThreshold: sourceUpper, sourceLowerThreshold: sourceLower };
}

export type CircuitWorstCase = Record<CircuitFigureName, Interval | null> & {
  nominal: CircuitFigures;
  corners: number;
  varied: SpreadVariable[];
};

/** Worst case over every corner of the varied quantities (plus nominal). */
export function circuitWorstCase(scenario: Scenario, options: CircuitSpreadOptions = {}): CircuitWorstCase {
  const vars = spreadVariables(scenario, options);
  if (vars.length > 18) throw new RangeError(`too many varied quantities (${vars.length}) for a corner search`);
  const nominal = circuitFigures(scenario, {}, options);
  const acc = new Map<CircuitFigureName, Interval>();
  const take = (fg: CircuitFigures) => {
    for (const n of CIRCUIT_FIGURE_NAMES) {
      const v = fg[n];
      if (v === null || !Number.isFinite(v)) continue;
      const cur = acc.get(n);
      if (!cur) acc.set(n, [v, v]);
      else {
        if (v < cur[0]) cur[0] = v;
        if (v > cur[1]) cur[1] = v;
      }
    }
  };
  take(nominal);
  const total = 1 << vars.length;
  const u: Record<string, number> = {};
  for (let mask = 0; mask < total; mask++) {
    vars.forEach((v, i) => (u[v.name] = mask & (1 << i) ? 1 : -1));
    take(circuitFigures(scenario, u, options));
  }
  const out = { nominal, corners: total, varied: vars } as CircuitWorstCase;
  for (const n of CIRCUIT_FIGURE_NAMES) out[n] = nominal[n] === null ? null : (acc.get(n) ?? null);
  return out;
}

/** Seeded uniform Monte Carlo of circuitFigures over the same variables (for checks and plots). */
export function circuitMonteCarlo(
  scenario: Scenario,
  draws: number,
  seed: number,
  options: CircuitSpreadOptions = {},
): CircuitFigures[] {
  const vars = spreadVariables(scenario, options);
  const rng = xoroshiro128plus(seed >>> 0);
  const out: CircuitFigures[] = [];
  for (let d = 0; d < draws; d++) {
    const u: Record<string, number> = {};
    for (const v of vars) u[v.name] = 2 * uniformFloat64(rng) - 1;
    out.push(circuitFigures(scenario, u, options));
  }
  return out;
}

export type { FigureName };

/**
 * The scenario with each variable at nominal·(1 + tolerance·u) (the input offset at |Vos|·u):
 * the same draw the corner search and circuitFigures make, as a scenario to simulate. A reference
 * divider's filled Thevenin values are recomputed by lib/sim/circuit from the varied divider.
 */
export function perturbScenario(
  scenario: Scenario,
  u: Record<string, number>,
  options: CircuitSpreadOptions = {},
): Scenario {
  const vars = spreadVariables(scenario, options);
  const out = structuredClone({ ...scenario, input: undefined }) as unknown as Record<string, unknown>;
  out.input = scenario.input;
  const offsetMag = Math.abs(options.offset ?? scenario.opamp.inputOffset);
  for (const v of vars) {
    const x = u[v.name];
    if (x === undefined) continue;
    const path = v.name.split(".");
    let obj = out as Record<string, unknown>;
    for (const key of path.slice(0, -1)) obj = obj[key] as Record<string, unknown>;
    const leaf = path[path.length - 1];
    if (v.name === "opamp.inputOffset") obj[leaf] = offsetMag * x;
    else obj[leaf] = (obj[leaf] as number) * (1 + v.tolerance * x);
  }
  if (options.offset !== undefined && u["opamp.inputOffset"] === undefined)
    (out.opamp as Record<string, unknown>).inputOffset = 0;
  return out as unknown as Scenario;
}
