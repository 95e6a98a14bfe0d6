import { describe, expect, it } from "vitest";
import { simulate } from "@/lib/sim";
import type { Scenario } from "@/lib/schemas/scenario";
import { maxAbsDiff, scenario } from "./sim-fixtures";

// The exact piecewise solver against odex (Hairer & Wanner's GBS extrapolation code, an
// independent general-purpose integrator from npm, tests/REFERENCES.md "General-purpose npm
// references"), on runs that are not stiff so odex can follow them.
const SLOW_PART = {
  openLoopGain: 2e5,
  gainBandwidth: 1e6,
  slewRate: 1e6,
  outputHeadroomHigh: 0.2,
  outputHeadroomLow: 0.3,
  inputOffset: 1e-3,
};

const cases: Record<string, Scenario> = {
  "Schmitt, triangle": scenario({
    opamp: SLOW_PART,
    stage: { kind: "schmitt-noninverting", rInput: 10e3, rFeedback: 100e3, reference: 0.2 },
    input: { components: [{ kind: "triangle", amplitude: 2, frequency: 100 }] },
    run: { duration: 0.02, points: 1001 },
  }),
  "comparator, sine with delay": scenario({
    opamp: { ...SLOW_PART, propagationDelay: 2e-6 },
    stage: { kind: "comparator", reference: 0.5, inputAt: "inverting" },
    input: { components: [{ kind: "sine", amplitude: 1, frequency: 1000, phase: 30 }] },
    run: { duration: 0.002, points: 801 },
  }),
  "relaxation oscillator": scenario({
    opamp: SLOW_PART,
    stage: {
      kind: "relaxation-oscillator",
      rReference: 10e3,
      rFeedback: 20e3,
      rTiming: 100e3,
      cTiming: 10e-9,
      reference: 0,
    },
    run: { duration: 0.006, points: 601 },
  }),
  "slew-limited follower": scenario({
    supply: { positive: 15, negative: -15 },
    opamp: { ...SLOW_PART, slewRate: 0.8e6, slewRateFall: 0.5e6 },
    stage: { kind: "noninverting-amplifier", rGround: 1e9, rFeedback: 1, reference: 0 },
    input: { components: [{ kind: "sine", amplitude: 10, frequency: 1e5 }] },
    run: { duration: 2e-4, points: 2001 },
  }),
  "clipping inverting amplifier, slow part": scenario({
    opamp: { ...SLOW_PART, gainBandwidth: 1e4 },
    stage: { kind: "inverting-amplifier", rInput: 10e3, rFeedback: 22e3, reference: 0.1 },
    input: {
      components: [
        { kind: "sine", amplitude: 3, frequency: 100 },
        { kind: "dc", level: 0.2 },
      ],
    },
    run: { duration: 0.02, points: 1001 },
  }),
  "noisy Schmitt trigger, single supply": scenario({
    supply: { positive: 5, negative: 0 },
    opamp: SLOW_PART,
    stage: { kind: "schmitt-noninverting", rInput: 10e3, rFeedback: 100e3, reference: 2.5 },
    input: {
      components: [{ kind: "triangle", amplitude: 1, frequency: 100, offset: 2.5 }],
      noise: { rms: 0.05, bandwidth: 1e4, seed: 11 },
    },
    run: { duration: 0.02, points: 1001 },
  }),
  "noisy comparator, pwl + pulse": scenario({
    opamp: SLOW_PART,
    stage: { kind: "comparator", reference: 0, inputAt: "noninverting" },
    input: {
      components: [
        {
          kind: "pwl",
          points: [
            [0, -1],
            [0.002, 1],
            [0.002, 0.5],
            [0.004, -1],
          ],
        },
        { kind: "pulse", low: 0, high: 0.3, period: 0.001, duty: 0.3, rise: 1e-5, fall: 2e-5, delay: 1e-4 },
      ],
      noise: { rms: 0.05, bandwidth: 2e4, seed: 3 },
    },
    run: { duration: 0.005, points: 1001 },
  }),
};

describe("exact solver agrees with odex within 1e-6 relative", () => {
  for (const [name, s] of Object.entries(cases)) {
    it(name, () => {
      const a = simulate(s, { solver: "exact" });
      const b = simulate(s, { solver: "odex" });
      expect(b.solver.name).toBe("odex");
      const span = a.rails.high - a.rails.low;
      const T = s.run.duration;
      // Amplitude within 1e-6 of the output span; on a slewing edge a timing difference of
      // 1e-8 of the run (far inside the event check below) is allowed too: |Δv| ≤ SR·Δt.
      const srMax = Math.max(s.opamp.slewRate, s.opamp.slewRateFall ?? 0);
      expect(maxAbsDiff(a.output, b.output)).toBeLessThan(1e-6 * span + srMax * 1e-8 * T);
      expect(b.events.length).toBe(a.events.length);
      expect(a.events.length).toBeGreaterThan(0);
      for (let i = 0; i < a.events.length; i++) {
        expect(b.events[i].edge).toBe(a.events[i].edge);
        expect(Math.abs(b.events[i].time - a.events[i].time)).toBeLessThan(1e-6 * T);
      }
      expect(Math.abs(b.metrics.clippedFraction - a.metrics.clippedFraction)).toBeLessThan(1e-6);
      for (const k of ["upperThreshold", "lowerThreshold", "period", "dutyCycle"] as const) {
        const x = a.metrics[k];
        const y = b.metrics[k];
        if (x === null) expect(y).toBeNull();
        else expect(Math.abs(y! - x)).toBeLessThanOrEqual(1e-6 * Math.max(1, Math.abs(x)));
      }
      expect(Math.abs(b.metrics.maxSlewRate / a.metrics.maxSlewRate - 1)).toBeLessThan(1e-3);
    });
  }
});

describe("results do not depend on the output grid", () => {
  it("events and metrics are identical for 1,001 and 7,919 points; samples agree", () => {
    // Common practice, no source: a measurement taken from the solution, not from samples.
    for (const s of Object.values(cases)) {
      const a = simulate(s);
      const b = simulate({ ...s, run: { ...s.run, points: 7919 } });
      expect(b.events).toEqual(a.events);
      expect(b.metrics).toEqual(a.metrics);
      // at t = 0 and t = duration both grids have a sample
      expect(b.output[0]).toBe(a.output[0]);
      expect(b.output[7918]).toBeCloseTo(a.output[a.output.length - 1], 12);
    }
  });
});
