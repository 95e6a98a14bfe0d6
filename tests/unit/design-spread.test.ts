// One worst case for the circuit as built: corners over every part of the network, the supply
// and the NTC parameters, checked against closed forms and bracketing a Monte Carlo of every part.
import { describe, expect, it } from "vitest";
import { circuitFigures, circuitMonteCarlo, circuitWorstCase, spreadVariables } from "@/lib/design/spread";
import { stageFigures } from "@/lib/design/analysis";
import { parseScenario, type Scenario } from "@/lib/schemas/scenario";

const CMOS = {
  openLoopGain: 2e5,
  gainBandwidth: 1e6,
  slewRate: 1e6,
  outputHeadroomHigh: 0.02,
  outputHeadroomLow: 0.02,
  inputOffset: 0.001,
};

const make = (partial: Record<string, unknown>): Scenario =>
  parseScenario({
    schema: "railwise.scenario/1",
    supply: { positive: 5, negative: 0 },
    opamp: CMOS,
    stage: { kind: "comparator", reference: 2.5 },
    input: { components: [{ kind: "dc", level: 12 }] },
    run: { duration: 1, points: 11 },
    ...partial,
  });

const battery = make({
  supply: { positive: 5, negative: 0, tolerance: 0.02 },
  stage: { kind: "schmitt-inverting", rFeedback: 680e3, referenceDivider: { rTop: 33e3, rBottom: 33e3 } },
  source: { quantity: "battery", sensor: { kind: "divider", rTop: 68e3, rBottom: 18e3 } },
  tolerances: { resistor: 0.01 },
});

describe("circuitFigures", () => {
  it("a reference divider equals its Thevenin form (Thevenin's theorem)", () => {
    const f = circuitFigures(battery);
    // Thevenin of 33k/33k from 5 V: 2.5 V behind 16.5 kΩ; inverting Schmitt closed form (tests/REFERENCES.md)
    const th = stageFigures(
      { kind: "schmitt-inverting", rReference: 16.5e3, rFeedback: 680e3, reference: 2.5 },
      { high: 4.98, low: 0.02, offset: 0.001, openLoopGain: 2e5 },
    );
    expect(f.upperThreshold!).toBeCloseTo(th.upperThreshold!, 12);
    expect(f.lowerThreshold!).toBeCloseTo(th.lowerThreshold!, 12);
    // In battery volts: divide by 18/86 (voltage divider rule, common practice, no source)
    expect(f.sourceUpperThreshold!).toBeCloseTo((th.upperThreshold! * 86) / 18, 12);
  });

  it("varies every part, the supply and the offset", () => {
    expect(spreadVariables(battery).map((v) => v.name)).toEqual([
      "stage.rFeedback",
      "stage.referenceDivider.rTop",
      "stage.referenceDivider.rBottom",
      "source.sensor.rTop",
      "source.sensor.rBottom",
      "supply.positive",
      "opamp.inputOffset",
      "opamp.outputHeadroomHigh",
      "opamp.outputHeadroomLow",
    ]);
  });

  it("open drain: a schmitt-inverting stage's high level is the pull-up loaded by rReference + rFeedback", () => {
    const s = make({
      opamp: { ...CMOS, outputHeadroomHigh: 0, outputHeadroomLow: 0, inputOffset: 0 },
      stage: { kind: "schmitt-inverting", rReference: 100e3, rFeedback: 100e3, reference: 2.5 },
      output: { kind: "open-drain", pullUp: 10e3 },
    });
    const f = circuitFigures(s);
    // Pin: 5 V through 10 k into 200 k to 2.5 V → vo = (5·200k + 2.5·10k)/210k; v+ = (2.5 + vo)/2 (nodal analysis, common practice, no source)
    const vo = (5 * 200e3 + 2.5 * 10e3) / 210e3;
    expect(f.upperThreshold!).toBeCloseTo((2.5 + vo) / 2, 12);
    expect(f.lowerThreshold!).toBeCloseTo(1.25, 12);
  });
});

describe("circuitWorstCase", () => {
  it("brackets a Monte Carlo of every part (battery cut-off with supply tolerance)", () => {
    const wc = circuitWorstCase(battery);
    const mc = circuitMonteCarlo(battery, 3000, 7);
    for (const name of ["upperThreshold", "lowerThreshold", "sourceUpperThreshold", "sourceLowerThreshold"] as const) {
      const xs = mc.map((m) => m[name]!);
      expect(Math.min(...xs)).toBeGreaterThanOrEqual(wc[name]![0]);
      expect(Math.max(...xs)).toBeLessThanOrEqual(wc[name]![1]);
      // …and the corners are not loose: the draws reach most of the way (uniform draws, 9 parts)
      expect(Math.max(...xs) - Math.min(...xs)).toBeGreaterThan(0.5 * (wc[name]![1] - wc[name]![0]));
    }
  });

  it("the supply tolerance widens the spread of a supply-derived reference", () => {
    const without = circuitWorstCase({ ...battery, supply: { positive: 5, negative: 0 } });
    const withTol = circuitWorstCase(battery);
    const w = (i: [number, number]) => i[1] - i[0];
    expect(w(withTol.sourceUpperThreshold!)).toBeGreaterThan(w(without.sourceUpperThreshold!));
  });

  it("NTC alarm: R25 and Beta tolerance are corners; the °C window brackets a Monte Carlo", () => {
    const ntc = make({
      stage: { kind: "schmitt-inverting", rFeedback: 200e3, referenceDivider: { rTop: 7.5e3, rBottom: 6.8e3 } },
      source: { sensor: { kind: "ntc", model: { beta: 3977, r25: 10e3 }, rFixed: 15e3, position: "bottom" } },
      tolerances: { resistor: 0.01, ntcR25: 0.01, ntcBeta: 0.01 },
    });
    const names = spreadVariables(ntc).map((v) => v.name);
    expect(names).toContain("source.sensor.model.r25");
    expect(names).toContain("source.sensor.model.beta");
    const wc = circuitWorstCase(ntc);
    // Nominal: Beta inverse of the volt thresholds (tests/REFERENCES.md Beta model), bottom NTC inverts
    const nom = wc.nominal;
    const betaC = (v: number) => 1 / (1 / 298.15 + Math.log((15e3 * v) / (5 - v) / 10e3) / 3977) - 273.15;
    expect(nom.sourceUpperThreshold!).toBeCloseTo(betaC(nom.lowerThreshold!), 9);
    const mc = circuitMonteCarlo(ntc, 3000, 11);
    const xs = mc.map((m) => m.sourceUpperThreshold!);
    expect(Math.min(...xs)).toBeGreaterThanOrEqual(wc.sourceUpperThreshold![0]);
    expect(Math.max(...xs)).toBeLessThanOrEqual(wc.sourceUpperThreshold![1]);
  });
});

describe("one worst case: design panel, summary and tolerance spread agree", () => {
  it("gives the same corners for a designed battery cut-off with an auto reference", async () => {
    const { design } = await import("@/lib/design");
    const { studyCorners } = await import("@/lib/studies/corners");
    const { toleranceSpreadConfigSchema } = await import("@/lib/schemas/study");
    const d = design({
      schema: "railwise.design-spec/1",
      kind: "schmitt-inverting",
      supply: { positive: 5, negative: 0, tolerance: 0.02 },
      opamp: CMOS,
      target: { upperThreshold: 12.5, lowerThreshold: 11.4 },
      series: "E24",
      tolerance: 0.01,
      reference: "auto",
      sensor: { kind: "divider", rTop: 68e3, rBottom: 18e3 },
      monteCarlo: false,
    });
    const scenario = make({
      supply: { positive: 5, negative: 0, tolerance: 0.02 },
      stage: d.stage,
      source: d.source,
      tolerances: { resistor: 0.01 },
    });
    // The summary's figure
    const summary = circuitWorstCase(scenario);
    // The study's corners (its own resistor tolerance, offset and headroom settings)
    const config = toleranceSpreadConfigSchema.parse({
      kind: "tolerance-spread",
      seed: 1,
      draws: 10,
      resistorTolerance: 0.01,
      offsetTolerance: Math.abs(CMOS.inputOffset),
      headroomSpread: 0.2,
      distribution: "uniform",
      probe: { kind: "scenario" },
      measures: ["upperThreshold", "lowerThreshold"],
    });
    const study = studyCorners(scenario, config);
    for (const n of ["upperThreshold", "lowerThreshold"] as const) {
      expect(summary[n]![0]).toBeCloseTo(d.worstCase[n]![0], 12);
      expect(summary[n]![1]).toBeCloseTo(d.worstCase[n]![1], 12);
      expect(study[n]![0]).toBeCloseTo(d.worstCase[n]![0], 12);
      expect(study[n]![1]).toBeCloseTo(d.worstCase[n]![1], 12);
    }
    expect(summary.sourceUpperThreshold).toEqual(d.sensor!.worstCase.upperThreshold);
  });
});
