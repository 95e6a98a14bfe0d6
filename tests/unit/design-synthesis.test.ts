// Synthesis round trips: every kind is designed from a spec, the returned stage is dropped into a
// `railwise.scenario/1` and simulated with lib/sim on a slow triangle (or free-running); the
// simulated switching points / gain / frequency must agree with `achieved` within 0.5 %, and
// `achieved` must be within 2 % of the target with E24 parts.
import { describe, expect, it } from "vitest";
import { design, monteCarlo, seriesInRange, stageFigures, thevenin, worstCase, type DesignResult } from "@/lib/design";
import { parseScenario, stageSchema, type OpAmp, type Supply } from "@/lib/schemas/scenario";
import type { DesignSpecInput } from "@/lib/schemas/design";
import { simulate } from "@/lib/sim";
import {
  batteryThresholds,
  celsiusToKelvin,
  temperatureToVoltageThresholds,
  voltageToTemperatureThresholds,
} from "@/lib/design/sensors";

const CMOS: OpAmp = {
  openLoopGain: 2e5,
  gainBandwidth: 1e6,
  slewRate: 1e6,
  outputHeadroomHigh: 0.05,
  outputHeadroomLow: 0.05,
  inputOffset: 0.001,
};
const BIPOLAR: OpAmp = {
  openLoopGain: 2e5,
  gainBandwidth: 1e6,
  slewRate: 0.5e6,
  outputHeadroomHigh: 1.5,
  outputHeadroomLow: 1.5,
  inputOffset: -0.002,
};
const SINGLE: Supply = { positive: 5, negative: 0 };
const SPLIT: Supply = { positive: 5, negative: -5 };
const SPLIT12: Supply = { positive: 12, negative: -12 };

type Case = { name: string; spec: Partial<DesignSpecInput> & Pick<DesignSpecInput, "kind" | "target" | "supply"> };

const spec = (c: Case): DesignSpecInput =>
  ({
    schema: "railwise.design-spec/1",
    opamp: CMOS,
    series: "E24",
    tolerance: 0.01,
    monteCarlo: false,
    ...c.spec,
  }) as DesignSpecInput;

interface Measured {
  upperThreshold?: number | null;
  lowerThreshold?: number | null;
  gain?: number;
  frequency?: number | null;
  dutyCycle?: number | null;
}

/** Simulate the designed stage as a scenario and measure what `achieved` claims. */
function simulateDesign(s: DesignSpecInput, d: DesignResult): Measured {
  const a = d.achieved;
  const base = { schema: "railwise.scenario/1", supply: s.supply, opamp: s.opamp, stage: d.stage };
  if (a.upperThreshold !== null && a.lowerThreshold !== null) {
    // Slow triangle (1 Hz) spanning the deadband with margin, two periods.
    const centre = (a.upperThreshold + a.lowerThreshold) / 2;
    const amplitude = Math.max(a.upperThreshold - a.lowerThreshold, 0.2);
    const sc = parseScenario({
      ...base,
      input: { components: [{ kind: "triangle", amplitude, frequency: 1, offset: centre }] },
      run: { duration: 2, points: 2001 },
    });
    const m = simulate(sc).metrics;
    return { upperThreshold: m.upperThreshold, lowerThreshold: m.lowerThreshold };
  }
  if (a.gain !== null) {
    // Slow triangle kept inside the output swing; gain = least-squares slope of output vs input.
    const swing = s.opamp.outputHeadroomHigh + s.opamp.outputHeadroomLow;
    const amp = (0.4 * (s.supply.positive - s.supply.negative - swing)) / Math.abs(a.gain);
    const offset = d.stage.kind === "inverting-amplifier" ? d.stage.reference : 0;
    const sc = parseScenario({
      ...base,
      input: { components: [{ kind: "triangle", amplitude: amp, frequency: 1, offset }] },
      run: { duration: 1, points: 2001 },
    });
    const r = simulate(sc);
    let n = 0,
      sx = 0,
      sy = 0,
      sxx = 0,
      sxy = 0;
    for (let i = 0; i < r.t.length; i++) {
      if (r.t[i] < 0.01) continue; // let the start-up from the initial output settle
      const x = r.input[i],
        y = r.output[i];
      n++;
      sx += x;
      sy += y;
      sxx += x * x;
      sxy += x * y;
    }
    expect(r.metrics.clippedFraction).toBe(0);
    return { gain: (n * sxy - sx * sy) / (n * sxx - sx * sx) };
  }
  // Oscillator: free-running, starting high so that every rising edge is in steady state.
  const sc = parseScenario({
    ...base,
    input: { components: [{ kind: "dc", level: 0 }] },
    run: { duration: 12 / a.frequency!, points: 4001, initialOutput: "high" },
  });
  const m = simulate(sc).metrics;
  return { frequency: m.period ? 1 / m.period : null, dutyCycle: m.dutyCycle };
}

const rel = (a: number, b: number) => Math.abs(a - b) / Math.abs(b);

const CASES: Case[] = [
  {
    name: "schmitt-inverting, auto reference, 5 V single",
    spec: {
      kind: "schmitt-inverting",
      supply: SINGLE,
      target: { upperThreshold: 3.3, lowerThreshold: 1.7 },
      reference: "auto",
    },
  },
  {
    name: "schmitt-inverting, auto reference, bipolar ±12 V",
    spec: {
      kind: "schmitt-inverting",
      supply: SPLIT12,
      opamp: BIPOLAR,
      target: { upperThreshold: 2.5, lowerThreshold: 0.8 },
      reference: "auto",
    },
  },
  {
    name: "schmitt-inverting, reference 0 V, ±5 V",
    spec: { kind: "schmitt-inverting", supply: SPLIT, target: { upperThreshold: 1, lowerThreshold: -1 }, reference: 0 },
  },
  {
    name: "schmitt-noninverting, auto reference, 5 V single",
    spec: {
      kind: "schmitt-noninverting",
      supply: SINGLE,
      target: { upperThreshold: 3.0, lowerThreshold: 2.2 },
      reference: "auto",
    },
  },
  {
    name: "schmitt-noninverting, reference 2.5 V",
    spec: {
      kind: "schmitt-noninverting",
      supply: SINGLE,
      target: { upperThreshold: 3.0, lowerThreshold: 2.0 },
      reference: 2.5,
    },
  },
  {
    name: "comparator, auto divider, { threshold }",
    spec: { kind: "comparator", supply: SINGLE, target: { threshold: 1.234 } },
  },
  {
    name: "comparator, inverting input, equal thresholds, ±5 V",
    spec: {
      kind: "comparator",
      supply: SPLIT,
      inputAt: "inverting",
      target: { upperThreshold: -0.6, lowerThreshold: -0.6 },
    },
  },
  {
    name: "non-inverting amplifier, gain 11.5",
    spec: { kind: "noninverting-amplifier", supply: SPLIT, target: { gain: 11.5 } },
  },
  {
    name: "inverting amplifier, gain −4.7",
    spec: { kind: "inverting-amplifier", supply: SPLIT, target: { gain: -4.7 } },
  },
  {
    name: "inverting amplifier, gain 3 as magnitude, auto bias",
    spec: { kind: "inverting-amplifier", supply: SINGLE, target: { gain: 3 }, reference: "auto" },
  },
  {
    name: "relaxation oscillator 1.5 Hz, auto reference, 5 V single",
    spec: { kind: "relaxation-oscillator", supply: SINGLE, target: { frequency: 1.5 } },
  },
  {
    name: "relaxation oscillator 200 Hz, duty 0.3, auto reference",
    spec: { kind: "relaxation-oscillator", supply: SINGLE, target: { frequency: 200, duty: 0.3 } },
  },
  {
    name: "relaxation oscillator 1 kHz, ±5 V",
    spec: { kind: "relaxation-oscillator", supply: SPLIT, target: { frequency: 1000 } },
  },
];

describe("synthesis round trip through lib/sim (E24)", () => {
  for (const c of CASES) {
    it(c.name, () => {
      const s = spec(c);
      const d = design(s);
      // The stage drops straight into a scenario.
      expect(stageSchema.safeParse(d.stage).success).toBe(true);
      expect(d.schema).toBe("railwise.design/1");
      expect(d.parts.every((p) => p.series === "E24" || p.role === "cTiming")).toBe(true);
      // Every resistor bought is an E24 value within 1 kΩ–1 MΩ (IEC 60063 via seriesInRange).
      const e24 = new Set(seriesInRange("E24", 1e3, 1e6));
      for (const p of d.parts.filter((p) => p.role !== "cTiming")) expect(e24.has(p.value)).toBe(true);
      // achieved within 2 % of the target (issue 4 acceptance; relative to |target|).
      for (const [name, e] of Object.entries(d.errors)) {
        expect(rel(e!.achieved, e!.target), `${name} achieved vs target`).toBeLessThan(0.02);
      }
      const m = simulateDesign(s, d);
      for (const [name, v] of Object.entries(m)) {
        const claimed = d.achieved[name as keyof typeof d.achieved];
        expect(v, `${name} simulated`).not.toBeNull();
        // Simulated within 0.5 % of what `achieved` says (issue 4 acceptance).
        expect(rel(v as number, claimed as number), `${name} simulated ${v} vs achieved ${claimed}`).toBeLessThan(
          0.005,
        );
      }
    });
  }
});

describe("oscillator designs against the odex cross-check solver (slew and GBW included)", () => {
  // odex (Gragg–Bulirsch–Stoer) is the independent general solver (DEVELOPERS.md § Simulation core); the oscillator is not
  // stiff, so it serves as a second reference for the closed form with slew-limited edges.
  const FAST: OpAmp = {
    openLoopGain: 1e5,
    gainBandwidth: 10e6,
    slewRate: 20e6,
    outputHeadroomHigh: 0.2,
    outputHeadroomLow: 0.2,
    inputOffset: 0.002,
  };
  const cases: [string, DesignSpecInput][] = [
    [
      "E192, 200 Hz, duty 0.3, 5 V",
      spec({
        name: "",
        spec: { kind: "relaxation-oscillator", supply: SINGLE, series: "E192", target: { frequency: 200, duty: 0.3 } },
      }),
    ],
    [
      "E24, 1 kHz, duty 0.3, ±5 V, fast part",
      spec({
        name: "",
        spec: { kind: "relaxation-oscillator", supply: SPLIT, opamp: FAST, target: { frequency: 1000, duty: 0.3 } },
      }),
    ],
    [
      "E24, 20 kHz, ±5 V, fast part",
      spec({
        name: "",
        spec: { kind: "relaxation-oscillator", supply: SPLIT, opamp: FAST, target: { frequency: 20_000 } },
      }),
    ],
    [
      "E24, 4 kHz, 5 V, edges 5 % of the period",
      spec({ name: "", spec: { kind: "relaxation-oscillator", supply: SINGLE, target: { frequency: 4000 } } }),
    ],
  ];
  for (const [name, s] of cases) {
    it(name, () => {
      const d = design(s);
      expect(rel(d.achieved.frequency!, s.target.frequency!)).toBeLessThan(0.02);
      const sc = parseScenario({
        schema: "railwise.scenario/1",
        supply: s.supply,
        opamp: s.opamp,
        stage: d.stage,
        input: { components: [{ kind: "dc", level: 0 }] },
        run: { duration: 12 / d.achieved.frequency!, points: 4001, initialOutput: "high" },
      });
      const m = simulate(sc, { solver: "odex" }).metrics;
      expect(m.period).not.toBeNull();
      expect(rel(1 / m.period!, d.achieved.frequency!)).toBeLessThan(0.005);
      expect(Math.abs(m.dutyCycle! - d.achieved.dutyCycle!)).toBeLessThan(0.005);
    });
  }
});

describe("sensor front ends into synthesis", () => {
  it("battery disconnect 11.4 V / 12.5 V through 100 k : 33 k, schmitt-noninverting on 5 V", () => {
    // Demo data (DEVELOPERS.md): cut at 11.4 V, reconnect at 12.5 V; voltage divider rule [published].
    const node = batteryThresholds({ rTop: 100_000, rBottom: 33_000 }, { upper: 12.5, lower: 11.4 });
    const s = spec({
      name: "",
      spec: {
        kind: "schmitt-noninverting",
        supply: SINGLE,
        target: { upperThreshold: node.upperThreshold, lowerThreshold: node.lowerThreshold },
      },
    });
    const d = design(s);
    const m = simulateDesign(s, d);
    expect(rel(m.upperThreshold!, d.achieved.upperThreshold!)).toBeLessThan(0.005);
    expect(rel(d.achieved.upperThreshold! * (133 / 33), 12.5)).toBeLessThan(0.02);
    expect(rel(d.achieved.lowerThreshold! * (133 / 33), 11.4)).toBeLessThan(0.02);
  });

  it("water-temperature alarm 19 °C / 17.5 °C from an NTC divider, schmitt-inverting", () => {
    // NTC at the bottom: warmer → lower voltage; the inverting stage's output rises as the node
    // falls below the lower threshold (= 19 °C).
    const divider = {
      model: { kind: "beta" as const, r0: 10_000, beta: 3977 },
      rFixed: 10_000,
      supply: 5,
      position: "bottom" as const,
    };
    const v = temperatureToVoltageThresholds(divider, { upper: celsiusToKelvin(19), lower: celsiusToKelvin(17.5) });
    const s = spec({
      name: "",
      spec: {
        kind: "schmitt-inverting",
        supply: SINGLE,
        series: "E96",
        target: { upperThreshold: v.upperThreshold, lowerThreshold: v.lowerThreshold },
      },
    });
    const d = design(s);
    const back = voltageToTemperatureThresholds(divider, {
      upperThreshold: d.achieved.upperThreshold!,
      lowerThreshold: d.achieved.lowerThreshold!,
    });
    // Achieved switching temperatures within 0.1 K of the spec (common practice for a ±0.5 K sensor).
    expect(Math.abs(back.upper - celsiusToKelvin(19))).toBeLessThan(0.1);
    expect(Math.abs(back.lower - celsiusToKelvin(17.5))).toBeLessThan(0.1);
    const m = simulateDesign(s, d);
    expect(rel(m.lowerThreshold!, d.achieved.lowerThreshold!)).toBeLessThan(0.005);
  });
});

describe("sensor in the design spec (thresholds in sensor units)", () => {
  it("NTC at the bottom, 19 °C / 17.5 °C, E96: achieved and simulated switching temperatures", () => {
    const s = spec({
      name: "",
      spec: {
        kind: "schmitt-inverting",
        supply: SINGLE,
        series: "E96",
        target: { upperThreshold: 19, lowerThreshold: 17.5 },
        sensor: {
          kind: "ntc",
          model: { beta: 3977, r25: 10_000 },
          rFixed: 10_000,
          position: "bottom",
          dissipationConstant: 1.5e-3,
          accuracy: 0.5,
        },
      },
    });
    const d = design(s);
    const r = d.sensor!;
    expect(r.inverted).toBe(true);
    expect(Math.abs(r.achieved.upperThreshold! - 19)).toBeLessThan(0.05);
    expect(Math.abs(r.achieved.lowerThreshold! - 17.5)).toBeLessThan(0.05);
    // Simulated voltages back to °C through the same Beta curve (tests/REFERENCES.md NTC Beta model).
    const divider = {
      model: { kind: "beta" as const, r0: 10_000, beta: 3977 },
      rFixed: 10_000,
      supply: 5,
      position: "bottom" as const,
    };
    const m = simulateDesign(s, d);
    const back = voltageToTemperatureThresholds(divider, {
      upperThreshold: m.upperThreshold!,
      lowerThreshold: m.lowerThreshold!,
    });
    expect(Math.abs(back.upper - celsiusToKelvin(r.achieved.upperThreshold!))).toBeLessThan(0.02);
    expect(Math.abs(back.lower - celsiusToKelvin(r.achieved.lowerThreshold!))).toBeLessThan(0.02);
    // Self-heating at 17.5 °C (NTC ≈ 11.15 kΩ, nearest the 10 kΩ fixed part): P = I²·R_ntc [Joule's law].
    const rNtc = 10_000 * Math.exp(3977 * (1 / celsiusToKelvin(17.5) - 1 / 298.15));
    const pAt = (rn: number) => (5 / (rn + 10_000)) ** 2 * rn;
    expect(r.selfHeating!.power).toBeCloseTo(
      Math.max(pAt(rNtc), pAt(10_000 * Math.exp(3977 * (1 / celsiusToKelvin(19) - 1 / 298.15)))),
      12,
    );
    expect(r.selfHeating!.temperatureRise).toBeCloseTo(r.selfHeating!.power / 1.5e-3, 12);
    expect(d.warnings.join(" ")).toMatch(/self-heating/);
  });

  it("battery divider into a comparator: cut at 11.4 V", () => {
    const s = spec({
      name: "",
      spec: {
        kind: "comparator",
        supply: SINGLE,
        target: { threshold: 11.4 },
        sensor: { kind: "divider", rTop: 100_000, rBottom: 33_000 },
      },
    });
    const d = design(s);
    expect(rel(d.sensor!.achieved.upperThreshold!, 11.4)).toBeLessThan(0.02);
    expect(d.sensor!.voltageTarget.upperThreshold).toBeCloseTo((11.4 * 33) / 133, 12);
  });

  it("a falling linear sensor swaps the thresholds", () => {
    const s = spec({
      name: "",
      spec: {
        kind: "schmitt-noninverting",
        supply: SINGLE,
        target: { upperThreshold: 80, lowerThreshold: 60 },
        sensor: { kind: "linear", voltsPerUnit: -0.02, offset: 4.5, unit: "%" },
      },
    });
    const d = design(s);
    // 80 % → 2.9 V, 60 % → 3.3 V: the stage's upper voltage belongs to the lower level.
    expect(d.sensor!.voltageTarget).toEqual({ upperThreshold: 4.5 - 0.02 * 60, lowerThreshold: 4.5 - 0.02 * 80 });
    expect(rel(d.sensor!.achieved.upperThreshold!, 80)).toBeLessThan(0.02);
    expect(rel(d.sensor!.achieved.lowerThreshold!, 60)).toBeLessThan(0.02);
  });
});

describe("closed forms against tests/REFERENCES.md", () => {
  const railToRail = { high: 5, low: 0, offset: 0, openLoopGain: 1e12 };

  it("three equal resistors on 5 V: thresholds 2Vcc/3 and Vcc/3", () => {
    // tests/REFERENCES.md, three-resistor single-supply network [derived]: 3.333 V and 1.667 V
    const th = thevenin(10_000, 10_000, SINGLE);
    const f = stageFigures(
      { kind: "schmitt-inverting", rReference: th.resistance, rFeedback: 10_000, reference: th.voltage },
      railToRail,
    );
    expect(f.upperThreshold).toBeCloseTo(10 / 3, 12);
    expect(f.lowerThreshold).toBeCloseTo(5 / 3, 12);
    // And the synthesis finds three equal resistors for exactly these thresholds.
    const d = design({
      schema: "railwise.design-spec/1",
      kind: "schmitt-inverting",
      supply: SINGLE,
      opamp: { ...CMOS, outputHeadroomHigh: 0, outputHeadroomLow: 0, inputOffset: 0, openLoopGain: 1e10 },
      target: { upperThreshold: 10 / 3, lowerThreshold: 5 / 3 },
      series: "E24",
      reference: "auto",
      monteCarlo: false,
    });
    const values = d.parts.map((p) => p.value);
    expect(new Set(values).size).toBe(1);
    expect(d.achieved.upperThreshold).toBeCloseTo(10 / 3, 9);
    expect(d.achieved.lowerThreshold).toBeCloseTo(5 / 3, 9);
  });

  it("non-inverting Schmitt: upper = Vref(1 + rIn/rFb) − Vol·rIn/rFb (Sedra & Smith)", () => {
    // tests/REFERENCES.md [derived; textbook standard]: Vref 2.5, rIn/rFb = 0.2, Vol 0, Voh 5 → 3.0 / 2.0
    const f = stageFigures(
      { kind: "schmitt-noninverting", rInput: 10_000, rFeedback: 50_000, reference: 2.5 },
      railToRail,
    );
    expect(f.upperThreshold).toBeCloseTo(3.0, 12);
    expect(f.lowerThreshold).toBeCloseTo(2.0, 12);
    expect(f.hysteresis).toBeCloseTo(1.0, 12);
  });

  it("relaxation oscillator: f = 1/(2RC ln 2) = 9.618 kHz for 100 kΩ, 750 pF at Vcc/3, 2Vcc/3", () => {
    // tests/REFERENCES.md [derived]
    const th = thevenin(10_000, 10_000, SINGLE);
    const f = stageFigures(
      {
        kind: "relaxation-oscillator",
        rReference: th.resistance,
        rFeedback: 10_000,
        rTiming: 100_000,
        cTiming: 750e-12,
        reference: th.voltage,
      },
      railToRail,
    );
    expect(f.frequency).toBeCloseTo(9618, 0);
    expect(f.dutyCycle).toBeCloseTo(0.5, 12);
  });

  it("relaxation oscillator: β = 0.5 on symmetric rails gives T = 2.197 RC (Sedra & Smith)", () => {
    // tests/REFERENCES.md [published]: T = 2RC·ln((1+β)/(1−β))
    const f = stageFigures(
      {
        kind: "relaxation-oscillator",
        rReference: 10_000,
        rFeedback: 10_000,
        rTiming: 10_000,
        cTiming: 1e-6,
        reference: 0,
      },
      { high: 5, low: -5, offset: 0, openLoopGain: 1e12 },
    );
    expect(1 / f.frequency! / (10_000 * 1e-6)).toBeCloseTo(2 * Math.log(3), 12);
    expect(2 * Math.log(3)).toBeCloseTo(2.197, 3);
  });

  it("finite open-loop gain: A/(1 + Aβ) = 99.900 for A = 1e5, β = 0.01", () => {
    // tests/REFERENCES.md, single-pole op-amp [published form]
    const f = stageFigures(
      { kind: "noninverting-amplifier", rGround: 1_000, rFeedback: 99_000, reference: 0 },
      { high: 5, low: -5, offset: 0, openLoopGain: 1e5 },
    );
    expect(f.gain).toBeCloseTo(99.9, 3);
  });
});

describe("inverting gain sign (documented choice: −10 and 10 both mean vo/vin = −10)", () => {
  it("gives the same parts and a negative achieved gain either way, noting the magnitude reading", () => {
    const neg = design(spec({ name: "", spec: { kind: "inverting-amplifier", supply: SPLIT, target: { gain: -10 } } }));
    const pos = design(spec({ name: "", spec: { kind: "inverting-amplifier", supply: SPLIT, target: { gain: 10 } } }));
    expect(pos.parts).toEqual(neg.parts);
    expect(pos.achieved.gain).toBeLessThan(0);
    expect(pos.achieved.gain).toBeCloseTo(-10, 2);
    expect(pos.notes.join(" ")).toMatch(/magnitude of an inverting gain/);
    expect(neg.notes).toEqual([]);
  });
});

describe("search quality", () => {
  it("finds the same smallest worst error as an exhaustive E24 search (three resistors, 1 k–10 k)", () => {
    // Exhaustive reference search, common practice, no source.
    const s = spec({
      name: "",
      spec: {
        kind: "schmitt-inverting",
        supply: SINGLE,
        target: { upperThreshold: 3.1, lowerThreshold: 1.45 },
        range: { min: 1e3, max: 1e4 },
      },
    });
    const d = design(s);
    const L = seriesInRange("E24", 1e3, 1e4);
    const high = 4.95,
      low = 0.05,
      vos = 0.001;
    let best = Infinity;
    for (const a of L)
      for (const b of L) {
        const th = thevenin(a, b, SINGLE);
        for (const f of L) {
          const k = th.resistance / (th.resistance + f);
          const U = th.voltage * (1 - k) + k * high + vos;
          const Lo = th.voltage * (1 - k) + k * low + vos;
          best = Math.min(best, Math.max(Math.abs(U - 3.1) / 3.1, Math.abs(Lo - 1.45) / 1.65));
        }
      }
    const got = Math.max(...Object.values(d.errors).map((e) => Math.abs(e!.relative)));
    expect(got).toBeCloseTo(best, 12);
  });
});

describe("worst case and Monte Carlo", () => {
  for (const c of CASES) {
    it(`worst case brackets the Monte Carlo extremes: ${c.name}`, () => {
      const s = spec(c);
      const d = design({ ...s, monteCarlo: { draws: 3000, seed: 7, distribution: "uniform" } });
      const mc = d.monteCarlo!;
      expect(mc.draws).toBe(3000);
      for (const [name, spread] of Object.entries(mc.figures)) {
        const wc = d.worstCase[name as keyof typeof d.worstCase];
        expect(wc, name).not.toBeNull();
        const pad = 1e-9 * Math.max(1, Math.abs(wc![1]));
        expect(spread!.min).toBeGreaterThanOrEqual(wc![0] - pad);
        expect(spread!.max).toBeLessThanOrEqual(wc![1] + pad);
        expect(spread!.histogram.counts.reduce((a, b) => a + b, 0)).toBe(3000);
      }
      expect(mc.insideShare).not.toBeNull();
      expect(mc.insideShare!).toBeGreaterThanOrEqual(0);
      expect(mc.insideShare!).toBeLessThanOrEqual(1);
    });
  }

  it("is seeded: the same seed repeats, another seed differs; normal draws stay inside the corners", () => {
    const d = design(spec(CASES[0]));
    const args = [d.stage, CMOS, SINGLE] as const;
    const opts = {
      tolerance: 0.05,
      draws: 2000,
      seed: 42,
      distribution: "normal" as const,
      divider: d.reference.divider,
    };
    const a = monteCarlo(...args, opts);
    const b = monteCarlo(...args, opts);
    const c = monteCarlo(...args, { ...opts, seed: 43 });
    expect(a).toEqual(b);
    expect(c.figures.upperThreshold!.mean).not.toBe(a.figures.upperThreshold!.mean);
    const wc = worstCase(d.stage, CMOS, SINGLE, 0.05, { divider: d.reference.divider });
    expect(a.figures.upperThreshold!.min).toBeGreaterThanOrEqual(wc.upperThreshold![0]);
    expect(a.figures.upperThreshold!.max).toBeLessThanOrEqual(wc.upperThreshold![1]);
    // Normal draws (tolerance = 3σ) spread less than uniform ones: σ ≈ range/6 vs range/√12 per part.
    const u = monteCarlo(...args, { ...opts, distribution: "uniform" });
    expect(a.figures.upperThreshold!.std).toBeLessThan(u.figures.upperThreshold!.std);
  });

  it("share inside the spec window counts draws: a window around everything is 1, an empty one 0", () => {
    const d = design(spec(CASES[0]));
    const base = {
      tolerance: 0.01,
      draws: 500,
      seed: 1,
      distribution: "uniform" as const,
      divider: d.reference.divider,
    };
    expect(monteCarlo(d.stage, CMOS, SINGLE, { ...base, window: { upperThreshold: [-100, 100] } }).insideShare).toBe(1);
    expect(monteCarlo(d.stage, CMOS, SINGLE, { ...base, window: { upperThreshold: [100, 101] } }).insideShare).toBe(0);
    // Half-open window at the median splits the draws roughly in half.
    const mc = monteCarlo(d.stage, CMOS, SINGLE, base);
    const mid = mc.figures.upperThreshold!.mean;
    const share = monteCarlo(d.stage, CMOS, SINGLE, { ...base, window: { upperThreshold: [mid, 100] } }).insideShare!;
    expect(share).toBeGreaterThan(0.4);
    expect(share).toBeLessThan(0.6);
  });

  it("worst case of a plain stage (no divider) varies its own resistors and the offset", () => {
    const wc = worstCase(
      { kind: "schmitt-noninverting", rInput: 10_000, rFeedback: 50_000, reference: 2.5 },
      { ...CMOS, outputHeadroomHigh: 0, outputHeadroomLow: 0, inputOffset: 0.002 },
      SINGLE,
      0.01,
    );
    expect(wc.varied).toEqual(["rInput", "rFeedback", "inputOffset"]);
    // Hand corners [derived]: r ∈ [0.2·0.99/1.01, 0.2·1.01/0.99], Vos ∈ ±2 mV; upper = (2.5 − Vos)(1 + r)
    const rMax = (0.2 * 1.01) / 0.99;
    expect(wc.upperThreshold![1]).toBeCloseTo((2.5 + 0.002) * (1 + rMax), 12);
    const rMin = (0.2 * 0.99) / 1.01;
    expect(wc.upperThreshold![0]).toBeCloseTo((2.5 - 0.002) * (1 + rMin), 12);
  });
});
