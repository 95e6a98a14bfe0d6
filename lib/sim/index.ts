// Simulation core entry point: pure TypeScript (no React, Next or database), shared by the web
// worker, the CLIs, the server and the tests.
import type { Scenario } from "@/lib/schemas/scenario";
import type { ResultJson, SimOptions, SimResult, SolverName } from "./types";
import { InputSignal, evaluateInputSignal } from "./signals";
import {
  buildNetwork,
  withFilter,
  defaultInitialOutput,
  highLevelAt,
  initialCapacitor,
  openDrainHigh,
  outputLimits,
  settledState,
} from "./network";
import { SimFailed } from "./errors";
import { Recorder, amplifierMetrics, defaultHoldOff, finishMetrics } from "./measure";
import { ExactSolver, type ExactParams } from "./exact";
import { runOdex } from "./odex-solver";
import { noiseSegmentCount } from "./noise";
import { attachSourceReadings, lowerCircuit } from "./circuit";

export { SimCancelled, SimFailed } from "./errors";
export { defaultInitialOutput, isAmplifierKind, outputLimits } from "./network";
export type * from "./types";

/** Uniform sample times over [0, duration], both ends included. */
export function sampleTimes(duration: number, points: number): Float64Array {
  const t = new Float64Array(points);
  const dt = duration / (points - 1);
  for (let i = 0; i < points; i++) t[i] = i * dt;
  t[points - 1] = duration;
  return t;
}

/** The scenario's input signal (components + noise) at the given times. */
export function evaluateInput(scenario: Scenario, t: Float64Array): Float64Array {
  let tMax = scenario.run.duration;
  for (let i = 0; i < t.length; i++) if (t[i] > tMax) tMax = t[i];
  return evaluateInputSignal(new InputSignal(scenario, tMax), t);
}

export function simulate(asBuilt: Scenario, options: SimOptions = {}): SimResult {
  const started = performance.now();
  // The circuit as built (source, reference divider, filter, output) lowered to the plain stage
  // plus the filter node and the output stage (lib/sim/circuit).
  const circuit = lowerCircuit(asBuilt, { allowFilter: true, allowOpenDrain: true });
  const scenario = circuit.scenario;
  const solverName: SolverName = options.solver ?? scenario.run.solver ?? "exact";
  const duration = scenario.run.duration;
  // The signal lives only inside this call, so its noise knots go back for the next run.
  const signal = new InputSignal(scenario, duration, true);
  try {
    return simulateWith(circuit, scenario, signal, solverName, options, started);
  } finally {
    signal.release();
  }
}

function simulateWith(
  circuit: ReturnType<typeof lowerCircuit>,
  scenario: Scenario,
  signal: InputSignal,
  solverName: SolverName,
  options: SimOptions,
  started: number,
): SimResult {
  const duration = scenario.run.duration;
  const plainNet = buildNetwork(scenario);
  const net = circuit.filter ? withFilter(plainNet, scenario, circuit.filter) : plainNet;
  const rails = outputLimits(scenario);
  const u0 = signal.valueAt(0);
  if (circuit.output.kind === "open-drain") {
    // The pin's high level is set by the pull-up, the load and the feedback network; at t = 0
    // (with the state for a low output) it stands in for Voh in the recorder's levels.
    net.high = openDrainHigh(scenario, circuit.output, circuit.filter !== null);
    rails.high = highLevelAt(net.high, u0, initialCapacitor(net, u0, rails.low));
    if (!(rails.high > rails.low))
      throw new SimFailed(
        `output: the open-drain high level (${rails.high.toPrecision(4)} V, from the pull-up, load and feedback) is not above the low level ${rails.low} V; check output.pullUpTo and output.load`,
      );
  }
  const op = scenario.opamp;
  const td = op.propagationDelay ?? 0;
  const t = sampleTimes(duration, scenario.run.points);
  const output = new Float64Array(t.length);
  const capacitor =
    scenario.stage.kind === "relaxation-oscillator" || circuit.filter ? new Float64Array(t.length) : null;
  const recorder = new Recorder(rails, signal, td);
  const start = scenario.run.initialOutput ?? defaultInitialOutput(scenario.stage.kind);
  let vo0: number;
  let x0: number;
  if (start === "settled") ({ vo: vo0, x: x0 } = settledState(net, u0, op.openLoopGain, rails));
  else {
    vo0 = start === "high" ? rails.high : rails.low;
    x0 = initialCapacitor(net, u0, vo0);
  }
  const params: ExactParams = {
    net,
    signal,
    rails,
    openLoopGain: op.openLoopGain,
    gainBandwidth: op.gainBandwidth,
    slewRate: op.slewRate,
    slewRateFall: op.slewRateFall ?? op.slewRate,
    propagationDelay: td,
    duration,
    vo0,
    x0,
    sampleTimes: t,
    output,
    capacitor,
    recorder,
    trackVd: !net.amplifier,
    onProgress: options.onProgress,
    shouldCancel: options.shouldCancel,
    maxSteps: options.maxSteps,
  };
  let steps: number;
  let evaluations: number;
  let firstHigh: number;
  if (solverName === "odex") {
    ({ steps, evaluations, firstHigh } = runOdex(params));
  } else {
    params.maxSteps ??= defaultPieceBudget(scenario);
    const s = new ExactSolver(params);
    s.run();
    steps = s.steps;
    evaluations = s.evaluations;
    firstHigh = s.firstHigh;
  }
  // An open drain's high level: the loaded level at the first high state (DEVELOPERS.md).
  const resultRails = net.high && Number.isFinite(firstHigh) ? { high: firstHigh, low: rails.low } : rails;
  const holdOff = options.holdOff ?? scenario.run.holdOff ?? defaultHoldOff(duration, signal.longestPeriod);
  const metrics = finishMetrics(recorder, {
    duration,
    holdOff,
    inverting: net.inverting,
    amplifier: net.amplifier,
    inputConnected: net.alpha !== 0 || (net.state?.kappaU ?? 0) !== 0,
  });
  const input = evaluateInputSignal(signal, t);
  if (net.amplifier) {
    const A0 = op.openLoopGain;
    metrics.amplifier = amplifierMetrics(recorder, (A0 * net.alpha) / (1 - A0 * net.beta));
  }
  return attachSourceReadings(circuit, {
    rails: resultRails,
    t,
    input,
    output,
    ...(capacitor !== null ? (circuit.filter ? { filtered: capacitor } : { capacitor }) : {}),
    events: recorder.events,
    metrics,
    solver: { name: solverName, steps, evaluations, wallMs: performance.now() - started },
  });
}

/** Input corners, table points and noise segments over the run, and an oscillator's edges. */
function runWork(scenario: Scenario): { segments: number; table: number; corners: number; edges: number } {
  const T = scenario.run.duration;
  const noise = scenario.input.noise;
  const segments = noise && noise.rms > 0 ? noiseSegmentCount(noise, T) : 0;
  let table = 0;
  let corners = 0;
  for (const c of scenario.input.components) {
    if (c.kind === "pwl") table += c.points.length;
    else if (c.kind === "capture") table += c.samples.length;
    else if (c.kind === "pulse") corners += (4 * T) / c.period;
    else if (c.kind === "triangle") corners += 2 * T * c.frequency;
    else if (c.kind === "sine") corners += 8 * T * c.frequency;
  }
  const cycles = oscillatorCycles(scenario);
  return { segments, table, corners, edges: cycles === null ? 0 : 2 * cycles };
}

/**
 * The exact solver's default piece budget: a million pieces plus 16 per unit of work (input
 * corner, table point, noise segment, oscillator edge). A healthy run uses a few pieces per
 * unit; a run that uses all of them is stuck and fails with the time it reached.
 */
export function defaultPieceBudget(scenario: Scenario): number {
  const w = runWork(scenario);
  return Math.ceil(1_000_000 + 16 * (w.segments + w.table + w.corners + w.edges));
}

const plain = (a: Float64Array) => Array.from(a);

export function toResultJson(result: SimResult): ResultJson {
  return {
    schema: "railwise.result/1",
    rails: { ...result.rails },
    samples: {
      t: plain(result.t),
      input: plain(result.input),
      output: plain(result.output),
      ...(result.capacitor ? { capacitor: plain(result.capacitor) } : {}),
      ...(result.filtered ? { filtered: plain(result.filtered) } : {}),
      ...(result.source ? { source: plain(result.source) } : {}),
    },
    events: result.events.map((e) => ({ ...e })),
    metrics: { ...result.metrics, ...(result.metrics.amplifier ? { amplifier: { ...result.metrics.amplifier } } : {}) },
    solver: { ...result.solver },
  };
}

/** Samples as CSV with a header `t,input,output[,capacitor]` (full double precision). */
export function resultToCsv(result: SimResult): string {
  const cap = result.capacitor;
  const lines = [cap ? "t,input,output,capacitor" : "t,input,output"];
  for (let i = 0; i < result.t.length; i++)
    lines.push(
      cap
        ? `${result.t[i]},${result.input[i]},${result.output[i]},${cap[i]}`
        : `${result.t[i]},${result.input[i]},${result.output[i]}`,
    );
  return lines.join("\n") + "\n";
}

export interface RunLimits {
  maxPoints: number;
  maxNoiseSegments: number;
  /** pwl points + capture samples over all components */
  maxTablePoints: number;
  /** breakpoints from periodic corners (pulse, triangle) and sine cycles over the run */
  maxPeriodicCorners: number;
  /** odex is only allowed when its work is bounded: at most this many input segments… */
  maxOdexSegments: number;
  /** …and at most this many closed-loop time constants over the run (stiffness). */
  maxOdexStiffness: number;
  /** output edges (an oscillator's switching count) */
  maxEvents: number;
}

export const DEFAULT_RUN_LIMITS: RunLimits = {
  maxPoints: 200_000,
  maxNoiseSegments: 2_000_000,
  maxTablePoints: 200_000,
  maxPeriodicCorners: 2_000_000,
  maxOdexSegments: 20_000,
  maxOdexStiffness: 1e5,
  maxEvents: 1_000_000,
};

/** Estimated cycles of a relaxation oscillator over the run (ideal-switch formula), else null. */
function oscillatorCycles(scenario: Scenario): number | null {
  const st = scenario.stage;
  if (st.kind !== "relaxation-oscillator") return null;
  const { high, low } = outputLimits(scenario);
  const s = st.rReference + st.rFeedback;
  const vH = (st.reference * st.rFeedback + high * st.rReference) / s;
  const vL = (st.reference * st.rFeedback + low * st.rReference) / s;
  const rc = st.rTiming * st.cTiming;
  // t_high = RC·ln((Voh − VL)/(Voh − VH)), t_low = RC·ln((VH − Vol)/(VL − Vol)) (tests/REFERENCES.md)
  const period = rc * (Math.log((high - vL) / (high - vH)) + Math.log((vH - low) / (vL - low)));
  return Number.isFinite(period) && period > 0 ? scenario.run.duration / period : null;
}

/** Reasons (plain language) why a server should refuse to run this scenario; empty when fine. */
export function checkRunBounds(scenario: Scenario, limits: Partial<RunLimits> = {}): string[] {
  const L = { ...DEFAULT_RUN_LIMITS, ...limits };
  const reasons: string[] = [];
  const T = scenario.run.duration;
  const fmt = (n: number) => Math.round(n).toLocaleString("en");
  if (scenario.run.points > L.maxPoints)
    reasons.push(`run.points is ${fmt(scenario.run.points)}; runs are limited to ${fmt(L.maxPoints)} output points`);
  const { segments, table, corners, edges } = runWork(scenario);
  if (segments > L.maxNoiseSegments)
    reasons.push(
      `input.noise gives ${fmt(segments)} noise segments (2 × bandwidth × duration); the limit is ${fmt(L.maxNoiseSegments)}: lower the bandwidth or shorten the run`,
    );
  if (table > L.maxTablePoints)
    reasons.push(
      `the pwl and capture components hold ${fmt(table)} points together; the limit is ${fmt(L.maxTablePoints)}`,
    );
  if (corners > L.maxPeriodicCorners)
    reasons.push(
      `the periodic components switch about ${fmt(corners)} times over the run; the limit is ${fmt(L.maxPeriodicCorners)}: lower the frequency or shorten the run`,
    );
  if (edges > L.maxEvents)
    reasons.push(
      `the relaxation oscillator would switch about ${fmt(edges)} times over the run (limit ${fmt(L.maxEvents)}): shorten run.duration`,
    );
  const solver = scenario.run.solver ?? "exact";
  if (solver === "odex") {
    const work = segments + table + corners;
    if (work > L.maxOdexSegments)
      reasons.push(
        `the odex solver restarts at every input corner; this run has about ${fmt(work)} (limit ${fmt(L.maxOdexSegments)}): use the exact solver`,
      );
    const op = scenario.opamp;
    // Fastest rate of the model: the closed-loop/open-loop pole, bounded by 2π·GBW.
    const stiffness = 2 * Math.PI * op.gainBandwidth * T;
    if (stiffness > L.maxOdexStiffness)
      reasons.push(
        `the odex solver would need more than ${fmt(L.maxOdexStiffness)} steps for a ${T} s run at ${op.gainBandwidth} Hz gain-bandwidth (a stiff loop): use the exact solver`,
      );
  }
  return reasons;
}
