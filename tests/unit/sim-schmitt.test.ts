import { describe, expect, it } from "vitest";
import { simulate } from "@/lib/sim";
import { scenario } from "./sim-fixtures";

// Thresholds of comparators with positive feedback (Schmitt triggers).
// Source: tests/REFERENCES.md "Comparator with positive feedback" — textbook bistable-multivibrator
// formulas (e.g. Sedra & Smith, Microelectronic Circuits) [derived; textbook standard].
// The measured threshold is the input when the output crosses mid-level; with a slow triangle
// (≤ 200 V/s) and a nanosecond part the switching lag moves it by far less than 1 mV.

const slowTriangle = (amplitude: number, offset: number) => ({
  components: [{ kind: "triangle", amplitude, frequency: 10, offset }],
});

describe("Schmitt trigger thresholds", () => {
  it("non-inverting, dual supply, with a reference and headroom", () => {
    const rIn = 10e3;
    const rFb = 47e3;
    const vref = 0.8;
    const s = scenario({
      supply: { positive: 12, negative: -12 },
      opamp: {
        openLoopGain: 2e5,
        gainBandwidth: 1e9,
        slewRate: 1e10,
        outputHeadroomHigh: 1.5,
        outputHeadroomLow: 1.2,
        inputOffset: 0,
      },
      stage: { kind: "schmitt-noninverting", rInput: rIn, rFeedback: rFb, reference: vref },
      input: slowTriangle(5, 0.5),
      run: { duration: 0.3, points: 2001 },
    });
    const r = simulate(s);
    const voh = 12 - 1.5;
    const vol = -12 + 1.2;
    // upper = Vref(1 + rIn/rFb) − Vol·rIn/rFb, lower = Vref(1 + rIn/rFb) − Voh·rIn/rFb
    const upper = vref * (1 + rIn / rFb) - vol * (rIn / rFb);
    const lower = vref * (1 + rIn / rFb) - voh * (rIn / rFb);
    expect(r.rails).toEqual({ high: voh, low: vol });
    expect(r.metrics.upperThreshold!).toBeCloseTo(upper, 3);
    expect(r.metrics.lowerThreshold!).toBeCloseTo(lower, 3);
    // hysteresis = (Voh − Vol)·rIn/rFb
    expect(r.metrics.hysteresis!).toBeCloseTo(((voh - vol) * rIn) / rFb, 3);
    expect(r.metrics.transitions).toBeGreaterThanOrEqual(5);
    expect(r.metrics.chatter).toBe(0);
  });

  it("inverting, dual supply, with a reference", () => {
    const rRef = 10e3;
    const rFb = 33e3;
    const vref = -1;
    const s = scenario({
      supply: { positive: 15, negative: -15 },
      opamp: {
        openLoopGain: 2e5,
        gainBandwidth: 1e9,
        slewRate: 1e10,
        outputHeadroomHigh: 1,
        outputHeadroomLow: 1,
        inputOffset: 0,
      },
      stage: { kind: "schmitt-inverting", rReference: rRef, rFeedback: rFb, reference: vref },
      input: slowTriangle(6, 0),
      run: { duration: 0.3, points: 2001 },
    });
    const r = simulate(s);
    // upper = (Vref·rFb + Voh·rRef)/(rRef + rFb), lower = (Vref·rFb + Vol·rRef)/(rRef + rFb)
    const upper = (vref * rFb + 14 * rRef) / (rRef + rFb);
    const lower = (vref * rFb - 14 * rRef) / (rRef + rFb);
    expect(r.metrics.upperThreshold!).toBeCloseTo(upper, 3);
    expect(r.metrics.lowerThreshold!).toBeCloseTo(lower, 3);
    // An inverting stage: the upper threshold comes from falling output edges.
    const falling = r.events.filter((e) => e.edge === "falling");
    expect(falling.length).toBeGreaterThan(0);
    for (const e of falling) expect(e.input).toBeCloseTo(upper, 3);
  });

  it("single 5 V supply three-resistor network gives Vcc/3 and 2Vcc/3", () => {
    // R1 Vcc→node, R2 node→0 V, R3 out→node, R1 = R2 = R3, rail-to-rail: thresholds 2Vcc/3, Vcc/3
    // (tests/REFERENCES.md [derived]). In the stage form the R1/R2 divider is its Thevenin equivalent:
    // reference = Vcc/2 through rReference = R/2.
    const R = 100e3;
    const s = scenario({
      supply: { positive: 5, negative: 0 },
      stage: { kind: "schmitt-inverting", rReference: R / 2, rFeedback: R, reference: 2.5 },
      input: slowTriangle(2.5, 2.5),
      run: { duration: 0.3, points: 1001, initialOutput: "high" },
    });
    const r = simulate(s);
    expect(r.metrics.upperThreshold!).toBeCloseTo(10 / 3, 3);
    expect(r.metrics.lowerThreshold!).toBeCloseTo(5 / 3, 3);
  });

  it("single-supply non-inverting trigger with reference (battery disconnect style)", () => {
    // Cut at 11.4 V, reconnect at 12.5 V on a 12 V battery seen through a 1/3 divider: the
    // stage sees 3.8 V and 4.1667 V. Closed form as above with Vol = 0, Voh = 5 V.
    const rIn = 10e3;
    const rFb = (5 * rIn) / (12.5 / 3 - 11.4 / 3); // hysteresis (Voh − Vol)·rIn/rFb = 0.3667 V
    const vref = 12.5 / 3 / (1 + rIn / rFb); // upper = Vref(1 + rIn/rFb) with Vol = 0
    const s = scenario({
      supply: { positive: 5, negative: 0 },
      stage: { kind: "schmitt-noninverting", rInput: rIn, rFeedback: rFb, reference: vref },
      input: slowTriangle(0.5, 4),
      run: { duration: 0.3, points: 1001 },
    });
    const r = simulate(s);
    expect(r.metrics.upperThreshold!).toBeCloseTo(12.5 / 3, 3);
    expect(r.metrics.lowerThreshold!).toBeCloseTo(11.4 / 3, 3);
  });

  it("switches by itself: the output always ends at a rail, never in between", () => {
    const s = scenario({
      stage: { kind: "schmitt-noninverting", rInput: 10e3, rFeedback: 100e3, reference: 0 },
      input: slowTriangle(2, 0),
      run: { duration: 0.25, points: 501 },
    });
    const r = simulate(s);
    // Common practice, no source: away from the edges a bistable sits at one of its limits.
    const atRail = Array.from(r.output).filter((v) => v === 5 || v === -5).length;
    expect(atRail).toBeGreaterThan(r.output.length - 3);
    expect(r.metrics.clippedFraction).toBeGreaterThan(0.999);
  });

  it("comparator thresholds equal the reference plus offset, both input pins", () => {
    // An open-loop comparator switches where vd = v+ − v− + Vos crosses 0 (DEVELOPERS.md § Behavioural op-amp model).
    for (const inputAt of ["noninverting", "inverting"] as const) {
      const s = scenario({
        opamp: {
          openLoopGain: 2e5,
          gainBandwidth: 1e9,
          slewRate: 1e10,
          outputHeadroomHigh: 0,
          outputHeadroomLow: 0,
          inputOffset: 2e-3,
        },
        stage: { kind: "comparator", reference: 1.25, inputAt },
        input: slowTriangle(2, 1),
        run: { duration: 0.3, points: 601 },
      });
      const r = simulate(s);
      const expected = inputAt === "noninverting" ? 1.25 - 2e-3 : 1.25 + 2e-3;
      expect(r.metrics.upperThreshold!).toBeCloseTo(expected, 3);
      expect(r.metrics.lowerThreshold!).toBeCloseTo(expected, 3);
      expect(Math.abs(r.metrics.hysteresis!)).toBeLessThan(1e-3);
    }
  });
});
