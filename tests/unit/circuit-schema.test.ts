// "The circuit as built" contract (lib/schemas/README.md): source, filter, referenceDivider, output,
// supply.tolerance, tolerances, spec. Optional fields; every refusal names the field.
import { describe, expect, it } from "vitest";
import { DEMO_SCENARIOS } from "@/lib/demo/scenarios";
import { describeIssues, parseScenario, scenarioSchema, type ScenarioInput } from "@/lib/schemas/scenario";

const base = (): ScenarioInput & Record<string, unknown> =>
  ({
    schema: "railwise.scenario/1",
    supply: { positive: 5, negative: 0 },
    opamp: {
      openLoopGain: 2e5,
      gainBandwidth: 1e6,
      slewRate: 1e6,
      outputHeadroomHigh: 0,
      outputHeadroomLow: 0,
      inputOffset: 0,
    },
    stage: { kind: "comparator", reference: 2.5 },
    input: { components: [{ kind: "dc", level: 1 }] },
    run: { duration: 1, points: 11 },
  }) as ScenarioInput & Record<string, unknown>;

function issuesOf(value: unknown): string[] {
  const r = scenarioSchema.safeParse(value);
  expect(r.success).toBe(false);
  return r.success ? [] : describeIssues(r.error);
}

describe("circuit additions", () => {
  it("a scenario without them parses as before (reference defaults to 0 V)", () => {
    const s = base();
    delete (s.stage as Record<string, unknown>).reference;
    const p = parseScenario(s);
    expect(p.stage.reference).toBe(0);
    expect(p.source).toBeUndefined();
    expect(p.filter).toBeUndefined();
  });

  it("every demo scenario still parses and round-trips through its own parse", () => {
    for (const d of DEMO_SCENARIOS) {
      // Compared as JSON: a stored scenario is JSON (−0 in generated samples reads back as 0).
      const once = JSON.parse(JSON.stringify(parseScenario(d.scenario)));
      expect(JSON.parse(JSON.stringify(parseScenario(once)))).toEqual(once);
    }
  });

  it("a reference divider fills the open-circuit voltage, and the stored form parses again", () => {
    const s = { ...base(), stage: { kind: "comparator", referenceDivider: { rTop: 10e3, rBottom: 10e3 } } };
    const p = parseScenario(s);
    // 5 V · 10k/(10k + 10k) = 2.5 V (voltage divider rule, common practice, no source)
    expect(p.stage.reference).toBeCloseTo(2.5, 12);
    expect(parseScenario(JSON.parse(JSON.stringify(p)))).toEqual(p);
  });

  it("refuses a reference given twice, naming the field", () => {
    const s = {
      ...base(),
      stage: { kind: "comparator", reference: 1, referenceDivider: { rTop: 10e3, rBottom: 10e3 } },
    };
    expect(issuesOf(s).join("\n")).toMatch(/stage\.referenceDivider: give exactly one of stage\.reference/);
  });

  it("schmitt-inverting: the divider replaces rReference, which must then be absent", () => {
    const ok = {
      ...base(),
      stage: { kind: "schmitt-inverting", rFeedback: 100e3, referenceDivider: { rTop: 100e3, rBottom: 100e3 } },
    };
    const p = parseScenario(ok);
    if (p.stage.kind !== "schmitt-inverting") throw new Error("kind");
    // Thevenin resistance of 100k ∥ 100k = 50 kΩ (common practice, no source)
    expect(p.stage.rReference).toBeCloseTo(50e3, 6);
    const twice = { ...ok, stage: { ...ok.stage, rReference: 33e3 } };
    expect(issuesOf(twice).join("\n")).toMatch(/stage\.rReference: stage\.rReference must be absent/);
    const none = { ...base(), stage: { kind: "schmitt-inverting", rFeedback: 100e3, reference: 2 } };
    expect(issuesOf(none).join("\n")).toMatch(/stage\.rReference/);
  });

  it("refuses a filter on the oscillator", () => {
    const s = {
      ...base(),
      stage: {
        kind: "relaxation-oscillator",
        rReference: 100e3,
        rFeedback: 100e3,
        rTiming: 100e3,
        cTiming: 1e-6,
        reference: 2.5,
      },
      filter: { r: 10e3, c: 1e-6 },
    };
    expect(issuesOf(s).join("\n")).toMatch(/^filter: filter does not apply to the relaxation oscillator/m);
  });

  it("refuses an NTC feeding a current-drawing input without a filter (source.sensor)", () => {
    const ntc = { kind: "ntc", model: { beta: 3977, r25: 10e3 }, rFixed: 10e3, position: "bottom" };
    const s = {
      ...base(),
      stage: { kind: "schmitt-noninverting", rInput: 10e3, rFeedback: 100e3, reference: 2.5 },
      source: { sensor: ntc },
    };
    expect(issuesOf(s).join("\n")).toMatch(
      /^source\.sensor: an NTC source cannot feed the schmitt-noninverting input/m,
    );
    // With a filter it is accepted; on a high-impedance input too.
    expect(() => parseScenario({ ...s, filter: { r: 10e3, c: 1e-6 } })).not.toThrow();
    expect(() => parseScenario({ ...base(), source: { sensor: ntc } })).not.toThrow();
  });

  it("names the field of a bad source, output, tolerance or spec", () => {
    expect(
      issuesOf({
        ...base(),
        source: { quantity: "x".repeat(61), sensor: { kind: "divider", rTop: 1, rBottom: 1 } },
      }).join("\n"),
    ).toMatch(/source\.quantity: source\.quantity must be at most 60 characters/);
    expect(issuesOf({ ...base(), source: { sensor: { kind: "divider", rTop: -1, rBottom: 1 } } }).join("\n")).toMatch(
      /source\.sensor\.rTop/,
    );
    expect(issuesOf({ ...base(), output: { kind: "open-drain" } }).join("\n")).toMatch(/output\.pullUp/);
    expect(issuesOf({ ...base(), output: { kind: "totem" } }).join("\n")).toMatch(/output/);
    expect(issuesOf({ ...base(), tolerances: { resistor: 2 } }).join("\n")).toMatch(/tolerances\.resistor/);
    expect(issuesOf({ ...base(), supply: { positive: 5, negative: 0, tolerance: -0.1 } }).join("\n")).toMatch(
      /supply\.tolerance/,
    );
    expect(issuesOf({ ...base(), spec: { schema: "railwise.design-spec/1" } }).join("\n")).toMatch(/^spec\./m);
  });

  it("accepts the full set of additions", () => {
    const s = {
      ...base(),
      supply: { positive: 5, negative: 0, tolerance: 0.02 },
      stage: {
        kind: "schmitt-inverting",
        rFeedback: 680e3,
        referenceDivider: { rTop: 33e3, rBottom: 33e3, top: "positive", bottom: "ground" },
      },
      source: { quantity: "battery", sensor: { kind: "divider", rTop: 68e3, rBottom: 18e3 } },
      output: { kind: "open-drain", pullUp: 10e3, pullUpTo: 3.3, load: { r: 100e3, to: 0 } },
      tolerances: { resistor: 0.01, capacitor: 0.1 },
      spec: {
        schema: "railwise.design-spec/1",
        kind: "schmitt-inverting",
        supply: { positive: 5, negative: 0 },
        opamp: base().opamp,
        target: { upperThreshold: 12.5, lowerThreshold: 11.4 },
        series: "E24",
        reference: "auto",
        sensor: { kind: "divider", rTop: 68e3, rBottom: 18e3 },
      },
    };
    const p = parseScenario(s);
    expect(p.output).toEqual({ kind: "open-drain", pullUp: 10e3, pullUpTo: 3.3, load: { r: 100e3, to: 0 } });
    expect(p.spec?.target.upperThreshold).toBe(12.5);
  });
});
