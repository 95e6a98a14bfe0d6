// Noise estimated from a capture. The capture is synthesised with lib/sim's own input
// generator (a slow sine plus the contract's noise of known rms and bandwidth); the
// estimator must recover both. Expected values [derived]: for independent Gaussian knots
// every 1/(2B), linearly interpolated, neighbouring knots differ in sign with probability ½,
// so the zero-crossing rate is B; rms is the knots' rms (the interpolation between knots
// lowers the rms of the densely sampled signal: the mean square of (1−x)·a + x·b for
// independent a, b ~ N(0, σ²) is σ²((1−x)² + x²), 2σ²/3 averaged over x). So the dense
// capture's rms is σ·√(2/3), and modelRms maps it back to σ.
import { describe, expect, it } from "vitest";
import { parseScenario } from "@/lib/schemas/scenario";
import { evaluateInput } from "@/lib/sim";
import { estimateCaptureNoise } from "@/lib/studies/capture-noise";
import { DEMO_SCENARIOS } from "@/lib/demo/scenarios";

function synthesise(rms: number, bandwidth: number, duration: number, rate: number): [number, number][] {
  const scenario = parseScenario({
    schema: "railwise.scenario/1",
    supply: { positive: 5, negative: -5 },
    opamp: {
      openLoopGain: 1e5,
      gainBandwidth: 1e6,
      slewRate: 1e6,
      outputHeadroomHigh: 1,
      outputHeadroomLow: 1,
      inputOffset: 0,
    },
    stage: { kind: "comparator", reference: 0 },
    input: {
      components: [{ kind: "sine", amplitude: 0.5, frequency: 0.2, offset: 1 }],
      noise: { rms, bandwidth, seed: 4242 },
    },
    run: { duration, points: 100 },
  });
  const n = Math.round(duration * rate) + 1;
  const t = Float64Array.from({ length: n }, (_, i) => i / rate);
  const v = evaluateInput(scenario, t);
  return Array.from(t, (ti, i) => [ti, v[i]] as [number, number]);
}

describe("capture noise estimate", () => {
  it("recovers rms and bandwidth of the contract's noise model [derived]", () => {
    const sigma = 0.02,
      B = 200;
    const est = estimateCaptureNoise(synthesise(sigma, B, 10, 4000), 0.05);
    expect(est.bandwidth / B - 1).toBeGreaterThan(-0.08);
    expect(est.bandwidth / B - 1).toBeLessThan(0.08);
    expect(Math.abs(est.rms / (sigma * Math.sqrt(2 / 3)) - 1)).toBeLessThan(0.06);
    expect(Math.abs(est.modelRms / sigma - 1)).toBeLessThan(0.06);
    expect(est.limitedBySampling).toBe(false);
  });

  it("finds a workable detrend window by itself", () => {
    const sigma = 0.02,
      B = 200;
    const est = estimateCaptureNoise(synthesise(sigma, B, 10, 4000));
    expect(Math.abs(est.bandwidth / B - 1)).toBeLessThan(0.1);
    expect(Math.abs(est.modelRms / sigma - 1)).toBeLessThan(0.08);
  });

  it("flags a capture sampled too coarsely for its noise", () => {
    const est = estimateCaptureNoise(synthesise(0.02, 5000, 2, 2000), 0.05);
    expect(est.limitedBySampling).toBe(true);
  });

  it("reads the demo bilge capture's 80 mV pickup (recorded at 1 kHz, independent per sample)", () => {
    const capture = DEMO_SCENARIOS.find((s) => s.key === "bilge-float")!.scenario.input.components[0];
    if (capture.kind !== "capture") throw new Error("demo bilge scenario lost its capture");
    const est = estimateCaptureNoise(capture.samples); // default window: about 10 knot intervals
    // Independent samples at 1 kHz are, in the contract's terms, noise of bandwidth 500 Hz
    // (knots every 1 ms): rms 80 mV; the float's steps inflate the residual a little.
    expect(est.rms).toBeGreaterThan(0.07);
    expect(est.rms).toBeLessThan(0.092); // within 15 %
    expect(est.limitedBySampling).toBe(true);
    expect(est.modelRms).toBe(est.rms);
  });

  it("refuses a capture too short to tell", () => {
    expect(() =>
      estimateCaptureNoise([
        [0, 1],
        [1, 2],
      ]),
    ).toThrow(/at least 16 samples/);
  });
});
