// `design()` output drops into a scenario with its reference divider and sensor intact, and the
// simulation of that circuit meets the design in source units (battery volts, °C).
import { describe, expect, it } from "vitest";
import { design } from "@/lib/design";
import { circuitWorstCase } from "@/lib/design/spread";
import { billOfMaterials } from "@/lib/design/bom";
import { simulate } from "@/lib/sim";
import { lowerCircuit, sourceReadings } from "@/lib/sim/circuit";
import { parseScenario } from "@/lib/schemas/scenario";

const CMOS = {
  openLoopGain: 2e5,
  gainBandwidth: 1e6,
  slewRate: 1e6,
  outputHeadroomHigh: 0.02,
  outputHeadroomLow: 0.02,
  inputOffset: 0,
};

const batterySpec = {
  schema: "railwise.design-spec/1",
  kind: "schmitt-inverting",
  supply: { positive: 5, negative: 0 },
  opamp: CMOS,
  target: { upperThreshold: 12.5, lowerThreshold: 11.4 },
  series: "E24",
  tolerance: 0.01,
  reference: "auto",
  sensor: { kind: "divider", rTop: 68e3, rBottom: 18e3 },
  monteCarlo: false,
};

describe("design output as built", () => {
  const d = design(batterySpec);

  it("returns the reference divider, every resistor and the source", () => {
    expect(d.stage.referenceDivider).toBeDefined();
    expect(d.source).toEqual({ sensor: batterySpec.sensor });
    const roles = d.parts.map((p) => p.role);
    expect(roles).toEqual(expect.arrayContaining(["rTop", "rBottom", "rFeedback", "sourceTop", "sourceBottom"]));
    expect(roles).not.toContain("rReference");
    // Every part of the parts list is a standard value (IEC 60063), nothing flagged
    const bom = billOfMaterials(
      parseScenario({
        schema: "railwise.scenario/1",
        supply: batterySpec.supply,
        opamp: CMOS,
        stage: d.stage,
        source: d.source,
        input: { components: [{ kind: "dc", level: 12 }] },
        run: { duration: 1, points: 2 },
      }),
    );
    expect(bom.warnings).toEqual([]);
    expect(bom.lines).toHaveLength(5);
  });

  it("simulates with the divider and sensor intact and switches at the designed battery volts", () => {
    const scenario = parseScenario({
      schema: "railwise.scenario/1",
      supply: batterySpec.supply,
      opamp: CMOS,
      stage: JSON.parse(JSON.stringify(d.stage)),
      source: d.source,
      tolerances: { resistor: 0.01 },
      // Battery swept 10.5 → 13.5 V and back over 2 s (one triangle period, starting at its minimum)
      input: { components: [{ kind: "triangle", amplitude: 1.5, offset: 12, frequency: 0.5, phase: 270 }] },
      run: { duration: 2, points: 4001, initialOutput: "high" },
    });
    const low = lowerCircuit(scenario);
    const r = simulate(low.scenario);
    const src = sourceReadings(low, r)!;
    expect(src.metrics.unit).toBe("V");
    // The design's achieved thresholds (battery volts) within 5 mV (finite gain and GBW; E24 values)
    expect(src.metrics.upperThreshold!).toBeCloseTo(d.sensor!.achieved.upperThreshold!, 2);
    expect(src.metrics.lowerThreshold!).toBeCloseTo(d.sensor!.achieved.lowerThreshold!, 2);
    // …inside the target ±2 % (maxError default) and inside the design's worst case
    expect(Math.abs(src.metrics.upperThreshold! - 12.5) / 12.5).toBeLessThan(0.02);
    const wc = d.sensor!.worstCase.upperThreshold!;
    expect(src.metrics.upperThreshold!).toBeGreaterThanOrEqual(wc[0]);
    expect(src.metrics.upperThreshold!).toBeLessThanOrEqual(wc[1]);
    // One worst case: the design panel's figure is the scenario's own corner search
    const own = circuitWorstCase(scenario);
    expect(own.sourceUpperThreshold).toEqual(wc);
    expect(own.upperThreshold).toEqual(d.worstCase.upperThreshold);
  });

  it("an NTC design keeps its sensor and meets its °C targets in simulation", () => {
    const spec = {
      ...batterySpec,
      target: { upperThreshold: 19, lowerThreshold: 17.5 },
      sensor: { kind: "ntc", model: { beta: 3977, r25: 10e3 }, rFixed: 15e3, position: "bottom" },
    };
    const dn = design(spec);
    expect(dn.parts.map((p) => p.role)).toContain("sourceFixed");
    const scenario = parseScenario({
      schema: "railwise.scenario/1",
      supply: spec.supply,
      opamp: CMOS,
      stage: dn.stage,
      source: dn.source,
      input: {
        components: [
          {
            kind: "pwl",
            points: [
              [0, 15],
              [1800, 21],
              [3600, 15],
            ],
          },
        ],
      },
      run: { duration: 3600, points: 3601, initialOutput: "low" },
    });
    const low = lowerCircuit(scenario);
    const src = sourceReadings(low, simulate(low.scenario))!;
    expect(src.metrics.unit).toBe("°C");
    expect(src.metrics.upperThreshold!).toBeCloseTo(dn.sensor!.achieved.upperThreshold!, 1);
    expect(src.metrics.lowerThreshold!).toBeCloseTo(dn.sensor!.achieved.lowerThreshold!, 1);
    expect(Math.abs(src.metrics.upperThreshold! - 19)).toBeLessThan(0.3);
    expect(Math.abs(src.metrics.lowerThreshold! - 17.5)).toBeLessThan(0.3);
  });

  it("refuses an NTC on a current-drawing input, naming the sensor", () => {
    expect(() =>
      design({
        ...batterySpec,
        kind: "schmitt-noninverting",
        target: { upperThreshold: 19, lowerThreshold: 17.5 },
        sensor: { kind: "ntc", model: { beta: 3977, r25: 10e3 }, rFixed: 15e3, position: "top" },
      }),
    ).toThrow(/^sensor: an NTC cannot feed the schmitt-noninverting input/);
  });
});

describe("open-drain output in the spec", () => {
  it("chooses a 10 k pull-up from the series and designs with the loaded high level", () => {
    const spec = {
      schema: "railwise.design-spec/1",
      kind: "schmitt-inverting",
      supply: { positive: 5, negative: 0 },
      opamp: { ...CMOS, inputOffset: 0 },
      target: { upperThreshold: 3.3, lowerThreshold: 1.7 },
      series: "E24",
      tolerance: 0.01,
      reference: "auto",
      output: { kind: "open-drain" },
      monteCarlo: false,
    };
    const d = design(spec);
    expect(d.output).toEqual({ kind: "open-drain", pullUp: 10e3 });
    expect(d.parts.find((p) => p.role === "pullUp")?.code).toBe("10K");
    const st = d.stage;
    if (st.kind !== "schmitt-inverting") throw new Error("kind");
    // Released pin: 5 V through 10 k into rReference + rFeedback to the reference (the divider's
    // Thevenin form, filled by the parse); the
    // inverting Schmitt closed form with that high level (tests/REFERENCES.md; nodal analysis, common
    // practice, no source). Low level Vol = 0.02 V (the part's headroom).
    expect(st.referenceDivider).toBeDefined();
    const vref = st.reference;
    const voh = (5 * (st.rReference + st.rFeedback) + vref * 10e3) / (10e3 + st.rReference + st.rFeedback);
    const k = st.rReference / (st.rReference + st.rFeedback);
    expect(d.achieved.upperThreshold!).toBeCloseTo(vref * (1 - k) + k * voh, 9);
    expect(d.achieved.lowerThreshold!).toBeCloseTo(vref * (1 - k) + k * 0.02, 9);
    // Designed for the loaded level: within the default 2 % of the targets
    expect(Math.abs(d.achieved.upperThreshold! - 3.3) / 3.3).toBeLessThan(0.02);
    expect(Math.abs(d.achieved.lowerThreshold! - 1.7) / 1.7).toBeLessThan(0.02);
    // The worst case includes the pull-up's tolerance and brackets the nominal
    expect(d.worstCase.upperThreshold![0]).toBeLessThan(d.achieved.upperThreshold!);
    expect(d.worstCase.upperThreshold![1]).toBeGreaterThan(d.achieved.upperThreshold!);
  });

  it("refuses an open-drain output on an amplifier, naming the field", () => {
    expect(() =>
      design({
        ...batterySpec,
        kind: "noninverting-amplifier",
        target: { gain: 10 },
        reference: 0,
        sensor: undefined,
        output: { kind: "open-drain" },
      }),
    ).toThrow(/output: an open-drain output applies to threshold stages only/);
  });
});

describe("filter suggestion from a bounce time", () => {
  it("picks R and C so that a step reaches the upper switching point after the bounce time", () => {
    const d = design({
      schema: "railwise.design-spec/1",
      kind: "schmitt-inverting",
      supply: { positive: 5, negative: 0 },
      opamp: CMOS,
      target: { upperThreshold: 3.3, lowerThreshold: 1.7 },
      series: "E24",
      reference: "auto",
      filter: { bounceTime: 0.01 },
      monteCarlo: false,
    });
    expect(d.filter).toBeDefined();
    const { r, c } = d.filter!;
    // First-order RC step response: v(t) = Vstep(1 − e^(−t/RC)) → t = RC·ln(Vstep/(Vstep − Vth))
    // (any circuit-theory text; the closed form)
    const t = r * c * Math.log(5 / (5 - d.achieved.upperThreshold!));
    expect(Math.abs(t - 0.01) / 0.01).toBeLessThan(0.05);
    expect(d.parts.map((p) => p.role)).toEqual(expect.arrayContaining(["filterR", "filterC"]));
    // The suggested filter drops into a scenario
    expect(() =>
      parseScenario({
        schema: "railwise.scenario/1",
        supply: { positive: 5, negative: 0 },
        opamp: CMOS,
        stage: d.stage,
        filter: d.filter,
        input: { components: [{ kind: "dc", level: 0 }] },
        run: { duration: 1, points: 2 },
      }),
    ).not.toThrow();
  });

  it("refuses a step that never reaches the switching point, naming filter", () => {
    expect(() =>
      design({
        ...batterySpec,
        sensor: undefined,
        target: { upperThreshold: 3.3, lowerThreshold: 1.7 },
        reference: "auto",
        filter: { bounceTime: 0.01, step: 2 },
      }),
    ).toThrow(/^filter: filter\.step \(2 V\) must be above the upper switching point/);
  });
});
