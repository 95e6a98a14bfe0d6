import { describe, expect, it } from "vitest";
import { checkRunBounds, outputLimits, resultToCsv, SimCancelled, simulate, toResultJson } from "@/lib/sim";
import { scenario } from "./sim-fixtures";

const schmitt = scenario({
  supply: { positive: 12, negative: -12 },
  opamp: {
    openLoopGain: 2e5,
    gainBandwidth: 1e6,
    slewRate: 1e6,
    outputHeadroomHigh: 1.5,
    outputHeadroomLow: 1,
    inputOffset: 0,
  },
  stage: { kind: "schmitt-inverting", rReference: 10e3, rFeedback: 100e3, reference: 0 },
  input: { components: [{ kind: "sine", amplitude: 3, frequency: 500 }] },
  run: { duration: 0.004, points: 401 },
});

describe("sim API", () => {
  it("outputLimits: Voh = V+ − headroomHigh, Vol = V− + headroomLow (DEVELOPERS.md § Behavioural op-amp model)", () => {
    expect(outputLimits(schmitt)).toEqual({ high: 10.5, low: -11 });
  });

  it("toResultJson follows railwise.result/1 and survives JSON", () => {
    const r = simulate(schmitt);
    const j = JSON.parse(JSON.stringify(toResultJson(r)));
    expect(j.schema).toBe("railwise.result/1");
    expect(j.rails).toEqual({ high: 10.5, low: -11 });
    expect(j.samples.t[0]).toBe(0);
    expect(j.samples.t[400]).toBe(0.004);
    expect(j.samples.output).toHaveLength(401);
    expect(Object.keys(j.metrics)).toEqual(
      expect.arrayContaining([
        "transitions",
        "upperThreshold",
        "lowerThreshold",
        "hysteresis",
        "chatter",
        "clippedFraction",
        "maxSlewRate",
        "period",
        "dutyCycle",
      ]),
    );
    expect(j.events[0]).toEqual({
      time: expect.any(Number),
      edge: expect.stringMatching(/rising|falling/),
      input: expect.any(Number),
    });
    expect(j.solver).toMatchObject({
      name: "exact",
      steps: expect.any(Number),
      evaluations: expect.any(Number),
      wallMs: expect.any(Number),
    });
    expect(resultToCsv(r).split("\n")[0]).toBe("t,input,output");
  });

  it("period and duty of a Schmitt trigger driven by a sine match the sine (common practice, no source)", () => {
    const r = simulate(schmitt);
    expect(r.metrics.period!).toBeCloseTo(0.002, 9);
    expect(r.metrics.dutyCycle!).toBeCloseTo(0.5, 2);
  });

  it("a transport delay shifts every edge by exactly that delay and adds to the propagation delay", () => {
    // Comparator with a propagation delay: the stage sees u(t − td) (see the developer notes).
    const base = scenario({
      stage: { kind: "comparator", reference: 0.3, inputAt: "noninverting" },
      input: { components: [{ kind: "triangle", amplitude: 1, frequency: 1000 }] },
      run: { duration: 0.003, points: 301 },
    });
    const td = 5e-6;
    const a = simulate(base);
    const b = simulate({ ...base, opamp: { ...base.opamp, propagationDelay: td } });
    expect(b.events.length).toBe(a.events.length);
    for (let i = 1; i < a.events.length; i++) expect(b.events[i].time - a.events[i].time).toBeCloseTo(td, 12);
    expect(b.metrics.propagationDelay! - a.metrics.propagationDelay!).toBeCloseTo(td, 12);
  });

  it("chatter counts edges closer than the hold-off; the hold-off is settable", () => {
    const noisy = scenario({
      stage: { kind: "comparator", reference: 0, inputAt: "noninverting" },
      input: {
        components: [{ kind: "triangle", amplitude: 1, frequency: 50 }],
        noise: { rms: 0.05, bandwidth: 1e5, seed: 1 },
      },
      run: { duration: 0.04, points: 401 },
    });
    const r = simulate(noisy);
    // default hold-off: min(1 % of the run, 1 % of the input period) = 0.2 ms
    expect(r.metrics.holdOff).toBeCloseTo(2e-4, 15);
    expect(r.metrics.chatter).toBeGreaterThan(0);
    let expected = 0;
    const ev = r.events.slice(1); // the first edge is the power-on edge
    for (let i = 1; i < ev.length; i++) if (ev[i].time - ev[i - 1].time < 2e-4) expected++;
    expect(r.metrics.chatter).toBe(expected);
    expect(simulate(noisy, { holdOff: 1e-12 }).metrics.chatter).toBe(0);
  });

  it("shouldCancel aborts with SimCancelled", () => {
    const long = scenario({
      stage: { kind: "comparator", reference: 0, inputAt: "noninverting" },
      input: { components: [{ kind: "dc", level: 0.5 }], noise: { rms: 0.01, bandwidth: 1e6, seed: 1 } },
      run: { duration: 0.1, points: 101 },
    });
    expect(() => simulate(long, { shouldCancel: () => true })).toThrow(SimCancelled);
  });

  it("checkRunBounds explains in plain words what exceeds the server limits", () => {
    expect(checkRunBounds(schmitt)).toEqual([]);
    const big = scenario({
      input: { components: [{ kind: "dc", level: 0 }], noise: { rms: 0.01, bandwidth: 1e8, seed: 1 } },
      run: { duration: 1, points: 500_000, solver: "odex" },
    });
    const reasons = checkRunBounds(big);
    expect(reasons.some((r) => /run\.points/.test(r) && /200,000/.test(r))).toBe(true);
    expect(reasons.some((r) => /noise segments/.test(r))).toBe(true);
    expect(reasons.some((r) => /odex/.test(r))).toBe(true);
    expect(
      checkRunBounds(big, {
        maxPoints: 1_000_000,
        maxNoiseSegments: 1e9,
        maxOdexSegments: 1e10,
        maxOdexStiffness: 1e12,
      }),
    ).toEqual([]);
    // a 10 kHz oscillator for 1,000 s would switch 2e7 times
    const osc = scenario({
      stage: {
        kind: "relaxation-oscillator",
        rReference: 10e3,
        rFeedback: 10e3,
        rTiming: 10e3,
        cTiming: 4.55e-9,
        reference: 0,
      },
      run: { duration: 1000, points: 1001 },
    });
    expect(checkRunBounds(osc).join(" ")).toMatch(/oscillator would switch about 20,0\d\d,\d{3} times/);
  });
});

describe("long runs", () => {
  it("an exit closer than the clock resolution late in a 600 s run does not stall the solver", () => {
    // Regression (common practice, no source): at t ≈ 482 s one ulp is 57 fs; a rail exit
    // found 28 fs ahead used to leave the clock where it was and cycle rail ↔ linear.
    const volts = [
      2.512148, 2.503234, 2.494329, 2.485433, 2.476547, 2.467671, 2.458804, 2.449948, 2.441103, 2.432268, 2.423443,
      2.41463, 2.405828, 2.397037, 2.388258, 2.379491, 2.370736, 2.361993, 2.353262, 2.344544, 2.335839, 2.327146,
      2.318467, 2.309801, 2.301148, 2.292509, 2.283884, 2.275273, 2.266676, 2.258093, 2.249525, 2.258093, 2.266676,
      2.275273, 2.283884, 2.292509, 2.301148, 2.309801, 2.318467, 2.327146, 2.335839, 2.344544, 2.353262, 2.361993,
      2.370736, 2.379491, 2.388258, 2.397037, 2.405828, 2.41463, 2.423443, 2.432268, 2.441103, 2.449948, 2.458804,
      2.467671, 2.476547, 2.485433, 2.494329, 2.503234, 2.512148,
    ];
    const s = scenario({
      supply: { positive: 5, negative: 0 },
      opamp: {
        openLoopGain: 1e5,
        gainBandwidth: 1e6,
        slewRate: 6e5,
        outputHeadroomHigh: 0.02,
        outputHeadroomLow: 0.02,
        inputOffset: 5e-4,
      },
      stage: { kind: "schmitt-inverting", rReference: 3566.434, rFeedback: 200000, reference: 2.377622 },
      input: {
        components: [{ kind: "pwl", points: volts.map((v, i) => [10 * i, v]) }],
        noise: { rms: 0.03, bandwidth: 5, seed: 389399651 },
      },
      run: { duration: 600, points: 257 },
    });
    const r = simulate(s);
    expect(r.t[256]).toBe(600);
    expect(r.metrics.transitions).toBeGreaterThan(2);
    for (const v of r.output) expect(v === 0.02 || v === 4.98 || (v > 0.02 && v < 4.98)).toBe(true);
  });
});

describe("time resolution", () => {
  it("an input corner that rounds onto the current time after the delay shift does not stall", () => {
    // Regression (common practice, no source): a triangle vertex 1 ulp after t − td came back
    // as an empty piece [t, t] and the solver looped without advancing.
    const s = scenario({
      supply: { positive: 11.581913721282035, negative: 0 },
      opamp: {
        openLoopGain: 1182.7478186011933,
        gainBandwidth: 1413.5577445309168,
        slewRate: 54342206.236511156,
        slewRateFall: 162372602.72131103,
        outputHeadroomHigh: 0.11470728134736419,
        outputHeadroomLow: 0.6793233954813331,
        inputOffset: -0.0030118189658969643,
        propagationDelay: 0.000016227297163423757,
      },
      stage: {
        kind: "inverting-amplifier",
        reference: 7.935035464387526,
        rInput: 5243.637233745847,
        rFeedback: 3272.9066357171287,
      },
      input: {
        components: [
          { kind: "triangle", amplitude: 2.210869657314709, frequency: 2335.429523871652, offset: 5.790956860641018 },
        ],
      },
      run: { duration: 0.006937738396233718, points: 501, initialOutput: "high" },
    });
    const r = simulate(s, { maxSteps: 100_000 });
    expect(r.solver.steps).toBeLessThan(1000);
    expect(r.output.every(Number.isFinite)).toBe(true);
  });
});
