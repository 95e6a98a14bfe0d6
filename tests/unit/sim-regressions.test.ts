// Scenarios that once hung the exact solver or gave wrong results, each checked against its
// closed form (tests/REFERENCES.md) and, where it can run, against odex.
import { describe, expect, it } from "vitest";
import { parseScenario } from "@/lib/schemas/scenario";
import { SimFailed, simulate, type SimResult } from "@/lib/sim";

const PART = {
  openLoopGain: 200000,
  gainBandwidth: 1000000,
  slewRate: 10000000,
  outputHeadroomHigh: 0.05,
  outputHeadroomLow: 0.05,
  inputOffset: 0,
};

/** Relaxation oscillator that crept forward by one ulp per piece at t ≈ 1.2e-7 s (start-up edge). */
const OSCILLATOR = {
  schema: "railwise.scenario/1",
  supply: { positive: 5, negative: 0 },
  opamp: PART,
  stage: {
    kind: "relaxation-oscillator",
    rReference: 10000,
    rFeedback: 10000,
    rTiming: 100000,
    cTiming: 1e-8,
    reference: 2.15,
  },
  input: { components: [{ kind: "dc", level: 0 }] },
  run: { duration: 0.02, points: 2001 },
};

/** Gain −10 stage driven into both rails by a sine; stalled at t ≈ 5e-319 s. */
const CLIPPING_AMPLIFIER = {
  schema: "railwise.scenario/1",
  supply: { positive: 12, negative: -12 },
  opamp: PART,
  stage: { kind: "inverting-amplifier", rInput: 1000, rFeedback: 10000, reference: 0 },
  input: { components: [{ kind: "sine", amplitude: 7.560904884338378, frequency: 100, offset: 0 }] },
  run: { duration: 0.03, points: 101 },
};

// A budget far below the default: a run that creeps fails fast instead of hanging the test.
const BUDGET = { maxSteps: 20_000 };

describe("issue scenarios finish, with their closed forms", () => {
  it("relaxation oscillator: period from t_high + t_low, and odex agrees", () => {
    const r = simulate(parseScenario(OSCILLATOR), BUDGET);
    // t_high = RC·ln((Voh − VL)/(Voh − VH)), t_low = RC·ln((VH − Vol)/(VL − Vol)) [tests/REFERENCES.md,
    // relaxation oscillator, derived]; VH/VL from the inverting Schmitt thresholds (tests/REFERENCES.md).
    const Voh = 4.95;
    const Vol = 0.05;
    const VH = (2.15 * 10000 + Voh * 10000) / 20000;
    const VL = (2.15 * 10000 + Vol * 10000) / 20000;
    const RC = 100000 * 1e-8;
    const period = RC * (Math.log((Voh - VL) / (Voh - VH)) + Math.log((VH - Vol) / (VL - Vol)));
    // The formula takes an ideal switch; a 1 MHz part spends a few µs per edge (0.3 % here).
    expect(Math.abs(r.metrics.period! / period - 1)).toBeLessThan(0.005);
    expect(r.solver.steps).toBeLessThan(1000);
    const o = simulate(parseScenario({ ...OSCILLATOR, run: { ...OSCILLATOR.run, solver: "odex" } }));
    expect(o.events.length).toBe(r.events.length);
    for (let i = 0; i < r.events.length; i++) expect(Math.abs(o.events[i].time - r.events[i].time)).toBeLessThan(1e-9);
    // The capacitor trace runs between the two switching levels once started (first edge excluded).
    const cap = r.capacitor!;
    const after = r.t.findIndex((t) => t > r.events[1].time);
    let lo = Infinity;
    let hi = -Infinity;
    for (let i = after; i < cap.length; i++) {
      lo = Math.min(lo, cap[i]);
      hi = Math.max(hi, cap[i]);
    }
    expect(hi).toBeLessThanOrEqual(VH + 0.01);
    expect(lo).toBeGreaterThanOrEqual(VL - 0.01);
    expect(hi).toBeGreaterThan(VH - 0.05);
    expect(lo).toBeLessThan(VL + 0.05);
  });

  for (const initialOutput of ["low", "settled"] as const) {
    it(`clipping amplifier (start ${initialOutput}): clipped share from the clipped-sine formula`, () => {
      const s = parseScenario({ ...CLIPPING_AMPLIFIER, run: { ...CLIPPING_AMPLIFIER.run, initialOutput } });
      const r = simulate(s, BUDGET);
      // Clipped share = 1 − 2θc/π, θc = asin(Vr/a), a = |G|·A [tests/REFERENCES.md, clipped sine, derived];
      // G = −rF/rI with the finite-gain correction A0·α/(1 − A0·β) (common practice, no source).
      const A0 = 200000;
      const G = (A0 * (10 / 11)) / (1 + A0 / 11);
      const a = G * 7.560904884338378;
      const share = 1 - (2 * Math.asin(11.95 / a)) / Math.PI;
      // The ideal formula ignores the loop's lag: a first-order closed loop (time constant
      // τ = (1 + rF/rI)/(2π·GBW) = 1.75 µs) follows a ramp τ late, so each of the 6 rail entries
      // in 3 cycles comes τ late while the exits are immediate (common practice, no source).
      const tau = 11 / (2 * Math.PI * 1e6);
      expect(Math.abs(r.metrics.clippedFraction - (share - (6 * tau) / 0.03))).toBeLessThan(3e-5);
      expect(Math.abs(r.metrics.clippedFraction - share)).toBeLessThan(5e-4);
      expect(r.metrics.amplifier!.gain).toBeCloseTo(-G, 3);
      // The output first reaches Vol while the input rises (inverting), at |Vol/G| of input plus
      // the lag: τ·du/dt = 1.75 µs × 4.7 kV/s ≈ 8 mV later (same lag argument as above).
      const lag = tau * 2 * Math.PI * 100 * 7.560904884338378 * Math.cos(Math.asin(11.95 / a));
      expect(Math.abs(r.metrics.amplifier!.clipInputLow! - (11.95 / G + lag))).toBeLessThan(1e-3);
      expect(Math.abs(r.metrics.amplifier!.clipInputHigh! - (-11.95 / G - lag))).toBeLessThan(1e-3);
      expect(r.metrics.transitions).toBeNull();
      expect(r.solver.steps).toBeLessThan(2000);
    });
  }
});

describe("every run is bounded", () => {
  it("a budget that runs out fails with SimFailed naming the time reached", () => {
    const s = parseScenario({ ...OSCILLATOR, run: { ...OSCILLATOR.run, duration: 2 } });
    // common practice, no source: 2 s of a 450 Hz oscillator needs far more than 50 pieces
    expect(() => simulate(s, { maxSteps: 50 })).toThrow(SimFailed);
    expect(() => simulate(s, { maxSteps: 50 })).toThrow(/stopped at t = [0-9.e-]+ s of 2 s/);
  });
});

describe("fuzz finds (tests/unit/sim-fuzz-gen.ts seeds)", () => {
  /**
   * odex (independent integrator) as the reference: the same number of output events, each
   * within 1e-6 of the run (and of the same edge with `edges`), and the clipped share within 1e-5.
   */
  const expectAgreesWithOdex = (a: SimResult, b: SimResult, duration: number, { edges = false } = {}) => {
    expect(Math.abs(a.metrics.clippedFraction - b.metrics.clippedFraction)).toBeLessThan(1e-5);
    expect(a.events.length).toBe(b.events.length);
    for (let i = 0; i < a.events.length; i++) {
      if (edges) expect(a.events[i].edge).toBe(b.events[i].edge);
      expect(Math.abs(a.events[i].time - b.events[i].time)).toBeLessThan(1e-6 * duration);
    }
  };

  /** A fuzz seed's scenario run by the exact solver and by odex. */
  const bothSolvers = async (seed: number) => {
    const { fuzzScenario } = await import("./sim-fuzz-gen");
    const { scenario } = fuzzScenario(seed);
    const a = simulate(scenario, BUDGET);
    const b = simulate(scenario, { solver: "odex", maxSteps: 20_000 });
    return { scenario, a, b };
  };

  it("seed 77: oscillator whose linear edge is a growing complex pair reaches the rail (was missed inside one scan chunk)", async () => {
    const { fuzzScenario } = await import("./sim-fuzz-gen");
    const { scenario } = fuzzScenario(77);
    const a = simulate(scenario, BUDGET);
    const b = simulate(scenario, { solver: "odex" });
    expectAgreesWithOdex(a, b, scenario.run.duration);
  });

  it("seed 2483: output on the rail with a near-zero drive no longer creeps by one ulp per piece", async () => {
    const { fuzzScenario } = await import("./sim-fuzz-gen");
    const { scenario } = fuzzScenario(2483);
    const a = simulate(scenario, BUDGET);
    const b = simulate(scenario, { solver: "odex" });
    expect(a.solver.steps).toBeLessThan(100);
    expect(Math.abs(a.metrics.clippedFraction - b.metrics.clippedFraction)).toBeLessThan(1e-5);
    expect(Math.abs(a.output[a.output.length - 1] - b.output[b.output.length - 1])).toBeLessThan(1e-6);
  });

  it("seed 164: odex ends on a delayed input whose breakpoint rounds back onto the restart time", async () => {
    const { fuzzScenario } = await import("./sim-fuzz-gen");
    const { scenario } = fuzzScenario(164);
    // Before the fix odex restarted at the same t forever (t − delay rounded below the capture's
    // breakpoint, which came back as the next one). Now it ends, within its step budget.
    const t0 = performance.now();
    const b = simulate(scenario, { solver: "odex", maxSteps: 20_000 });
    expect(performance.now() - t0).toBeLessThan(5000);
    expect(b.output.every((v) => Number.isFinite(v))).toBe(true);
    expect(b.solver.steps).toBeGreaterThan(0);
  });

  it("seed 2866: a Schmitt trigger started 'settled' inside its band starts at a limit, not on the unstable mid-level balance", async () => {
    const { scenario, a, b } = await bothSolvers(2866);
    // Positive feedback: the mid-level solution of vo = A0·vd is a balance any disturbance leaves
    // (common practice, no source); odex left it by rounding, the exact solver sat on it.
    expect([a.rails.low, a.rails.high]).toContain(a.output[0]);
    expectAgreesWithOdex(a, b, scenario.run.duration);
  });

  it("seed 1946: a delayed pulse's edges are not lost to a one-ulp piece or a volts-wide boundary margin", async () => {
    const { scenario, a, b } = await bothSolvers(1946);
    // Every edge, not only the first two: the later ones once went wrong on the pulse's steep
    // fall, where the closed form's large coefficients made the boundary margin volts wide.
    expectAgreesWithOdex(a, b, scenario.run.duration, { edges: true });
  });

  it("seed 164: a comparator's rail entry inside a sine piece is not lost between two scan points", async () => {
    const { scenario, a, b } = await bothSolvers(164);
    // A steep capture segment on the comparator's slow pole carries the output over its high
    // level and back inside one piece; the sine made the scan sample it every 1/32 period, and
    // both samples lay below the level, so the output passed through the rail (an edge 0.18 µs
    // late, clipped share 2e-3 off). A fine fixed-step RK4 of the same model agreed with odex.
    expectAgreesWithOdex(a, b, scenario.run.duration, { edges: true });
  });

  it("seed 1678: a Schmitt trigger's rise to its high limit inside a sine piece reaches the rail", async () => {
    const { scenario, a, b } = await bothSolvers(1678);
    // The same miss on a growing exponential (positive feedback): the last edge came 56 ns late.
    expectAgreesWithOdex(a, b, scenario.run.duration, { edges: true });
  });

  for (const seed of [633, 2121])
    it(`seed ${seed}: odex holds an open drain on its falling high level while the drive exceeds the level's slope`, async () => {
      const { scenario, a, b } = await bothSolvers(seed);
      // odex let its output state rise above a falling pull-up level (the pin read the level,
      // the state drifted) and counted the output clipped only while the drive was ≥ 0, not
      // ≥ dH/dt as the exact solver's rail regime: clipped share 1e-4 and 6e-4 off, edges
      // 0.3 ns late. A fine fixed-step RK4 of the model with the pin held at its level agreed
      // with the exact solver (clipped 0.86131 and 0.99068).
      expectAgreesWithOdex(a, b, scenario.run.duration, { edges: true });
    });
});

describe("the bench's sine + heavy-noise Schmitt row (scripts/bench.ts SINE_HEAVY)", () => {
  // Its C loop once counted 1,913 edges over 1 s where the solver counted 2,288: the loop took
  // one clamped exponential step per noise segment and missed switching inside a segment
  // (scripts/bench/model-loop.c). odex, an independent adaptive integrator, decides which is
  // right on the first 10 ms of the same scenario and noise seed.
  const row = (duration: number, solver?: "odex") =>
    parseScenario({
      schema: "railwise.scenario/1",
      supply: { positive: 5, negative: 0 },
      opamp: { ...PART, gainBandwidth: 10e6, slewRate: 10e6 },
      stage: { kind: "schmitt-noninverting", rInput: 10e3, rFeedback: 50e3, reference: 2.5 },
      input: {
        components: [{ kind: "sine", amplitude: 2, frequency: 3, offset: 2.5 }],
        noise: { rms: 0.3, bandwidth: 500e3, seed: 7 },
      },
      run: { duration, points: 1001, ...(solver ? { solver } : {}) },
    });

  it("first 10 ms: the exact solver lists odex's edges, each within 1 ns", () => {
    const a = simulate(row(0.01), { maxSteps: 100_000 });
    const b = simulate(row(0.01, "odex"), { maxSteps: 200_000 });
    // The noise drives this row into heavy chatter: well over a hundred edges in 10 ms.
    expect(b.events.length).toBeGreaterThan(100);
    expect(a.events.length).toBe(b.events.length);
    for (let i = 0; i < a.events.length; i++) {
      expect(a.events[i].edge).toBe(b.events[i].edge);
      expect(Math.abs(a.events[i].time - b.events[i].time)).toBeLessThan(1e-9);
    }
  });
});
