// Noise margin study: sweep the noise rms on the scenario's input over a range, run N seeds per
// level, and estimate per level the probability that the noise makes the output chatter.
//
// Definition (ours): the noise-free run (task 0, the scenario with its noise removed) makes
// T0 output transitions. A seeded noisy run of the same scenario "chatters" when it makes
// MORE than T0 transitions — any extra switching the noise caused, however it happened.
// Noise may also shift the instants of the wanted transitions; that alone is not chatter.
// The chatter probability of a level is k/n over its n seeds, with a 95 % Wilson interval.
import type { Scenario } from "@/lib/schemas/scenario";
import type { SimulateFn } from "@/lib/sim/types";
import type { NoiseMarginConfig } from "@/lib/schemas/study";
import { taskSeed } from "./random";
import { wilsonInterval } from "./stats";
import { studyRunSettings } from "./grid";
import type { NoiseLevelSummary, NoiseMarginSummary, NoiseTaskOutput } from "@/lib/schemas/study";

export type { NoiseLevelSummary, NoiseMarginSummary, NoiseTaskOutput } from "@/lib/schemas/study";

/** Rule of thumb: a deadband of at least 6.6 × rms keeps ~0.1 % of noise samples outside it
 * (tests/REFERENCES.md, "Noise and hysteresis": erfc(6.6/(2√2)) = 0.097 %; common practice). */
export const RULE_OF_THUMB_FACTOR = 6.6;

export function noiseTaskCount(config: NoiseMarginConfig): number {
  return 1 + config.levels * config.seedsPerLevel;
}

export function noiseLevels(config: NoiseMarginConfig): number[] {
  const { rmsFrom, rmsTo, levels } = config;
  return Array.from({ length: levels }, (_, k) => rmsFrom + ((rmsTo - rmsFrom) * k) / (levels - 1));
}

/** The scenario task `index` simulates: 0 = noise removed, else level-major, seed-minor. */
export function noiseTaskScenario(scenario: Scenario, config: NoiseMarginConfig, index: number): Scenario {
  const { noise: _dropped, ...input } = scenario.input;
  const run = studyRunSettings(scenario.run, false);
  if (index === 0) return { ...scenario, input, run };
  const level = Math.floor((index - 1) / config.seedsPerLevel);
  const rms = noiseLevels(config)[level];
  return {
    ...scenario,
    run,
    input: { ...input, noise: { rms, bandwidth: config.bandwidth, seed: taskSeed(config.seed, index) } },
  };
}

export function runNoiseTask(
  scenario: Scenario,
  config: NoiseMarginConfig,
  index: number,
  simulate: SimulateFn,
): NoiseTaskOutput {
  let r;
  try {
    r = simulate(noiseTaskScenario(scenario, config, index), config.holdOff ? { holdOff: config.holdOff } : undefined);
  } catch (err) {
    if (!(err instanceof Error) || err.name === "SimCancelled" || index === 0) throw err;
    return { transitions: 0, hysteresis: null, upperThreshold: null, lowerThreshold: null, failed: true };
  }
  return {
    transitions: r.metrics.transitions ?? 0, // null for amplifier stages (they do not switch)
    hysteresis: r.metrics.hysteresis,
    upperThreshold: r.metrics.upperThreshold,
    lowerThreshold: r.metrics.lowerThreshold,
  };
}

export function summarizeNoiseMargin(config: NoiseMarginConfig, tasks: readonly NoiseTaskOutput[]): NoiseMarginSummary {
  if (tasks[0]?.failed) throw new Error("the noise-free reference run failed");
  if (tasks.length !== noiseTaskCount(config)) {
    throw new Error(`noise margin study expects ${noiseTaskCount(config)} task outputs, got ${tasks.length}`);
  }
  const reference = tasks[0];
  const rmsValues = noiseLevels(config);
  const S = config.seedsPerLevel;
  const levels: NoiseLevelSummary[] = rmsValues.map((rms, k) => {
    let chattered = 0;
    let failed = 0;
    for (let j = 0; j < S; j++) {
      const t = tasks[1 + k * S + j];
      if (t.failed) failed++;
      else if (t.transitions > reference.transitions) chattered++;
    }
    const n = S - failed;
    const { low, high } = wilsonInterval(chattered, n);
    return { rms, seeds: n, failed, chattered, probability: n > 0 ? chattered / n : 0, low, high };
  });
  const largestUnder = (ok: (l: NoiseLevelSummary) => boolean): number | null => {
    let best: number | null = null;
    for (const l of levels) {
      if (!ok(l)) break;
      best = l.rms;
    }
    return best;
  };
  const deadband = reference.hysteresis !== null && reference.hysteresis > 0 ? reference.hysteresis : 0;
  const measured = config.measured ?? null;
  let measuredVerdict: NoiseMarginSummary["measuredVerdict"] = null;
  if (measured) {
    const above = levels.find((l) => l.rms >= measured.rms);
    measuredVerdict = !above ? "beyond-sweep" : above.probability <= config.limit ? "inside" : "outside";
  }
  return {
    referenceTransitions: reference.transitions,
    deadband,
    ruleOfThumbRms: deadband / RULE_OF_THUMB_FACTOR,
    levels,
    safeRms: largestUnder((l) => l.probability <= config.limit),
    safeRmsConfident: largestUnder((l) => l.high <= config.limit),
    limit: config.limit,
    measured,
    measuredVerdict,
  };
}
