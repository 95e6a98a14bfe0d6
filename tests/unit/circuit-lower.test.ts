// lib/sim/circuit.ts: the circuit as built lowered to the plain stage the solver runs, checked
// against circuit theory (Thevenin, Kirchhoff), the Schmitt-trigger closed forms and the NTC
// Beta / Steinhart–Hart inverses of tests/REFERENCES.md.
import { describe, expect, it } from "vitest";
import { simulate } from "@/lib/sim";
import { lowerCircuit, sourceReadings } from "@/lib/sim/circuit";
import { parseScenario, type Scenario } from "@/lib/schemas/scenario";
import { SimFailed } from "@/lib/sim/errors";

// Finite A0 and GBW move a switching point by the overdrive the output needs to cross mid-level
// (≈ √(2·ΔV·slope/(2π·GBW)) ≈ 0.1 mV for these sweeps; from memory), so closed forms that assume
// an ideal switch are compared to 3 decimals (5e-4).
const FAST = {
  openLoopGain: 2e5,
  gainBandwidth: 1e9,
  slewRate: 1e10,
  outputHeadroomHigh: 0,
  outputHeadroomLow: 0,
  inputOffset: 0,
};

const make = (partial: Record<string, unknown>): Scenario =>
  parseScenario({
    schema: "railwise.scenario/1",
    supply: { positive: 5, negative: 0 },
    opamp: FAST,
    stage: { kind: "comparator", reference: 2.5 },
    input: { components: [{ kind: "dc", level: 0 }] },
    run: { duration: 1, points: 2001 },
    ...partial,
  });

const run = (s: Scenario) => {
  const low = lowerCircuit(s);
  const r = simulate(low.scenario);
  return { low, r, src: sourceReadings(low, r) };
};

// A triangle sweep over the run, starting at its minimum (phase 270°), for threshold stages.
const sweep = (lo: number, hi: number) => ({
  components: [{ kind: "triangle", amplitude: (hi - lo) / 2, offset: (hi + lo) / 2, frequency: 1, phase: 270 }],
});

describe("battery divider source (high-impedance input)", () => {
  // 12 V battery through 68 k / 18 k into a schmitt-inverting stage (rReference 33 k to 2.5 V, rFeedback 680 k).
  const s = make({
    stage: { kind: "schmitt-inverting", rReference: 33e3, rFeedback: 680e3, reference: 2.5 },
    source: { quantity: "battery", sensor: { kind: "divider", rTop: 68e3, rBottom: 18e3 } },
    input: sweep(10, 14),
    run: { duration: 1, points: 2001, initialOutput: "high" },
  });

  it("maps every input component exactly by the divider ratio", () => {
    const low = lowerCircuit(s);
    const c = low.scenario.input.components[0];
    // Unloaded divider: v = Vb·rBottom/(rTop + rBottom) (voltage divider rule, common practice, no source)
    const k = 18e3 / 86e3;
    expect(c.kind).toBe("triangle");
    if (c.kind !== "triangle") return;
    expect(c.amplitude).toBeCloseTo(2 * k, 12);
    expect(c.offset).toBeCloseTo(12 * k, 12);
    expect(low.source?.unit).toBe("V");
    expect(low.scenario.source).toBeUndefined();
  });

  it("reads the switching points in battery volts: the volt thresholds divided by the ratio", () => {
    const { r, src } = run(s);
    const k = 18e3 / 86e3;
    // Inverting Schmitt trigger: upper = (Vref·rFb + Voh·rRef)/(rRef + rFb) (tests/REFERENCES.md, Sedra & Smith)
    const upper = (2.5 * 680e3 + 5 * 33e3) / 713e3;
    const lower = (2.5 * 680e3 + 0 * 33e3) / 713e3;
    expect(r.metrics.upperThreshold!).toBeCloseTo(upper, 3);
    expect(src!.metrics.upperThreshold!).toBeCloseTo(upper / k, 3);
    expect(src!.metrics.lowerThreshold!).toBeCloseTo(lower / k, 3);
    expect(src!.metrics.hysteresis!).toBeCloseTo((upper - lower) / k, 3);
    // Same definitions in both units: source thresholds are the volt thresholds through the divider
    expect(src!.metrics.upperThreshold!).toBeCloseTo(r.metrics.upperThreshold! / k, 9);
    expect(src!.events.length).toBe(r.events.length);
    // The source trace is the battery sweep itself (10 V at t = 0, 14 V at t = 0.5 s).
    expect(src!.source[0]).toBeCloseTo(10, 9);
    expect(src!.source[1000]).toBeCloseTo(14, 9);
  });
});

describe("divider source into a current-drawing input", () => {
  it("schmitt-noninverting: the divider's Thevenin resistance adds to rInput (nodal analysis)", () => {
    const rTop = 68e3,
      rBottom = 18e3,
      rIn = 10e3,
      rFb = 100e3,
      vref = 2.5;
    const s = make({
      stage: { kind: "schmitt-noninverting", rInput: rIn, rFeedback: rFb, reference: vref },
      source: { sensor: { kind: "divider", rTop, rBottom } },
      input: sweep(8, 16),
    });
    const { low, src } = run(s);
    if (low.scenario.stage.kind !== "schmitt-noninverting") throw new Error("kind");
    expect(low.scenario.stage.rInput).toBeCloseTo(rIn + (rTop * rBottom) / (rTop + rBottom), 6);
    // Independent check, Kirchhoff's current law at the two nodes n (divider) and p (v+), with
    // p = vref at the switching point and vo at the rail the output leaves:
    //   n: (Vb − n)/rTop = n/rBottom + (n − p)/rIn ;  p: (n − p)/rIn = (p − vo)/rFb
    // → n = p + rIn·(p − vo)/rFb, Vb = rTop·(n/rBottom + (n − p)/rIn) + n  (common practice, no source)
    const battery = (vo: number) => {
      const n = vref + (rIn * (vref - vo)) / rFb;
      return rTop * (n / rBottom + (n - vref) / rIn) + n;
    };
    expect(src!.metrics.upperThreshold!).toBeCloseTo(battery(0), 3); // leaves Vol = 0 V when rising
    expect(src!.metrics.lowerThreshold!).toBeCloseTo(battery(5), 3);
  });
});

describe("reference divider", () => {
  it("comparator: an unloaded divider equals its open-circuit voltage (Thevenin's theorem)", () => {
    const div = make({
      stage: { kind: "comparator", referenceDivider: { rTop: 30e3, rBottom: 20e3 } },
      input: sweep(0, 5),
    });
    // 5 V · 20k/(30k + 20k) = 2 V
    const { r } = run(div);
    expect(r.metrics.upperThreshold!).toBeCloseTo(2, 3);
    expect(r.metrics.lowerThreshold!).toBeCloseTo(2, 3);
  });

  it("schmitt-inverting: three-resistor network R1 = R2 = R3 switches at Vcc·2/3 and Vcc/3 (tests/REFERENCES.md, derived)", () => {
    const s = make({
      stage: { kind: "schmitt-inverting", rFeedback: 100e3, referenceDivider: { rTop: 100e3, rBottom: 100e3 } },
      input: sweep(0, 5),
      run: { duration: 1, points: 2001, initialOutput: "high" },
    });
    const { r } = run(s);
    expect(r.metrics.upperThreshold!).toBeCloseTo(10 / 3, 3);
    expect(r.metrics.lowerThreshold!).toBeCloseTo(5 / 3, 3);
  });

  it("non-inverting amplifier: rGround returns through the divider's Thevenin resistance", () => {
    const s = make({
      supply: { positive: 5, negative: -5 },
      stage: {
        kind: "noninverting-amplifier",
        rGround: 10e3,
        rFeedback: 90e3,
        referenceDivider: { rTop: 10e3, rBottom: 10e3, top: "positive", bottom: "negative" },
      },
      input: { components: [{ kind: "dc", level: 0.1 }] },
      run: { duration: 1e-3, points: 101 },
    });
    const low = lowerCircuit(s);
    if (low.scenario.stage.kind !== "noninverting-amplifier") throw new Error("kind");
    // Reference node at 0 V (±5 V through equal halves), Thevenin 5 kΩ in series with rGround:
    // gain 1 + 90k/15k = 7 (non-inverting gain 1 + rF/rG, tests/REFERENCES.md; Thevenin's theorem)
    expect(low.scenario.stage.rGround).toBeCloseTo(15e3, 6);
    const r = simulate(low.scenario);
    expect(r.output[r.output.length - 1]).toBeCloseTo(0.7, 3);
  });
});

describe("NTC source", () => {
  // Water-alarm style: 10 kΩ / B 3977 K NTC at the bottom of a 15 kΩ divider from 5 V, feeding a
  // schmitt-inverting stage whose reference is a divider.
  const betaTemp = (v: number) => {
    // Beta model inverse (tests/REFERENCES.md): R = Rf·V/(S − V); 1/T = 1/T25 + ln(R/R25)/B
    const rt = (15e3 * v) / (5 - v);
    return 1 / (1 / 298.15 + Math.log(rt / 10e3) / 3977) - 273.15;
  };
  const s = make({
    stage: { kind: "schmitt-inverting", rFeedback: 200e3, referenceDivider: { rTop: 7.5e3, rBottom: 6.8e3 } },
    source: {
      quantity: "water temperature",
      sensor: { kind: "ntc", model: { beta: 3977, r25: 10e3 }, rFixed: 15e3, position: "bottom" },
    },
    input: {
      components: [
        {
          kind: "pwl",
          points: [
            [0, 14],
            [1800, 22],
            [3600, 14],
          ],
        },
      ],
    },
    run: { duration: 3600, points: 3601, initialOutput: "low" },
  });

  it("resamples the nonlinear divider into a pwl within 0.1 mV (checked densely)", () => {
    const low = lowerCircuit(s);
    expect(low.source?.unit).toBe("°C");
    expect(low.source?.inverted).toBe(true);
    expect(low.inputError).toBeLessThanOrEqual(1e-4);
    const c = low.scenario.input.components[0];
    if (c.kind !== "pwl") throw new Error("pwl expected");
    const t = new Float64Array(20001).map((_, i) => (i * 3600) / 20000);
    const x = low.source!.evaluate(t);
    let worst = 0;
    let j = 0;
    for (let i = 0; i < t.length; i++) {
      while (j + 1 < c.points.length - 1 && c.points[j + 1][0] <= t[i]) j++;
      const [t0, v0] = c.points[j];
      const [t1, v1] = c.points[Math.min(j + 1, c.points.length - 1)];
      const pwl = t1 > t0 ? v0 + ((v1 - v0) * (t[i] - t0)) / (t1 - t0) : v1;
      // Exact divider voltage from the Beta model (tests/REFERENCES.md): V = S·R/(Rf + R)
      const r = 10e3 * Math.exp(3977 * (1 / (x[i] + 273.15) - 1 / 298.15));
      worst = Math.max(worst, Math.abs(pwl - (5 * r) / (15e3 + r)));
    }
    expect(worst).toBeLessThanOrEqual(1e-4);
  });

  it("gives the alarm thresholds in °C from the Beta inverse of the volt thresholds", () => {
    const { r, src } = run(s);
    // Volt thresholds: inverting Schmitt trigger with Vref, rRef = the divider's Thevenin form
    const vref = (5 * 6.8e3) / 14.3e3;
    const rRef = (7.5e3 * 6.8e3) / 14.3e3;
    const vUp = (vref * 200e3 + 5 * rRef) / (rRef + 200e3);
    const vLow = (vref * 200e3) / (rRef + 200e3);
    expect(r.metrics.upperThreshold!).toBeCloseTo(vUp, 4);
    expect(r.metrics.lowerThreshold!).toBeCloseTo(vLow, 4);
    // NTC at the bottom inverts: the lower volt threshold is the upper °C threshold
    expect(src!.metrics.unit).toBe("°C");
    expect(src!.metrics.upperThreshold!).toBeCloseTo(betaTemp(vLow), 2);
    expect(src!.metrics.lowerThreshold!).toBeCloseTo(betaTemp(vUp), 2);
    expect(src!.metrics.hysteresis!).toBeGreaterThan(0);
  });

  it("Steinhart–Hart model: the source trace reads back the °C waveform through the S–H round trip", () => {
    // Coefficients of tests/REFERENCES.md (10 kΩ curve through 0, 25, 50 °C); R(25 °C) = 10 000 Ω
    const sh = make({
      stage: { kind: "comparator", reference: 2.5, inputAt: "inverting" },
      source: {
        sensor: {
          kind: "ntc",
          model: { a: 1.13451e-3, b: 2.33024e-4, c: 9.37746e-8 },
          rFixed: 10e3,
          position: "bottom",
        },
      },
      input: { components: [{ kind: "ramp", from: 0, to: 50, start: 0, duration: 1 }] },
      run: { duration: 1, points: 1001 },
    });
    const { r, src } = run(sh);
    // The comparator switches where the divider is at 2.5 V, i.e. R_ntc = 10 kΩ = 25 °C.
    expect(r.events.length).toBe(1);
    expect(src!.events[0]!).toBeCloseTo(25, 1);
    expect(src!.source[500]).toBeCloseTo(25, 9);
  });
});

describe("not yet simulated parts fail clearly", () => {
  it("filter and open-drain output are refused with SimFailed naming the field", () => {
    const f = make({ filter: { r: 10e3, c: 1e-6 } });
    expect(() => lowerCircuit(f)).toThrow(SimFailed);
    expect(() => lowerCircuit(f)).toThrow(/^filter:/);
    const o = make({ output: { kind: "open-drain", pullUp: 10e3 } });
    expect(() => lowerCircuit(o)).toThrow(/^output:/);
    // Allowed by a solver that has them: the source resistance joins the filter resistor.
    const g = make({
      filter: { r: 10e3, c: 1e-6 },
      source: { sensor: { kind: "divider", rTop: 30e3, rBottom: 30e3 } },
    });
    expect(lowerCircuit(g, { allowFilter: true }).filter).toEqual({ r: 25e3, c: 1e-6, rVaries: false });
  });
});

describe("simulate() runs the circuit as built", () => {
  it("gives samples.source, events[].source and metrics.source in the result JSON", async () => {
    const { toResultJson } = await import("@/lib/sim");
    const s = make({
      stage: { kind: "comparator", reference: 2.5 },
      source: { quantity: "battery", sensor: { kind: "divider", rTop: 30e3, rBottom: 20e3 } },
      input: sweep(4, 8),
    });
    const json = toResultJson(simulate(s));
    // 2.5 V at the pin is 2.5·50k/20k = 6.25 V of source (voltage divider rule, common practice, no source)
    expect(json.metrics.source!.unit).toBe("V");
    expect(json.metrics.source!.upperThreshold!).toBeCloseTo(6.25, 2);
    expect(json.events[0].source!).toBeCloseTo(6.25, 2);
    expect(json.samples.source!.length).toBe(json.samples.t.length);
    expect(json.samples.source![0]).toBeCloseTo(4, 9);
    // The stage input is the divider output: 4 V · 0.4 = 1.6 V at t = 0
    expect(json.samples.input[0]).toBeCloseTo(1.6, 9);
  });

  it("a plain scenario has no source readings; a filter is simulated and reports samples.filtered", () => {
    const r = simulate(make({ input: sweep(0, 5) }));
    expect(r.source).toBeUndefined();
    expect(r.metrics.source).toBeUndefined();
    // The solver has the filter node now (tests/unit/sim-filter.test.ts checks it against the RC formula).
    expect(simulate(make({ filter: { r: 10e3, c: 1e-6 } })).filtered).toHaveLength(r.t.length);
  });
});
