// Tolerance spread: a seeded Monte Carlo over resistor tolerance, input offset and output
// headroom. Task 0 is the nominal stage; task i ≥ 1 is draw i with its own stream seeded from
// (study seed, i). Each task simulates its perturbed scenario with lib/sim and measures the
// figures a bench engineer would: switching points, gain, or period.
import type { Scenario, Stage } from "@/lib/schemas/scenario";
import type { SimResult, SimulateFn } from "@/lib/sim/types";
import type { DrawOutput, Measure, ToleranceSpreadConfig } from "@/lib/schemas/study";
import { createStream, drawDeviation, taskSeed } from "./random";
import { studyRunSettings } from "./grid";
import { histogram, summarize, wilsonInterval } from "./stats";
import { perturbScenario, spreadVariables, type CircuitSpreadOptions } from "@/lib/design/spread";
import { sourceMap } from "@/lib/sim/circuit";
import type { MeasureSpread, ToleranceSpreadSummary } from "@/lib/schemas/study";

export type { MeasureSpread, ToleranceSpreadSummary } from "@/lib/schemas/study";

// The spread model is lib/design/spread's (so its corners bracket these draws): every resistor
// and capacitor of the circuit as built — stage, reference divider, source divider or NTC (R25,
// Beta, fixed resistor), filter, pull-up — at nominal·(1 + tol·u), the supply at ±supply.tolerance,
// the input offset at offsetTolerance·u around zero, each output headroom at
// nominal·(1 + headroomSpread·u), u ∈ [−1, 1]. Resistor and capacitor tolerances come from the
// study configuration; the reference, NTC and supply tolerances from the scenario.

/** The study's tolerances applied to the scenario (the scenario's own for the rest). */
export function studyScenario(scenario: Scenario, config: ToleranceSpreadConfig): Scenario {
  return {
    ...scenario,
    tolerances: {
      ...(scenario.tolerances ?? {}),
      resistor: config.resistorTolerance,
      capacitor: config.capacitorTolerance ?? config.resistorTolerance,
    },
  };
}

export const studySpreadOptions = (config: ToleranceSpreadConfig): CircuitSpreadOptions => ({
  offset: config.offsetTolerance,
  headroomSpread: config.headroomSpread,
  everyPart: true,
});

export function toleranceTaskCount(config: ToleranceSpreadConfig): number {
  return 1 + config.draws;
}

/** Unit deviations u per varied quantity for task `index` (task 0: none, the nominal circuit). */
export function drawPerturbation(
  scenario: Scenario,
  config: ToleranceSpreadConfig,
  index: number,
): Record<string, number> {
  if (index === 0) return {};
  const s = createStream(taskSeed(config.seed, index));
  const u: Record<string, number> = {};
  for (const v of spreadVariables(studyScenario(scenario, config), studySpreadOptions(config)))
    u[v.name] = drawDeviation(s, config.distribution);
  return u;
}

/** True when the stage's output goes high for a high input (the probe then starts low). */
function outputFollowsInput(stage: Stage): boolean {
  switch (stage.kind) {
    case "noninverting-amplifier":
    case "schmitt-noninverting":
      return true;
    case "comparator":
      return stage.inputAt !== "inverting";
    default:
      return false;
  }
}

export function toleranceTaskScenario(scenario: Scenario, config: ToleranceSpreadConfig, index: number): Scenario {
  const u = drawPerturbation(scenario, config, index);
  const varied =
    index === 0 ? scenario : perturbScenario(studyScenario(scenario, config), u, studySpreadOptions(config));
  const { stage, opamp } = varied;
  // The spread of the parts is the question, not the noise: the probe never carries noise.
  const { noise: _dropped, ...ownInput } = scenario.input;
  let input: Scenario["input"] = ownInput;
  let run = scenario.run;
  if (config.probe.kind === "triangle") {
    let { low, high } = config.probe;
    let follows = outputFollowsInput(scenario.stage);
    // The probe is in stage-input volts; with a source the input is in source units, so the
    // sweep runs between the source values that give those volts (nominal sensor).
    const map = sourceMap(scenario);
    if (map) {
      const a = map.toSource(low);
      const b = map.toSource(high);
      if (a === null || b === null)
        throw new RangeError(
          `probe: ${low} V … ${high} V is outside what the ${map.unit} source can give at the stage input`,
        );
      [low, high] = [Math.min(a, b), Math.max(a, b)];
      if (map.inverted) follows = !follows;
    }
    // One sweep over the run: phase 270° starts the triangle at its minimum (lib/schemas/README.md § Input signal:
    // a triangle equals its offset at t = 0 and rises first; the phase shifts it).
    input = {
      components: [
        {
          kind: "triangle",
          amplitude: (high - low) / 2,
          offset: (high + low) / 2,
          frequency: 1 / scenario.run.duration,
          phase: 270,
        },
      ],
    };
    run = { ...run, initialOutput: follows ? "low" : "high" };
  }
  run = studyRunSettings(run, config.measures.includes("gain"));
  return { ...varied, tolerances: scenario.tolerances, stage, opamp, input, run };
}

/**
 * Small-signal gain: least-squares slope of output against input over the samples where the
 * output stays clear of both limits (2 % of the swing), so clipping does not flatten it.
 */
export function measureGain(r: SimResult): number | null {
  const { high, low } = r.rails;
  const margin = 0.02 * (high - low);
  let n = 0,
    sx = 0,
    sy = 0,
    sxx = 0,
    sxy = 0;
  for (let i = 0; i < r.output.length; i++) {
    const y = r.output[i];
    if (y <= low + margin || y >= high - margin) continue;
    const x = r.input[i];
    n++;
    sx += x;
    sy += y;
    sxx += x * x;
    sxy += x * y;
  }
  if (n < 8) return null;
  const den = n * sxx - sx * sx;
  if (!(Math.abs(den) > 1e-300)) return null;
  const g = (n * sxy - sx * sy) / den;
  return Number.isFinite(g) ? g : null;
}

export function runToleranceTask(
  scenario: Scenario,
  config: ToleranceSpreadConfig,
  index: number,
  simulate: SimulateFn,
): DrawOutput {
  let r: SimResult;
  try {
    r = simulate(
      toleranceTaskScenario(scenario, config, index),
      config.holdOff ? { holdOff: config.holdOff } : undefined,
    );
  } catch (err) {
    // A solver that gives up on one draw must not sink the study: count it, show it.
    if (!(err instanceof Error) || err.name === "SimCancelled") throw err;
    return { upperThreshold: null, lowerThreshold: null, gain: null, period: null, failed: true };
  }
  const want = new Set<Measure>(config.measures);
  const m = r.metrics;
  return {
    upperThreshold: want.has("upperThreshold") ? m.upperThreshold : null,
    lowerThreshold: want.has("lowerThreshold") ? m.lowerThreshold : null,
    gain: want.has("gain") ? measureGain(r) : null,
    period: want.has("period") ? m.period : null,
  };
}

/** Figures worth measuring for a stage kind. */
export function defaultMeasures(stage: Stage): Measure[] {
  switch (stage.kind) {
    case "noninverting-amplifier":
    case "inverting-amplifier":
      return ["gain"];
    case "relaxation-oscillator":
      return ["period"];
    default:
      return ["upperThreshold", "lowerThreshold"];
  }
}

export type Corners = Partial<Record<Measure, [number, number]>>;

export function summarizeToleranceSpread(
  config: ToleranceSpreadConfig,
  tasks: readonly DrawOutput[],
  corners: Corners = {},
): ToleranceSpreadSummary {
  if (tasks.length !== toleranceTaskCount(config)) {
    throw new Error(`tolerance spread expects ${toleranceTaskCount(config)} task outputs, got ${tasks.length}`);
  }
  const nominal = tasks[0];
  const draws = tasks.slice(1);
  const measures: MeasureSpread[] = config.measures.map((measure) => {
    const values: number[] = [];
    for (const d of draws) {
      const v = d[measure];
      if (v !== null) values.push(v);
    }
    const summary = summarize(values);
    const win = config.window[measure] ?? null;
    const wc = corners[measure] ?? null;
    // The axis spans the draws, the nominal and the corners; the window joins when it is of a
    // similar size (a window far wider than the spread would squeeze the bars into a sliver —
    // its shading then simply fills the axis).
    const core = [
      ...(summary.min !== null ? [summary.min, summary.max as number] : []),
      ...(nominal[measure] !== null ? [nominal[measure] as number] : []),
      ...(wc ?? []),
    ];
    let lo = core.length ? Math.min(...core) : (win?.[0] ?? 0);
    let hi = core.length ? Math.max(...core) : (win?.[1] ?? 1);
    if (win) {
      const span = Math.max(hi - lo, 1e-12);
      if (win[0] >= lo - 1.5 * span) lo = Math.min(lo, win[0]);
      if (win[1] <= hi + 1.5 * span) hi = Math.max(hi, win[1]);
    }
    const pad = (hi - lo) * 0.06 || Math.abs(hi) * 1e-3 || 1e-6;
    const hist = histogram(values, lo - pad, hi + pad, config.bins);
    const inside = win ? values.filter((v) => v >= win[0] && v <= win[1]).length : null;
    return {
      measure,
      nominal: nominal[measure],
      summary,
      missing: draws.length - values.length,
      histogram: hist,
      worstCase: wc,
      window: win,
      inside,
    };
  });
  const windowed = config.measures.filter((m) => config.window[m]);
  let inside: number | null = null;
  if (windowed.length) {
    inside = 0;
    for (const d of draws) {
      if (
        windowed.every((m) => {
          const v = d[m];
          const w = config.window[m] as [number, number];
          return v !== null && v >= w[0] && v <= w[1];
        })
      )
        inside++;
    }
  }
  const ci = inside !== null ? wilsonInterval(inside, draws.length) : null;
  return {
    draws: draws.length,
    failed: draws.filter((d) => d.failed).length,
    measures,
    inside,
    insideShare: inside !== null ? inside / draws.length : null,
    insideLow: ci?.low ?? null,
    insideHigh: ci?.high ?? null,
  };
}
