// Design from spec: `design(spec)` → `railwise.design/1` (lib/schemas/README.md § Design JSON) plus extras:
// `errors` (target vs achieved), `reference` (how the reference is made), `assumptions`,
// `warnings` and a seeded `monteCarlo` spread. Pure TypeScript: no React, Next or database.
import {
  designSpecSchema,
  DESIGN_SCHEMA_ID,
  type DesignSensor,
  type DesignSpec,
  thresholdsOf,
} from "@/lib/schemas/design";
import { describeIssues, type Stage } from "@/lib/schemas/scenario";
import { SERIES_TOLERANCE, seriesInRange, snapToSeries, type SeriesName } from "./eseries";
import { formatQuantity, formatRkm } from "./notation";
import {
  DEFAULT_HEADROOM_SPREAD,
  FIGURE_NAMES,
  monteCarlo,
  worstCase,
  type FigureName,
  type Interval,
  type MonteCarloResult,
} from "./analysis";
import { contextOf, DesignError, synthesize, type Role } from "./synthesis";
import { sensorFrontEnd, type SensorSpec } from "./sensors";
import { circuitWorstCase } from "./spread";
import { CURRENT_DRAWING_KINDS, parseScenario, type ScenarioInput } from "@/lib/schemas/scenario";

export { worstCase, monteCarlo, stageFigures, thevenin, outputSwing, conditionsOf } from "./analysis";
export type {
  Figures,
  FigureName,
  Interval,
  WorstCase,
  MonteCarloOptions,
  MonteCarloResult,
  SpreadOptions,
  ReferenceDivider,
} from "./analysis";
export { DesignError } from "./synthesis";
export { parseQuantity, formatQuantity, formatRkm } from "./notation";
export { seriesValues, snapToSeries, seriesInRange, SERIES_TOLERANCE, SERIES_NAMES, type SeriesName } from "./eseries";

/** Parts of the source in front of the stage (the design spec's sensor). */
export type SourceRole = "sourceTop" | "sourceBottom" | "sourceFixed" | "pullUp" | "filterR" | "filterC";

export interface DesignPart {
  ref: string;
  role: Role | SourceRole;
  value: number;
  series: SeriesName;
  /** RKM code for resistors (4K7), engineering notation for capacitors (100 nF). */
  code: string;
  tolerance: number;
  /** Where the part sits. */
  note: string;
}

/**
 * The scenario-ready stage as a parse gives it: with an "auto" reference it carries
 * `referenceDivider`; `reference` (and for schmitt-inverting / the oscillator `rReference`) are the
 * divider's Thevenin values the parse fills in, which a scenario accepts back. They are not parts:
 * `parts` and the parts list (lib/design/bom) list the divider's two resistors.
 */
export type DesignStage = Stage;

export interface DesignResult {
  schema: typeof DESIGN_SCHEMA_ID;
  kind: DesignSpec["kind"];
  stage: DesignStage;
  /** With a `sensor` in the spec: the scenario's `source`, so `{ stage, source }` drop into a scenario. */
  source?: { sensor: DesignSensor; unit?: string };
  /** With a filter in the spec: the suggested RC low-pass, the scenario's `filter`. */
  filter?: { r: number; c: number };
  /** With an open-drain output in the spec: the scenario's `output` (with the chosen pull-up). */
  output?: { kind: "open-drain"; pullUp: number; pullUpTo?: "positive" | number; load?: { r: number; to?: number } };
  parts: DesignPart[];
  achieved: {
    upperThreshold: number | null;
    lowerThreshold: number | null;
    gain: number | null;
    hysteresis: number | null;
    frequency: number | null;
    dutyCycle: number | null;
  };
  worstCase: Record<FigureName, Interval | null>;
  errors: Partial<Record<FigureName, { target: number; achieved: number; deviation: number; relative: number }>>;
  reference: {
    mode: "given" | "auto" | "ground";
    voltage: number;
    /** rTop runs from `top` (V) to the reference node, rBottom from the node to `bottom` (V). */
    divider?: { rTop: number; rBottom: number; top: number; bottom: number; theveninResistance: number };
  };
  assumptions: {
    tolerance: number;
    capacitorTolerance?: number;
    inputOffset: number;
    headroomSpread: number;
    range: { min: number; max: number };
    maxError: number;
  };
  warnings: string[];
  /** How the spec was read (e.g. an inverting gain given as a magnitude). */
  notes: string[];
  monteCarlo?: MonteCarloResult;
  /** With a `sensor` in the spec: the thresholds in the sensor's units. */
  sensor?: SensorReport;
}

const ROLE_ORDER: Role[] = ["rInput", "rGround", "rReference", "rTop", "rBottom", "rFeedback", "rTiming", "cTiming"];
const ROLE_NOTE: Record<Role, string> = {
  rInput: "input to the summing pin",
  rGround: "inverting pin to the reference",
  rReference: "reference to the non-inverting pin",
  rTop: "reference divider, positive supply to the reference node",
  rBottom: "reference divider, reference node to the negative supply",
  rFeedback: "output to the summing pin",
  rTiming: "output to the capacitor node (inverting pin)",
  cTiming: "capacitor node to 0 V",
};

function noteOf(
  role: Role,
  divider: { top?: number; bottom?: number } | undefined,
  supply: { positive: number; negative: number },
): string {
  const name = (v: number) =>
    v === 0 ? "0 V" : v === supply.positive ? `the positive supply (${v} V)` : `the negative supply (${v} V)`;
  if (role === "rTop" && divider)
    return `reference divider, ${name(divider.top ?? supply.positive)} to the reference node`;
  if (role === "rBottom" && divider)
    return `reference divider, reference node to ${name(divider.bottom ?? supply.negative)}`;
  return ROLE_NOTE[role];
}

/** Validate a spec (zod) and design it; throws DesignSpecError (bad fields) or DesignError (unreachable). */
export function design(input: unknown): DesignResult {
  const parsed = designSpecSchema.safeParse(input);
  if (!parsed.success) throw new DesignSpecError(describeIssues(parsed.error));
  const spec = parsed.data;
  const result = spec.output
    ? designOpenDrain(spec, spec.output)
    : asBuilt(spec, spec.sensor ? designWithSensor(spec, spec.sensor) : designVolts(spec));
  return spec.filter ? withFilterSuggestion(spec, spec.filter, result) : result;
}

/**
 * RC filter for a wanted bounce time: after a step from 0 V to `step` at the filter input, the
 * stage input reaches the upper switching point Vth at t = RC·ln(step/(step − Vth)) (first-order
 * RC step response), so RC = bounceTime / ln(step/(step − Vth)). The capacitor comes from E6 in
 * 1 nF–10 µF and the resistor from the spec's series in its range, the pair nearest that RC.
 * The input resistance of a current-drawing stage is left out (it shortens the time slightly).
 */
function withFilterSuggestion(
  spec: DesignSpec,
  f: NonNullable<DesignSpec["filter"]>,
  result: DesignResult,
): DesignResult {
  const step = f.step ?? spec.supply.positive;
  const vth = result.achieved.upperThreshold;
  if (vth === null || !(step > vth && vth > 0))
    throw new DesignError(
      "filter",
      `filter.step (${step} V) must be above the upper switching point (${vth === null ? "none" : `${Number(vth.toPrecision(4))} V`}) at the stage input, and that point above 0 V`,
    );
  const rc = f.bounceTime / Math.log(step / (step - vth));
  const range = spec.range ?? { min: 1e3, max: 1e6 };
  let best: { r: number; c: number; err: number } | null = null;
  for (const c of seriesInRange("E6", 1e-9, 10e-6)) {
    const r = snapToSeries(rc / c, spec.series as SeriesName);
    if (r < range.min || r > range.max) continue;
    const err = Math.abs(Math.log((r * c) / rc));
    if (!best || err < best.err) best = { r, c, err };
  }
  if (!best)
    throw new DesignError(
      "filter",
      `no ${spec.series} resistor in ${formatQuantity(range.min, "Ω")}–${formatQuantity(range.max, "Ω")} with an E6 capacitor gives RC = ${formatQuantity(rc, "s")}`,
    );
  const filter = { r: best.r, c: best.c };
  const nR = result.parts.filter((p) => p.ref.startsWith("R")).length;
  const nC = result.parts.filter((p) => p.ref.startsWith("C")).length;
  const parts: DesignPart[] = [
    ...result.parts,
    {
      ref: `R${nR + 1}`,
      role: "filterR",
      value: best.r,
      series: spec.series as SeriesName,
      code: formatRkm(best.r),
      tolerance: result.assumptions.tolerance,
      note: "RC filter, sensor output to the stage input",
    },
    {
      ref: `C${nC + 1}`,
      role: "filterC",
      value: best.c,
      series: "E6",
      code: formatQuantity(best.c, "F"),
      tolerance: 0.05,
      note: "RC filter, stage input to 0 V",
    },
  ];
  const delay = best.r * best.c * Math.log(step / (step - vth));
  return {
    ...result,
    filter,
    parts,
    notes: [
      ...result.notes,
      `filter: RC = ${formatQuantity(best.r * best.c, "s")} (${formatRkm(best.r)} with ${formatQuantity(best.c, "F")}) holds a ${formatQuantity(step, "V")} step below the ${formatQuantity(vth, "V", 4)} switching point for ${formatQuantity(delay, "s", 3)} (wanted ${formatQuantity(f.bounceTime, "s", 3)})`,
    ],
  };
}

/** The pull-up when the spec does not give one: 10 kΩ snapped to the series (common practice, no source). */
export const DEFAULT_PULL_UP = 10e3;

/**
 * Open-drain output: while released, the pin sits where the pull-up (and load) and the feedback
 * network put it, so the stage is designed for that loaded high level. The level depends on the
 * network chosen, so the design repeats with the level the previous network gives until it
 * settles (a few rounds: the feedback resistors are large against the pull-up).
 */
function designOpenDrain(spec: DesignSpec, out: NonNullable<DesignSpec["output"]>): DesignResult {
  const pullUp = out.pullUp ?? snapToSeries(DEFAULT_PULL_UP, spec.series as SeriesName);
  const output = {
    kind: "open-drain" as const,
    pullUp,
    ...(out.pullUpTo !== undefined ? { pullUpTo: out.pullUpTo } : {}),
    ...(out.load ? { load: out.load } : {}),
  };
  const pullTo = out.pullUpTo === undefined || out.pullUpTo === "positive" ? spec.supply.positive : out.pullUpTo;
  const pin = out.load
    ? {
        v: (pullTo * out.load.r + (out.load.to ?? 0) * pullUp) / (pullUp + out.load.r),
        r: (pullUp * out.load.r) / (pullUp + out.load.r),
      }
    : { v: pullTo, r: pullUp };
  let high = pin.v;
  let result: DesignResult | null = null;
  let bestError = Infinity;
  // Error of the as-built circuit (loaded high level) against the spec's own targets.
  const asBuiltError = (r: DesignResult) => {
    const pairs: [number | null, number | undefined][] = r.sensor
      ? [
          [r.sensor.achieved.upperThreshold, r.sensor.target.upperThreshold],
          [r.sensor.achieved.lowerThreshold, r.sensor.target.lowerThreshold],
        ]
      : [
          [r.achieved.upperThreshold, spec.target.upperThreshold ?? spec.target.threshold],
          [r.achieved.lowerThreshold, spec.target.lowerThreshold ?? spec.target.threshold],
        ];
    let worst = 0;
    for (const [a, t] of pairs)
      if (t !== undefined)
        worst = Math.max(worst, a === null ? Infinity : Math.abs(a - t) / Math.max(Math.abs(t), 1e-12));
    return worst;
  };
  for (let round = 0; round < 12; round++) {
    const loaded: DesignSpec = {
      ...spec,
      output: undefined,
      opamp: { ...spec.opamp, outputHeadroomHigh: spec.supply.positive - high },
    };
    const candidate = asBuilt(
      loaded,
      loaded.sensor ? designWithSensor(loaded, loaded.sensor) : designVolts(loaded),
      output,
      spec,
    );
    // The network changes with the level it is designed for; keep the round whose as-built circuit comes closest.
    const err = asBuiltError(candidate);
    if (err < bestError) {
      bestError = err;
      result = candidate;
    }
    const st = candidate.stage;
    // The released pin's level with this network [derived, nodal analysis]:
    let next = pin.v;
    if (st.kind === "schmitt-inverting")
      next = (pin.v * (st.rReference + st.rFeedback) + st.reference * pin.r) / (pin.r + st.rReference + st.rFeedback);
    else if (st.kind === "schmitt-noninverting") {
      const u = candidate.achieved.lowerThreshold ?? st.reference;
      const s = st.rInput + st.rFeedback;
      next = (pin.v * s + u * pin.r) / (pin.r + s);
    }
    if (Math.abs(next - high) < 1e-9 * Math.max(1, Math.abs(high))) break;
    // Damped: a network designed for one level may load the pin differently; halve the step.
    high = round < 2 ? next : (high + next) / 2;
  }
  const r = result!;
  const maxError = r.assumptions.maxError;
  if (bestError > maxError)
    r.warnings.push(
      `open-drain output: with the loaded high level the best ${spec.series} network is ${(100 * bestError).toFixed(2)} % off a target (maxError ${(100 * maxError).toFixed(1)} %); a smaller pull-up or larger feedback resistors load it less`,
    );
  r.notes.push(
    `open-drain output: ${formatRkm(pullUp)} pull-up to ${formatQuantity(pullTo, "V")}; the thresholds are designed with the loaded high level ${formatQuantity(high, "V", 4)} (pull-up against the feedback network)`,
  );
  return r;
}

const encodeEnd = (v: number, supply: { positive: number; negative: number }, bottom: boolean) =>
  v === supply.positive ? "positive" : bottom && v === 0 ? "ground" : v === supply.negative ? "negative" : v;

/**
 * The circuit as built: the stage with its reference divider (no Thevenin stand-in), the source,
 * every resistor in `parts`, and the worst case over every part of that network plus the supply
 * tolerance and the NTC's R25/Beta tolerance (lib/design/spread, the same function the summary and
 * the tolerance spread study use).
 */
function asBuilt(
  spec: DesignSpec,
  result: DesignResult,
  output?: { kind: "open-drain"; pullUp: number; pullUpTo?: "positive" | number; load?: { r: number; to?: number } },
  original: DesignSpec = spec,
): DesignResult {
  const div = result.reference.divider;
  let stage: ScenarioInput["stage"] = result.stage;
  if (div) {
    const { reference: _r, ...rest } = result.stage as Stage & Record<string, unknown>;
    void _r;
    const plain = { ...rest } as Record<string, unknown>;
    if (result.stage.kind === "schmitt-inverting" || result.stage.kind === "relaxation-oscillator")
      delete plain.rReference;
    plain.referenceDivider = {
      rTop: div.rTop,
      rBottom: div.rBottom,
      top: encodeEnd(div.top, spec.supply, false),
      bottom: encodeEnd(div.bottom, spec.supply, true),
    };
    stage = plain as ScenarioInput["stage"];
  }
  const parts = [...result.parts];
  const tolerance = result.assumptions.tolerance;
  const sensor = spec.sensor;
  const addPart = (role: SourceRole, value: number, note: string) =>
    parts.push({
      ref: `R${parts.filter((p) => p.ref.startsWith("R")).length + 1}`,
      role,
      value,
      series: spec.series,
      code: formatRkm(value),
      tolerance,
      note,
    });
  if (sensor?.kind === "divider") {
    addPart("sourceTop", sensor.rTop, "source divider, source to the sensing node (given in the spec)");
    addPart("sourceBottom", sensor.rBottom, "source divider, sensing node to 0 V (given in the spec)");
  } else if (sensor?.kind === "ntc") {
    addPart(
      "sourceFixed",
      sensor.rFixed,
      `fixed resistor of the NTC divider (${sensor.position === "bottom" ? "top" : "bottom"}; given in the spec)`,
    );
  }
  if (output) addPart("pullUp", output.pullUp, "pull-up, output pin to the pull-up rail (open-drain output)");
  const source = sensor ? { sensor } : undefined;
  if (sensor?.kind === "ntc" && CURRENT_DRAWING_KINDS.includes(spec.kind))
    throw new DesignError(
      "sensor",
      `an NTC cannot feed the ${spec.kind} input: that input draws current and the NTC's resistance changes with temperature; use schmitt-inverting or the comparator (a high-impedance input)`,
    );
  const scenario = parseScenario({
    schema: "railwise.scenario/1",
    supply: original.supply,
    opamp: original.opamp,
    stage,
    ...(source ? { source } : {}),
    ...(output ? { output } : {}),
    tolerances: {
      resistor: tolerance,
      ...(result.assumptions.capacitorTolerance !== undefined
        ? { capacitor: result.assumptions.capacitorTolerance }
        : {}),
    },
    input: { components: [{ kind: "dc", level: 0 }] },
    run: { duration: 1, points: 2 },
  });
  const wc = circuitWorstCase(scenario, { headroomSpread: result.assumptions.headroomSpread });
  const worst = { ...result.worstCase };
  for (const n of FIGURE_NAMES) worst[n] = wc[n];
  const out: DesignResult = {
    ...result,
    stage: scenario.stage,
    parts,
    worstCase: worst,
    ...(source ? { source } : {}),
    ...(output ? { output } : {}),
  };
  if (output) {
    // Achieved figures of the as-built circuit (loaded high level), not of the stand-in part.
    const n = wc.nominal;
    out.achieved = {
      ...out.achieved,
      upperThreshold: n.upperThreshold,
      lowerThreshold: n.lowerThreshold,
      hysteresis: n.hysteresis,
    };
    out.kind = original.kind;
  }
  if (result.sensor) {
    out.sensor = {
      ...result.sensor,
      ...(output
        ? {
            achieved: {
              upperThreshold: wc.nominal.sourceUpperThreshold,
              lowerThreshold: wc.nominal.sourceLowerThreshold,
            },
          }
        : {}),
      worstCase: { upperThreshold: wc.sourceUpperThreshold, lowerThreshold: wc.sourceLowerThreshold },
    };
  }
  return out;
}

export interface SensorReport {
  kind: DesignSensor["kind"];
  unit: string;
  /** Rising quantity → falling stage input (an NTC at the bottom of its divider). */
  inverted: boolean;
  target: { upperThreshold: number; lowerThreshold: number };
  /** The voltage thresholds the stage was designed for. */
  voltageTarget: { upperThreshold: number; lowerThreshold: number };
  achieved: { upperThreshold: number | null; lowerThreshold: number | null };
  worstCase: { upperThreshold: Interval | null; lowerThreshold: Interval | null };
  /** NTC: self-heating at the warmer threshold (the larger power for an NTC at the bottom … or top). */
  selfHeating?: {
    atThreshold: number;
    power: number;
    temperatureRise: number;
    limit: number;
    dissipationConstant: number;
  };
}

/** Thresholds in sensor units → stage-input volts → design → back to sensor units. */
function designWithSensor(spec: DesignSpec, sensor: DesignSensor): DesignResult {
  // The schema gives a sensor to the threshold kinds only.
  if (spec.kind !== "comparator" && spec.kind !== "schmitt-inverting" && spec.kind !== "schmitt-noninverting")
    throw new DesignError("sensor", `a sensor applies to threshold stages only, not to ${spec.kind}`);
  const fe = sensorFrontEnd(sensor as SensorSpec, spec.supply.positive);
  const { upper, lower } = thresholdsOf(spec.target);
  const vUpper = fe.toVolts(upper);
  const vLower = fe.toVolts(lower);
  const voltageTarget = { upperThreshold: Math.max(vUpper, vLower), lowerThreshold: Math.min(vUpper, vLower) };
  const voltsSpec: DesignSpec =
    spec.kind === "comparator" && spec.target.threshold !== undefined
      ? { ...spec, sensor: undefined, target: { threshold: voltageTarget.upperThreshold } }
      : { ...spec, sensor: undefined, target: voltageTarget };
  // The stage's upper voltage threshold belongs to the lower quantity when the sensor inverts.
  const swap = (fig: string) =>
    fe.inverted
      ? (({ upperThreshold: "lowerThreshold", lowerThreshold: "upperThreshold" } as Record<string, string>)[fig] ?? fig)
      : fig;
  let result: DesignResult;
  try {
    result = designVolts(voltsSpec);
  } catch (e) {
    if (e instanceof DesignError) {
      const map = `target ${upper} / ${lower} ${fe.unit} is ${fmtV(vUpper)} / ${fmtV(vLower)} at the stage input`;
      throw new DesignError(
        e.figure === "threshold" ? e.figure : swap(e.figure),
        `${e.detail} (through the sensor: ${map})`,
      );
    }
    throw e;
  }
  const units = (v: number | null) => (v === null ? null : fe.toUnits(v));
  const a = result.achieved;
  const interval = (w: Interval | null): Interval | null => {
    if (!w) return null;
    const x = units(w[0]);
    const y = units(w[1]);
    return x === null || y === null ? null : [Math.min(x, y), Math.max(x, y)];
  };
  const upperV = fe.inverted ? "lowerThreshold" : "upperThreshold";
  const lowerV = fe.inverted ? "upperThreshold" : "lowerThreshold";
  const report: SensorReport = {
    kind: sensor.kind,
    unit: fe.unit,
    inverted: fe.inverted,
    target: { upperThreshold: upper, lowerThreshold: lower },
    voltageTarget,
    achieved: { upperThreshold: units(a[upperV]), lowerThreshold: units(a[lowerV]) },
    worstCase: {
      upperThreshold: interval(result.worstCase[upperV]),
      lowerThreshold: interval(result.worstCase[lowerV]),
    },
  };
  if (fe.selfHeating && sensor.kind === "ntc") {
    // The NTC dissipates most where its resistance is nearest rFixed; check both thresholds.
    const [h1, h2] = [upper, lower].map((x) => ({ x, h: fe.selfHeating!(x) }));
    const worst = h1.h.power >= h2.h.power ? h1 : h2;
    report.selfHeating = {
      atThreshold: worst.x,
      power: worst.h.power,
      temperatureRise: worst.h.temperatureRise,
      limit: worst.h.limit,
      dissipationConstant: sensor.dissipationConstant ?? 1e-3,
    };
    if (worst.h.warning) result.warnings.push(worst.h.warning);
    if (sensor.dissipationConstant === undefined)
      result.notes.push(
        "sensor.dissipationConstant not given: self-heating assumes δ = 1 mW/K (a small bead in still air; common practice, no source)",
      );
  }
  if (fe.inverted)
    result.notes.push(
      `the sensor inverts: the stage's upper voltage threshold is the lower ${fe.unit} threshold and vice versa`,
    );
  return { ...result, sensor: report };
}

function fmtV(v: number): string {
  return `${Number(v.toPrecision(5))} V`;
}

function designVolts(spec: DesignSpec): DesignResult {
  const ctx = contextOf(spec);
  const best = synthesize(ctx);
  const tolerance = spec.tolerance ?? SERIES_TOLERANCE[spec.series];
  const capacitorTolerance = spec.capacitorTolerance ?? 0.05;
  const headroomSpread = spec.headroomSpread ?? DEFAULT_HEADROOM_SPREAD;
  const capSeries = (spec.capacitorSeries ?? "E6") as SeriesName;

  const parts: DesignPart[] = [];
  let rIndex = 0;
  for (const role of ROLE_ORDER) {
    const value = best.values[role];
    if (value === undefined) continue;
    const isCap = role === "cTiming";
    parts.push({
      ref: isCap ? "C1" : `R${++rIndex}`,
      role,
      value,
      series: isCap ? capSeries : spec.series,
      code: isCap ? formatQuantity(value, "F") : formatRkm(value),
      tolerance: isCap ? capacitorTolerance : tolerance,
      note: noteOf(role, best.divider, spec.supply),
    });
  }

  const spreadOptions = { capacitorTolerance, headroomSpread, divider: best.divider };
  const wc = worstCase(best.stage, spec.opamp, spec.supply, tolerance, spreadOptions);
  const worst = {} as Record<FigureName, Interval | null>;
  for (const n of FIGURE_NAMES) worst[n] = wc[n];

  const errors: DesignResult["errors"] = {};
  const window: Partial<Record<FigureName, Interval>> = {};
  for (const [name, t] of Object.entries(ctx.targets) as [FigureName, { value: number; scale: number }][]) {
    const a = best.figures[name]!;
    errors[name] = { target: t.value, achieved: a, deviation: a - t.value, relative: (a - t.value) / t.scale };
    window[name] = [t.value - ctx.maxError * t.scale, t.value + ctx.maxError * t.scale];
  }

  const warnings = [...ctx.warnings];
  const notes: string[] = [];
  if (spec.kind === "inverting-amplifier" && spec.target.gain > 0)
    notes.push(
      `target.gain ${spec.target.gain} read as the magnitude of an inverting gain: vo/vin = −${spec.target.gain}`,
    );
  if (spec.kind === "relaxation-oscillator")
    notes.push(
      'the duty cycle is set by the reference: it moves the switching points off the centre of the output swing (reference "auto" solves it); thresholds here are null, the capacitor switching points are internal',
    );
  for (const [name, e] of Object.entries(errors)) {
    if (Math.abs(e.relative) > ctx.maxError)
      warnings.push(
        `${name}: the best ${spec.series} combination is ${(100 * Math.abs(e.relative)).toFixed(2)} % off the target (maxError ${(100 * ctx.maxError).toFixed(2)} %); a finer series would come closer`,
      );
  }
  for (const [name, win] of Object.entries(window) as [FigureName, Interval][]) {
    const w = worst[name];
    if (w && (w[0] < win[0] || w[1] > win[1]))
      warnings.push(
        `${name}: the worst case ${fmtRange(w)} leaves the ±${(100 * ctx.maxError).toFixed(1)} % window ${fmtRange(win)}; tighter tolerance or a lower-offset part would help`,
      );
  }
  if (worst.hysteresis && best.figures.hysteresis! > 0 && worst.hysteresis[0] <= 0)
    warnings.push("hysteresis: at a worst-case corner the deadband closes; the stage may chatter");
  if (spec.kind === "relaxation-oscillator") {
    if (worst.frequency && worst.frequency[0] <= 0)
      warnings.push(
        "frequency: at a worst-case corner the switching points leave the output swing and the stage stops oscillating",
      );
    const { high, low } = ctx.cond;
    const edge = (high - low) / Math.min(spec.opamp.slewRate, spec.opamp.slewRateFall ?? spec.opamp.slewRate);
    const period = 1 / best.figures.frequency!;
    if (edge > 0.01 * period)
      warnings.push(
        `frequency: each output edge takes ${formatQuantity(edge, "s")} at the slew rate, ${((100 * edge) / period).toFixed(1)} % of the period; the measured frequency will be lower`,
      );
  }

  const mcSetting = spec.monteCarlo;
  const mc =
    mcSetting === false
      ? undefined
      : monteCarlo(best.stage, spec.opamp, spec.supply, {
          ...spreadOptions,
          tolerance,
          draws: mcSetting?.draws ?? 2000,
          seed: mcSetting?.seed ?? 1,
          distribution: mcSetting?.distribution ?? "uniform",
          bins: mcSetting?.bins ?? 20,
          window,
        });

  const f = best.figures;
  return {
    schema: DESIGN_SCHEMA_ID,
    kind: spec.kind,
    stage: best.stage,
    parts,
    achieved: {
      upperThreshold: f.upperThreshold,
      lowerThreshold: f.lowerThreshold,
      gain: f.gain,
      hysteresis: f.hysteresis,
      frequency: f.frequency,
      dutyCycle: f.dutyCycle,
    },
    worstCase: worst,
    errors,
    reference: {
      mode: best.referenceMode,
      voltage: best.stage.reference,
      ...(best.divider
        ? {
            divider: {
              rTop: best.divider.rTop,
              rBottom: best.divider.rBottom,
              top: best.divider.top ?? spec.supply.positive,
              bottom: best.divider.bottom ?? spec.supply.negative,
              theveninResistance:
                (best.divider.rTop * best.divider.rBottom) / (best.divider.rTop + best.divider.rBottom),
            },
          }
        : {}),
    },
    assumptions: {
      tolerance,
      ...(spec.kind === "relaxation-oscillator" ? { capacitorTolerance } : {}),
      inputOffset: Math.abs(spec.opamp.inputOffset),
      headroomSpread,
      range: ctx.range,
      maxError: ctx.maxError,
    },
    warnings,
    notes,
    ...(mc ? { monteCarlo: mc } : {}),
  };
}

function fmtRange([a, b]: Interval): string {
  return `[${Number(a.toPrecision(4))}, ${Number(b.toPrecision(4))}]`;
}

export class DesignSpecError extends Error {
  constructor(readonly issues: string[]) {
    super(`Invalid design spec:\n  ${issues.join("\n  ")}`);
    this.name = "DesignSpecError";
  }
}

export function isDesignError(e: unknown): e is DesignError | DesignSpecError {
  return e instanceof DesignError || e instanceof DesignSpecError;
}
