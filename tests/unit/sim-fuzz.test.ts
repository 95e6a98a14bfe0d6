// Differential fuzz of the exact solver: thousands of random valid scenarios (seeded, so every
// failure is reproducible by its seed; see sim-fuzz-gen.ts) across every stage kind, input
// kind, noise, delay and slew setting. Each run has a piece budget, so a hang shows up as a
// SimFailed here instead of a test that never returns. Where odex can run cheaply, the exact
// solver must agree with it (odex: Hairer–Nørsett–Wanner's GBS extrapolation code as published
// on npm, an independent integrator of the same equations).
import { describe, expect, it } from "vitest";
import { checkRunBounds, simulate } from "@/lib/sim";
import { fuzzScenario } from "./sim-fuzz-gen";

const SEEDS = 3000;
const BUDGET = 100_000; // pieces; the worst healthy seed needs a few thousand

describe("differential fuzz", () => {
  it(`${SEEDS} random scenarios: no hang, no failure, finite outputs`, () => {
    const failures: string[] = [];
    for (let seed = 0; seed < SEEDS; seed++) {
      const { scenario } = fuzzScenario(seed);
      try {
        const r = simulate(scenario, { maxSteps: BUDGET });
        const bad = r.output.findIndex((v) => !Number.isFinite(v));
        if (bad >= 0) failures.push(`seed ${seed}: non-finite output at sample ${bad}`);
        if (r.capacitor?.some((v) => !Number.isFinite(v))) failures.push(`seed ${seed}: non-finite capacitor`);
      } catch (e) {
        failures.push(`seed ${seed} (${scenario.stage.kind}): ${(e as Error).message}`);
      }
    }
    expect(failures).toEqual([]);
  }, 120_000);

  it("exact agrees with odex on events, thresholds and clipping where odex runs cheaply", () => {
    const mismatches: string[] = [];
    let compared = 0;
    for (let seed = 0; seed < SEEDS; seed++) {
      const { scenario } = fuzzScenario(seed);
      const asOdex = { ...scenario, run: { ...scenario.run, solver: "odex" as const } };
      if (checkRunBounds(asOdex, { maxOdexStiffness: 3000, maxOdexSegments: 300 }).length > 0) continue;
      const a = simulate(scenario, { maxSteps: BUDGET });
      let b;
      try {
        b = simulate(scenario, { solver: "odex", maxSteps: 20_000 });
      } catch {
        continue; // odex out of steps: not a case it can check
      }
      compared++;
      const T = scenario.run.duration;
      const span = a.rails.high - a.rails.low;
      const amplifier = a.metrics.amplifier !== undefined;
      // odex samples each step at 4 points: on an amplifier's noisy mid-level grazes it can miss
      // a pair of crossings, so amplifiers are compared on clipping (their readings) only.
      if (!amplifier) {
        if (a.events.length !== b.events.length)
          mismatches.push(`seed ${seed}: ${a.events.length} events vs odex ${b.events.length}`);
        else
          for (let i = 0; i < a.events.length; i++)
            if (a.events[i].edge !== b.events[i].edge || Math.abs(a.events[i].time - b.events[i].time) > 1e-6 * T) {
              mismatches.push(`seed ${seed}: event ${i} at ${a.events[i].time} vs odex ${b.events[i].time}`);
              break;
            }
        for (const k of ["upperThreshold", "lowerThreshold"] as const) {
          const x = a.metrics[k];
          const y = b.metrics[k];
          if ((x === null) !== (y === null) || (x !== null && Math.abs(x - y!) > 1e-5 * span))
            mismatches.push(`seed ${seed}: ${k} ${x} vs odex ${y}`);
        }
      }
      if (Math.abs(a.metrics.clippedFraction - b.metrics.clippedFraction) > 1e-5)
        mismatches.push(`seed ${seed}: clipped ${a.metrics.clippedFraction} vs odex ${b.metrics.clippedFraction}`);
    }
    expect(compared).toBeGreaterThanOrEqual(400);
    // Every seed that once disagreed has a named regression test in sim-regressions.test.ts.
    expect(mismatches).toEqual([]);
  }, 120_000);
});
