// Parts list derived from a scenario: every resistor and capacitor of source, filter, stage,
// reference divider and output, with IEC 60062 RKM codes and IEC 60063 series (tests/REFERENCES.md).
import { describe, expect, it } from "vitest";
import { billOfMaterials, bomToCsv, seriesOf } from "@/lib/design/bom";
import { parseScenario } from "@/lib/schemas/scenario";

const opamp = {
  openLoopGain: 2e5,
  gainBandwidth: 1e6,
  slewRate: 1e6,
  outputHeadroomHigh: 0,
  outputHeadroomLow: 0,
  inputOffset: 0,
};

describe("seriesOf (IEC 60063)", () => {
  it("finds the coarsest series holding a value", () => {
    // E6: 10 15 22 33 47 68; E12 adds 12 18 27 39 56 82; E24 adds 11 13 16 20 24 30 36 43 51 62 75 91 (IEC 60063:2015)
    expect(seriesOf(4700)).toBe("E6");
    expect(seriesOf(18e3)).toBe("E12");
    expect(seriesOf(7.5e3)).toBe("E24");
    expect(seriesOf(6.8e3)).toBe("E6");
    // E96 has 1.02 (round(10^(1/96), 3 s.f.), tests/REFERENCES.md); E192 i = 185 is 9.20
    expect(seriesOf(10.2e3)).toBe("E96");
    expect(seriesOf(920)).toBe("E192");
    expect(seriesOf(21.31e3)).toBeNull();
    expect(seriesOf(1e-7)).toBe("E6");
  });
});

describe("billOfMaterials", () => {
  it("lists the battery cut-off's divider, reference divider, feedback and pull-up with RKM codes", () => {
    const s = parseScenario({
      schema: "railwise.scenario/1",
      supply: { positive: 5, negative: 0 },
      opamp,
      stage: { kind: "schmitt-inverting", rFeedback: 680e3, referenceDivider: { rTop: 33e3, rBottom: 33e3 } },
      source: { quantity: "battery", sensor: { kind: "divider", rTop: 68e3, rBottom: 18e3 } },
      filter: { r: 10e3, c: 100e-9 },
      output: { kind: "open-drain", pullUp: 10e3 },
      input: { components: [{ kind: "dc", level: 12 }] },
      run: { duration: 1, points: 11 },
      tolerances: { resistor: 0.01 },
    });
    const bom = billOfMaterials(s);
    const rows = bom.lines.map((l) => [l.ref, l.field, l.code, l.series]);
    // RKM codes per IEC 60062: 68K, 18K, 10K, 680K, 33K (tests/REFERENCES.md); 100 nF in engineering notation
    expect(rows).toEqual([
      ["R1", "source.sensor.rTop", "68K", "E6"],
      ["R2", "source.sensor.rBottom", "18K", "E12"],
      ["R3", "filter.r", "10K", "E6"],
      ["C1", "filter.c", "100 nF", "E6"],
      ["R4", "stage.rFeedback", "680K", "E6"],
      ["R5", "stage.referenceDivider.rTop", "33K", "E6"],
      ["R6", "stage.referenceDivider.rBottom", "33K", "E6"],
      ["R7", "output.pullUp", "10K", "E6"],
    ]);
    // The Thevenin stand-in (rReference 16.5 kΩ filled by the parse) is not a part to buy.
    expect(bom.lines.some((l) => l.field === "stage.rReference")).toBe(false);
    expect(bom.lines.find((l) => l.ref === "R1")!.tolerance).toBe(0.01);
    // Capacitor tolerance default 0.05 (lib/schemas/README.md § The circuit as built, tolerances)
    expect(bom.lines.find((l) => l.ref === "C1")!.tolerance).toBe(0.05);
    expect(bom.warnings).toEqual([]);
    expect(bomToCsv(bom).split("\n")[1]).toMatch(/^R1,resistor,source,source\.sensor\.rTop,/);
  });

  it("flags a non-standard value and lists an NTC with its fixed resistor", () => {
    const s = parseScenario({
      schema: "railwise.scenario/1",
      supply: { positive: 5, negative: 0 },
      opamp,
      stage: { kind: "schmitt-inverting", rReference: 21.31e3, rFeedback: 200e3, reference: 2.4 },
      source: { sensor: { kind: "ntc", model: { beta: 3977, r25: 10e3 }, rFixed: 15e3, position: "bottom" } },
      input: { components: [{ kind: "dc", level: 18 }] },
      run: { duration: 1, points: 11 },
    });
    const bom = billOfMaterials(s);
    expect(bom.lines.map((l) => l.ref)).toEqual(["TH1", "R1", "R2", "R3"]);
    const odd = bom.lines.find((l) => l.field === "stage.rReference")!;
    expect(odd.series).toBeNull();
    expect(odd.code).toBe("21K31");
    expect(bom.warnings).toHaveLength(1);
    expect(bom.warnings[0]).toMatch(/stage\.rReference.*not a standard value/);
  });
});
