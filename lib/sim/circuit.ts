// The circuit as built (lib/schemas/README.md): lowers a scenario with a source (divider, NTC or linear
// sensor), a reference divider, an RC filter and an output stage to the plain scenario the solver
// understands, plus the pieces the solver needs (filter node, output stage) and the mapping that
// reads results back in source units. Pure TypeScript: no React, Next or database.
import {
  CURRENT_DRAWING_KINDS,
  referenceDividerThevenin,
  type InputComponent,
  type Scenario,
  type Stage,
} from "@/lib/schemas/scenario";
import { sensorFrontEnd, type SensorSpec } from "@/lib/design/sensors";
import { InputSignal, evaluateInputSignal } from "./signals";
import { SimFailed } from "./errors";
import type { SimResult } from "./types";

export interface SourceMap {
  unit: string;
  quantity: string | null;
  /** Rising source value gives a falling stage-input voltage (NTC at the bottom, negative slope). */
  inverted: boolean;
  /** Affine sensors (divider, linear) map each waveform component exactly. */
  affine: boolean;
  toVolts(x: number): number;
  /** Null when the voltage is outside what the sensor can produce. */
  toSource(v: number): number | null;
  /** Thevenin resistance of the sensor output at source value x (Ω). */
  resistance(x: number): number;
  /** The source waveform (source units, without the stage-input noise) at the given times. */
  evaluate(t: Float64Array): Float64Array;
}

export type LoweredOutput =
  | { kind: "push-pull" }
  | { kind: "open-drain"; pullUp: number; pullUpTo: number; load: { r: number; to: number } | null };

export interface LoweredCircuit {
  /** A plain scenario: no source, filter, output, tolerances, spec or referenceDivider. */
  scenario: Scenario;
  /** RC low-pass between the sensor output and the stage input, c to 0 V (r includes the source resistance). */
  filter: { r: number; c: number; rVaries: boolean } | null;
  output: LoweredOutput;
  source: SourceMap | null;
  /** Largest |error| (V) of the NTC resampling at its check points (0 for affine sensors). */
  inputError: number;
}

export interface LowerOptions {
  /** Set by a solver that simulates the filter node; otherwise a filter is refused. */
  allowFilter?: boolean;
  /** Set by a solver that simulates the open-drain output; otherwise it is refused. */
  allowOpenDrain?: boolean;
  /** NTC resampling: largest accepted error at the check points (V); default 50 µV. */
  ntcTolerance?: number;
  /** NTC resampling: most pwl points (default 200,000, the server's table limit). */
  maxPoints?: number;
}

export const NTC_RESAMPLE_TOLERANCE = 50e-6;

const parallel = (a: number, b: number) => (a * b) / (a + b);

/** The source ↔ stage-input mapping of a scenario's `source`, or null. */
export function sourceMap(scenario: Scenario): SourceMap | null {
  const src = scenario.source;
  if (!src) return null;
  const sensor = src.sensor as SensorSpec;
  const excitation =
    sensor.kind === "ntc" ? (sensor.supplyVoltage ?? scenario.supply.positive) : scenario.supply.positive;
  const fe = sensorFrontEnd(sensor, excitation);
  const unit = src.unit ?? (sensor.kind === "divider" ? "V" : sensor.kind === "ntc" ? "°C" : (sensor.unit ?? fe.unit));
  let resistance: (x: number) => number;
  if (sensor.kind === "divider") {
    const r = parallel(sensor.rTop, sensor.rBottom);
    resistance = () => r;
  } else if (sensor.kind === "ntc") {
    // R_ntc from the divider voltage: bottom V = S·Rt/(Rt + Rf), top V = S·Rf/(Rt + Rf).
    resistance = (x) => {
      const v = fe.toVolts(x);
      const rt =
        sensor.position === "bottom" ? (sensor.rFixed * v) / (excitation - v) : (sensor.rFixed * (excitation - v)) / v;
      return parallel(rt, sensor.rFixed);
    };
  } else {
    resistance = () => 0;
  }
  const sourceScenario = { ...scenario, input: { components: scenario.input.components } } as Scenario;
  return {
    unit,
    quantity: src.quantity ?? null,
    inverted: fe.inverted,
    affine: sensor.kind !== "ntc",
    toVolts: (x) => fe.toVolts(x),
    toSource: (v) => fe.toUnits(v),
    resistance,
    evaluate: (t) => {
      let tMax = scenario.run.duration;
      for (let i = 0; i < t.length; i++) if (t[i] > tMax) tMax = t[i];
      return evaluateInputSignal(new InputSignal(sourceScenario, tMax), t);
    },
  };
}

/** v = a·x + b applied to one component (b is added once, by the caller). */
function scaleComponent(c: InputComponent, a: number): InputComponent {
  const flip = a < 0 ? 180 : 0;
  switch (c.kind) {
    case "dc":
      return { kind: "dc", level: a * c.level };
    case "sine":
      return {
        kind: "sine",
        amplitude: Math.abs(a) * c.amplitude,
        frequency: c.frequency,
        phase: (c.phase ?? 0) + flip,
        offset: a * (c.offset ?? 0),
      };
    case "triangle":
      // A symmetric triangle negated is the same triangle half a period later.
      return {
        kind: "triangle",
        amplitude: Math.abs(a) * c.amplitude,
        frequency: c.frequency,
        phase: (c.phase ?? 0) + flip,
        offset: a * (c.offset ?? 0),
      };
    case "ramp":
      return { ...c, from: a * c.from, to: a * c.to };
    case "pulse":
      return { ...c, low: a * c.low, high: a * c.high };
    case "pwl":
      return { kind: "pwl", points: c.points.map(([t, v]) => [t, a * v] as [number, number]) };
    case "capture":
      return { kind: "capture", samples: c.samples.map(([t, v]) => [t, a * v] as [number, number]) };
  }
}

/** Breakpoints of the source waveform within [0, T] (corners and table points), plus sine subdivisions. */
function sourceKnots(components: InputComponent[], T: number, maxPoints: number): number[] {
  const knots: number[] = [0, T];
  const push = (t: number) => {
    if (t > 0 && t < T) knots.push(t);
    if (knots.length > maxPoints)
      throw new SimFailed(
        `the NTC source waveform has more than ${maxPoints} corners over the run; shorten run.duration`,
      );
  };
  for (const c of components) {
    switch (c.kind) {
      case "ramp":
        push(c.start);
        push(c.start + c.duration);
        break;
      case "pwl":
        for (const [t] of c.points) push(t);
        break;
      case "capture":
        for (const [t] of c.samples) push(t);
        break;
      case "pulse": {
        const rise = c.rise ?? 0;
        const fall = c.fall ?? 0;
        const fallStart = Math.min(Math.max(rise, c.duty * c.period), c.period - fall);
        for (let k = 0; (c.delay ?? 0) + k * c.period < T; k++) {
          const t0 = (c.delay ?? 0) + k * c.period;
          for (const d of [0, rise, fallStart, fallStart + fall]) push(t0 + d);
        }
        break;
      }
      case "triangle": {
        // Vertices at phase quarter-turns 1/4 and 3/4 of the period (shifted by the phase).
        const p = 1 / c.frequency;
        const turns = (c.phase ?? 0) / 360;
        const shift = (turns - Math.floor(turns)) * p;
        for (let k = -1; (k * p) / 2 - shift < T; k++) push(p / 4 + (k * p) / 2 - shift);
        break;
      }
      case "sine": {
        const p = 1 / c.frequency;
        for (let k = 1; (k * p) / 32 < T; k++) push((k * p) / 32);
        break;
      }
      case "dc":
        break;
    }
  }
  knots.sort((x, y) => x - y);
  const out: number[] = [];
  for (const t of knots) if (out.length === 0 || t > out[out.length - 1]) out.push(t);
  return out;
}

/**
 * An NTC is nonlinear: the source waveform x(t) is resampled into one pwl stage input v(t) =
 * f(x(t)). Between the waveform's own corners each piece is halved until the pwl is within
 * `tol` of f(x(t)) at three interior check points (t at 1/4, 1/2, 3/4 of the piece).
 */
function resampleNtc(map: SourceMap, components: InputComponent[], T: number, tol: number, maxPoints: number) {
  const knots = sourceKnots(components, T, maxPoints);
  const f = (x: number) => {
    const v = map.toVolts(x);
    if (!Number.isFinite(v)) throw new SimFailed(`the NTC source reaches ${x} ${map.unit}, outside its model`);
    return v;
  };
  const evalAt = (ts: number[]) =>
    Array.from(map.evaluate(Float64Array.from(ts)), (x) => {
      if (!(x > -273.15)) throw new SimFailed(`input: the NTC source reaches ${x} °C, below absolute zero`);
      return f(x);
    });
  const points: [number, number][] = [];
  let worst = 0;
  const refine = (a: number, va: number, b: number, vb: number, depth: number) => {
    const ts = [a + (b - a) / 4, a + (b - a) / 2, a + (3 * (b - a)) / 4];
    const vs = evalAt(ts);
    let err = 0;
    for (let i = 0; i < 3; i++) err = Math.max(err, Math.abs(vs[i] - (va + ((vb - va) * (i + 1)) / 4)));
    if (err > tol && depth < 48 && b - a > 1e-12 * Math.max(1, T)) {
      refine(a, va, ts[1], vs[1], depth + 1);
      refine(ts[1], vs[1], b, vb, depth + 1);
      return;
    }
    worst = Math.max(worst, err);
    points.push([b, vb]);
    if (points.length > maxPoints)
      throw new SimFailed(
        `the NTC source needs more than ${maxPoints} points to stay within ${tol * 1e3} mV; shorten run.duration`,
      );
  };
  for (let k = 0; k + 1 < knots.length; k++) {
    const a = knots[k];
    const b = knots[k + 1];
    // Right value at a, left limit at b (a jump at b shows as two points at b).
    const [va, vbLeft] = evalAt([a, b - (b - a) * 1e-9]);
    if (k === 0) points.push([a, va]);
    else if (Math.abs(points[points.length - 1][1] - va) > 0) points.push([a, va]);
    refine(a, va, b, vbLeft, 0);
  }
  const [vEnd] = evalAt([T]);
  if (Math.abs(points[points.length - 1][1] - vEnd) > 0) points.push([T, vEnd]);
  return { component: { kind: "pwl", points } as InputComponent, error: worst };
}

function plainStage(stage: Stage, scenario: Scenario, seriesInput: number): Stage {
  const { referenceDivider, ...st } = stage as Stage & { referenceDivider?: unknown };
  const out = { ...st } as Record<string, unknown>;
  const div = scenario.stage.referenceDivider;
  if (div) {
    // From the divider itself (a varied draw may have changed it after the parse filled these).
    const th = referenceDividerThevenin(div, scenario.supply);
    out.reference = th.voltage;
    if (stage.kind === "schmitt-inverting" || stage.kind === "relaxation-oscillator") out.rReference = th.resistance;
  }
  if (div && stage.kind === "noninverting-amplifier") {
    // The reference connects through rGround: its Thevenin resistance sits in series (lib/schemas/README.md § The circuit as built).
    out.rGround = stage.rGround + parallel(div.rTop, div.rBottom);
  }
  if (seriesInput > 0 && (stage.kind === "schmitt-noninverting" || stage.kind === "inverting-amplifier")) {
    out.rInput = stage.rInput + seriesInput;
  }
  void referenceDivider;
  return out as Stage;
}

/** Lower a circuit-as-built scenario to the plain scenario plus the filter, output and source mapping. */
export function lowerCircuit(scenario: Scenario, options: LowerOptions = {}): LoweredCircuit {
  const { source: _s, filter: _f, output: _o, tolerances: _t, spec: _sp, ...rest } = scenario;
  if (scenario.filter && !options.allowFilter)
    throw new SimFailed(
      "filter: the RC filter node is not supported by the solver yet; remove filter to run this scenario",
    );
  if (scenario.output?.kind === "open-drain" && !options.allowOpenDrain)
    throw new SimFailed(
      'output: the open-drain output is not supported by the solver yet; use { kind: "push-pull" } to run this scenario',
    );

  const map = sourceMap(scenario);
  let components = scenario.input.components;
  let inputError = 0;
  let rSource = 0;
  let rVaries = false;
  if (map) {
    const sensor = scenario.source!.sensor;
    if (map.affine) {
      const b = map.toVolts(0);
      const a = map.toVolts(1) - b;
      components = components.map((c) => scaleComponent(c, a));
      if (b !== 0) {
        if (components.length >= 64)
          throw new SimFailed("input.components: a linear sensor's offset needs one more component; use at most 63");
        components = [...components, { kind: "dc", level: b }];
      }
      rSource = map.resistance(0);
    } else {
      const r = resampleNtc(
        map,
        components,
        scenario.run.duration,
        options.ntcTolerance ?? NTC_RESAMPLE_TOLERANCE,
        options.maxPoints ?? 200_000,
      );
      components = [r.component];
      inputError = r.error;
      const x0 = map.evaluate(Float64Array.of(0))[0];
      rSource = map.resistance(x0);
      rVaries = true;
    }
    void sensor;
  }
  const drawsCurrent = CURRENT_DRAWING_KINDS.includes(scenario.stage.kind);
  const filter = scenario.filter
    ? { r: scenario.filter.r + rSource, c: scenario.filter.c, rVaries: rVaries && rSource > 0 }
    : null;
  const stage = plainStage(scenario.stage, scenario, !filter && drawsCurrent ? rSource : 0);
  const out = scenario.output;
  const output: LoweredOutput =
    out?.kind === "open-drain"
      ? {
          kind: "open-drain",
          pullUp: out.pullUp,
          pullUpTo: out.pullUpTo === undefined || out.pullUpTo === "positive" ? scenario.supply.positive : out.pullUpTo,
          load: out.load ? { r: out.load.r, to: out.load.to ?? 0 } : null,
        }
      : { kind: "push-pull" };
  return {
    scenario: { ...rest, stage, input: { ...scenario.input, components } } as Scenario,
    filter,
    output,
    source: map,
    inputError,
  };
}

export interface SourceMetrics {
  unit: string;
  upperThreshold: number | null;
  lowerThreshold: number | null;
  hysteresis: number | null;
}

export interface SourceReadings {
  /** The source waveform at the result's sample times (source units). */
  source: Float64Array;
  /** Per event: the source value at the edge (from the stage input at the edge), null when outside the sensor's range. */
  events: (number | null)[];
  metrics: SourceMetrics;
}

/**
 * Results in source units. Thresholds keep the volt metrics' definitions: the source value at
 * the stage-input threshold. An inverting sensor (NTC at the bottom of its divider, negative
 * slope) turns the stage's upper voltage threshold into the lower source threshold, so a rising
 * °C may cause the falling-volts edge.
 */
export function sourceReadings(
  lowered: LoweredCircuit,
  result: Pick<SimResult, "t" | "events" | "metrics">,
): SourceReadings | null {
  const map = lowered.source;
  if (!map) return null;
  const conv = (v: number | null) => (v === null ? null : map.toSource(v));
  const m = result.metrics;
  const up = conv(map.inverted ? m.lowerThreshold : m.upperThreshold);
  const low = conv(map.inverted ? m.upperThreshold : m.lowerThreshold);
  return {
    source: map.evaluate(result.t),
    events: result.events.map((e) => conv(e.input)),
    metrics: {
      unit: map.unit,
      upperThreshold: up,
      lowerThreshold: low,
      hysteresis: up !== null && low !== null ? up - low : null,
    },
  };
}

/**
 * The result of the lowered run in the as-built terms: with a source, `source` samples,
 * `events[].source` and `metrics.source` (lib/schemas/README.md result additions). Without one, unchanged.
 */
export function attachSourceReadings<R extends SimResult>(lowered: LoweredCircuit, result: R): R {
  const readings = sourceReadings(lowered, result);
  if (!readings) return result;
  const events = result.events.map((e, i) => (readings.events[i] === null ? e : { ...e, source: readings.events[i]! }));
  return { ...result, source: readings.source, events, metrics: { ...result.metrics, source: readings.metrics } };
}
