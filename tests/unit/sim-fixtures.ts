// Shared scenario builders for the sim-*.test.ts files (not a test file itself).
import { parseScenario, type Scenario } from "@/lib/schemas/scenario";

/** A fast, ideal-ish part: switching and slewing take nanoseconds, so closed forms apply. */
export const FAST_OPAMP = {
  openLoopGain: 2e5,
  gainBandwidth: 1e9,
  slewRate: 1e10,
  outputHeadroomHigh: 0,
  outputHeadroomLow: 0,
  inputOffset: 0,
};

export function scenario(partial: Record<string, unknown>): Scenario {
  return parseScenario({
    schema: "railwise.scenario/1",
    supply: { positive: 5, negative: -5 },
    opamp: FAST_OPAMP,
    stage: { kind: "comparator", reference: 0, inputAt: "noninverting" },
    input: { components: [{ kind: "dc", level: 0 }] },
    run: { duration: 1e-3, points: 1001 },
    ...partial,
  });
}

export const maxAbsDiff = (a: ArrayLike<number>, b: ArrayLike<number>) => {
  let m = 0;
  for (let i = 0; i < a.length; i++) m = Math.max(m, Math.abs(a[i] - b[i]));
  return m;
};
