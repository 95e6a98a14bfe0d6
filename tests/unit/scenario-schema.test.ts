// The railwise.scenario/1 contract: the demo scenarios parse; malformed ones are refused with
// a message that names the field (lib/schemas/README.md § Scenario JSON).
import { describe, expect, it } from "vitest";
import { DEMO_SCENARIOS, HARROW_SCENARIOS, ntcResistance } from "@/lib/demo/scenarios";
import {
  describeIssues,
  parseScenario,
  scenarioSchema,
  ScenarioError,
  type ScenarioInput,
} from "@/lib/schemas/scenario";

const battery = () =>
  structuredClone(DEMO_SCENARIOS.find((s) => s.key === "battery-cutoff")!.scenario) as ScenarioInput &
    Record<string, unknown>;

function issuesOf(value: unknown): string[] {
  const r = scenarioSchema.safeParse(value);
  expect(r.success).toBe(false);
  return r.success ? [] : describeIssues(r.error);
}

describe("demo scenarios", () => {
  it("holds the five board scenarios of DEVELOPERS.md § Demo data and the open-drain flag of issue #11", () => {
    expect(DEMO_SCENARIOS.map((s) => s.key)).toEqual([
      "battery-cutoff",
      "hydrophone-preamp",
      "water-temperature-alarm",
      "bilge-float",
      "status-lamp",
      "humidity-flag",
    ]);
  });

  it.each([...DEMO_SCENARIOS, ...HARROW_SCENARIOS].map((s) => [s.key, s] as const))(
    "%s is a valid railwise.scenario/1",
    (_key, demo) => {
      const parsed = parseScenario(demo.scenario);
      expect(parsed.schema).toBe("railwise.scenario/1");
      expect(parsed.name).toBe(demo.name);
    },
  );

  it("uses the stage kinds the use cases call for", () => {
    const kind = (key: string) => parseScenario(DEMO_SCENARIOS.find((s) => s.key === key)!.scenario).stage.kind;
    expect(kind("battery-cutoff")).toBe("schmitt-inverting");
    expect(kind("hydrophone-preamp")).toBe("noninverting-amplifier");
    expect(kind("water-temperature-alarm")).toBe("schmitt-inverting");
    expect(kind("bilge-float")).toBe("schmitt-noninverting");
    expect(kind("status-lamp")).toBe("relaxation-oscillator");
  });

  it("bilge float runs on a capture with strictly increasing time", () => {
    const s = parseScenario(DEMO_SCENARIOS.find((d) => d.key === "bilge-float")!.scenario);
    const capture = s.input.components.find((c) => c.kind === "capture");
    expect(capture?.kind).toBe("capture");
    if (capture?.kind !== "capture") return;
    expect(capture.samples.length).toBeGreaterThan(1000);
    for (let i = 1; i < capture.samples.length; i++)
      expect(capture.samples[i][0]).toBeGreaterThan(capture.samples[i - 1][0]);
  });

  it("NTC helper follows the Beta model", () => {
    // tests/REFERENCES.md [derived]: B = 3977 K, R25 = 10 kΩ → R(0 °C) = 33 900 Ω (±0.5 %).
    expect(ntcResistance(25)).toBeCloseTo(10_000, 6);
    expect(Math.abs(ntcResistance(0) - 33_900) / 33_900).toBeLessThan(0.005);
  });
});

describe("schema refusals name the field", () => {
  it("negative resistor → stage.rFeedback", () => {
    const s = battery();
    (s.stage as { rFeedback: number }).rFeedback = -10;
    expect(issuesOf(s).join("\n")).toMatch(/^stage\.rFeedback: rFeedback must be a positive resistance/m);
  });

  it("missing resistor role → stage.rReference", () => {
    const s = battery();
    delete (s.stage as { rReference?: number }).rReference;
    expect(issuesOf(s).some((l) => l.startsWith("stage.rReference:"))).toBe(true);
  });

  it("unknown stage kind → stage.kind", () => {
    const s = battery();
    (s.stage as { kind: string }).kind = "magic-amplifier";
    expect(issuesOf(s).some((l) => l.startsWith("stage.kind:") && l.includes("must be one of"))).toBe(true);
  });

  it("wrong schema id → schema", () => {
    const s = battery();
    (s as { schema: string }).schema = "railwise.scenario/2";
    expect(issuesOf(s)).toContain('schema: schema must be "railwise.scenario/1"');
  });

  it("too many points → run.points", () => {
    const s = battery();
    s.run.points = 3_000_000;
    expect(issuesOf(s)).toContain("run.points: run.points must be at most 2,000,000");
  });

  it("one point → run.points", () => {
    const s = battery();
    s.run.points = 1;
    expect(issuesOf(s)).toContain("run.points: run.points must be at least 2");
  });

  it("headroom as large as the supply span → opamp.outputHeadroomHigh", () => {
    const s = battery();
    s.opamp = { ...s.opamp, outputHeadroomHigh: 3, outputHeadroomLow: 2 };
    expect(
      issuesOf(s).some((l) => l.startsWith("opamp.outputHeadroomHigh:") && l.includes("smaller than the supply span")),
    ).toBe(true);
  });

  it("supplies the wrong way round → supply.positive", () => {
    const s = battery();
    s.supply = { positive: 0, negative: 5 };
    expect(issuesOf(s).some((l) => l.startsWith("supply.positive:"))).toBe(true);
  });

  it("reference outside the supplies → stage.reference", () => {
    const s = battery();
    (s.stage as { reference: number }).reference = 7;
    expect(issuesOf(s).some((l) => l.startsWith("stage.reference:"))).toBe(true);
  });

  it("capture time going backwards → input.components.0.samples.<i>.0", () => {
    const s = battery();
    s.input = {
      components: [
        {
          kind: "capture",
          samples: [
            [0, 1],
            [0.1, 2],
            [0.05, 3],
          ],
        },
      ],
    };
    expect(issuesOf(s).some((l) => /^input\.components\.0\.samples\.2\.0: .*strictly increasing/.test(l))).toBe(true);
  });

  it("no input components → input.components", () => {
    const s = battery();
    s.input = { components: [] };
    expect(issuesOf(s)).toContain("input.components: input.components needs at least one waveform component");
  });

  it("non-finite numbers → the field", () => {
    const s = battery();
    s.opamp = { ...s.opamp, gainBandwidth: Number.POSITIVE_INFINITY };
    expect(issuesOf(s).some((l) => l.startsWith("opamp.gainBandwidth:"))).toBe(true);
  });

  it("parseScenario throws a ScenarioError listing each field", () => {
    const s = battery();
    s.run.duration = 0;
    (s.stage as { rFeedback: number }).rFeedback = 0;
    let caught: unknown;
    try {
      parseScenario(s);
    } catch (err) {
      caught = err;
    }
    expect(caught).toBeInstanceOf(ScenarioError);
    const issues = (caught as ScenarioError).issues;
    expect(issues.some((l) => l.startsWith("run.duration:"))).toBe(true);
    expect(issues.some((l) => l.startsWith("stage.rFeedback:"))).toBe(true);
  });
});
