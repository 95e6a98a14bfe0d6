// Tolerance spread against first-order propagation of the tolerances through the closed-form
// threshold of a non-inverting Schmitt trigger (tests/REFERENCES.md, Sedra & Smith):
//     upper U = (Vref − Vos)(1 + r) − Vol·r,  r = rIn/rFb,  Vol = V− + hL.
// Uniform deviations u ∈ [−1, 1] have variance 1/3. With rIn, rFb each at ±tol, Vos in
// ±offTol and hL·(1 ± hs) [derived, first order]:
//     var U = (r·(Vref − Vol))²·2·tol²/3 + (1 + r)²·offTol²/3 + (r·hL·hs)²/3,
//     E U ≈ U(Vos = 0)  (second-order terms are ~1e-5 V here).
// Every draw is a full simulation with lib/sim on a slow triangle probe, measured as a bench
// engineer would (input at the output's mid-level crossing).
import { describe, expect, it } from "vitest";
import { parseScenario } from "@/lib/schemas/scenario";
import { simulate } from "@/lib/sim";
import { toleranceSpreadConfigSchema, type DrawOutput } from "@/lib/schemas/study";
import { summarizeToleranceSpread } from "@/lib/studies/tolerance-spread";
import { runStudyInProcess } from "@/lib/studies/study";
import { studyCorners } from "@/lib/studies/corners";

const rIn = 10e3,
  rFb = 47e3,
  Vref = 2.5,
  hL = 0.05,
  hH = 0.05;
const scenario = parseScenario({
  schema: "railwise.scenario/1",
  supply: { positive: 5, negative: 0 },
  opamp: {
    openLoopGain: 1e5,
    gainBandwidth: 1e6,
    slewRate: 1e6,
    outputHeadroomHigh: hH,
    outputHeadroomLow: hL,
    inputOffset: 0.001,
  },
  stage: { kind: "schmitt-noninverting", rInput: rIn, rFeedback: rFb, reference: Vref },
  input: { components: [{ kind: "dc", level: 0 }] },
  run: { duration: 1, points: 2000, initialOutput: "low" },
});

describe("tolerance spread", () => {
  const tol = 0.02,
    offTol = 0.003,
    hs = 0.4,
    draws = 1000;
  const config = toleranceSpreadConfigSchema.parse({
    kind: "tolerance-spread",
    seed: 5,
    draws,
    resistorTolerance: tol,
    offsetTolerance: offTol,
    headroomSpread: hs,
    distribution: "uniform",
    probe: { kind: "triangle", low: 1, high: 4 },
    measures: ["upperThreshold", "lowerThreshold"],
    window: { upperThreshold: [2.95, 3.05] },
  });
  const tasks = runStudyInProcess({ scenario, config }, simulate) as DrawOutput[];
  const summary = summarizeToleranceSpread(config, tasks, studyCorners(scenario, config));
  const upper = summary.measures.find((m) => m.measure === "upperThreshold")!;

  const r = rIn / rFb;
  const Vol = hL;
  const mean = Vref * (1 + r) - Vol * r;
  const sd = Math.sqrt(
    ((r * (Vref - Vol)) ** 2 * 2 * tol ** 2) / 3 + ((1 + r) ** 2 * offTol ** 2) / 3 + (r * hL * hs) ** 2 / 3,
  );

  it("measures every draw", () => {
    expect(upper.summary.count).toBe(draws);
    expect(upper.missing).toBe(0);
  });

  it("mean agrees with the closed form within sampling error [derived]", () => {
    // Standard error of the mean sd/√N; 4 of them, plus 1 mV for the simulated measurement.
    expect(Math.abs((upper.summary.mean as number) - mean)).toBeLessThan((4 * sd) / Math.sqrt(draws) + 1e-3);
  });

  it("spread agrees with first-order propagation within sampling error [derived]", () => {
    // The sample sd has a relative standard error of about 1/√(2N) (≈ 2.2 % at N = 1000).
    const rel = (upper.summary.std as number) / sd - 1;
    expect(Math.abs(rel)).toBeLessThan(4 / Math.sqrt(2 * draws) + 0.02);
  });

  it("stays inside lib/design's worst-case corners and counts the spec window", () => {
    const [lo, hi] = upper.worstCase!;
    expect(upper.summary.min as number).toBeGreaterThanOrEqual(lo - 2e-3);
    expect(upper.summary.max as number).toBeLessThanOrEqual(hi + 2e-3);
    const inside = tasks.slice(1).filter((t) => t.upperThreshold! >= 2.95 && t.upperThreshold! <= 3.05).length;
    expect(summary.inside).toBe(inside);
    expect(summary.insideShare).toBeCloseTo(inside / draws, 12);
    expect(upper.histogram.counts.reduce((a, b) => a + b, 0)).toBe(draws);
  });
});

// Gain spread of a non-inverting amplifier, G = 1 + rF/rG (tests/REFERENCES.md, single-pole op-amp,
// with finite A: G/(1 + G/A)). First order [derived]: σ_G = (rF/rG)·√2·tol/√3 for uniform
// deviations of both resistors; the offset and headroom do not move the slope. Gain is measured
// on each simulated draw as the least-squares slope of output against input off the limits.
describe("tolerance spread of a gain", () => {
  const rG = 2.2e3,
    rF = 47e3,
    A0 = 2e5,
    tol = 0.05,
    draws = 300;
  const amp = parseScenario({
    schema: "railwise.scenario/1",
    supply: { positive: 5, negative: -5 },
    opamp: {
      openLoopGain: A0,
      gainBandwidth: 1e6,
      slewRate: 0.5e6,
      outputHeadroomHigh: 1.5,
      outputHeadroomLow: 1.5,
      inputOffset: 1e-3,
    },
    stage: { kind: "noninverting-amplifier", rGround: rG, rFeedback: rF, reference: 0 },
    input: { components: [{ kind: "triangle", amplitude: 0.1, frequency: 100 }] },
    run: { duration: 0.01, points: 2000 },
  });
  const config = toleranceSpreadConfigSchema.parse({
    kind: "tolerance-spread",
    seed: 8,
    draws,
    resistorTolerance: tol,
    offsetTolerance: 0.002,
    headroomSpread: 0.2,
    distribution: "uniform",
    probe: { kind: "scenario" },
    measures: ["gain"],
  });
  const tasks = runStudyInProcess({ scenario: amp, config }, simulate) as DrawOutput[];
  const gain = summarizeToleranceSpread(config, tasks, studyCorners(amp, config)).measures[0];
  const G = 1 + rF / rG;
  const mean = G / (1 + G / A0);
  const sd = ((rF / rG) * Math.SQRT2 * tol) / Math.sqrt(3);

  it("measures the gain of every draw, keeping the full output grid", () => {
    expect(gain.summary.count).toBe(draws);
  });

  it("agrees with first-order propagation within sampling error [derived]", () => {
    // Second-order bias of rF/rG under ±5 %: E[1/(1+b)] − 1 ≈ tol²/3 → +0.018 on G; allowed for.
    expect(Math.abs((gain.summary.mean as number) - mean)).toBeLessThan((4 * sd) / Math.sqrt(draws) + 0.03);
    expect(Math.abs((gain.summary.std as number) / sd - 1)).toBeLessThan(4 / Math.sqrt(2 * draws) + 0.03);
    const [lo, hi] = gain.worstCase!;
    expect(gain.summary.min as number).toBeGreaterThanOrEqual(lo * 0.999);
    expect(gain.summary.max as number).toBeLessThanOrEqual(hi * 1.001);
  });
});
