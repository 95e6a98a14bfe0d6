// The demo board uses the circuit as built: the battery cut-off reads in battery volts through its
// 68 k / 18 k divider, the water alarm in °C through its NTC divider (DEVELOPERS.md § Demo data).
import { describe, expect, it } from "vitest";
import { DEMO_SCENARIOS } from "@/lib/demo/scenarios";
import { parseScenario } from "@/lib/schemas/scenario";
import { simulate } from "@/lib/sim";
import { billOfMaterials } from "@/lib/design/bom";
import { circuitWorstCase } from "@/lib/design/spread";

const demo = (key: string) => parseScenario(DEMO_SCENARIOS.find((s) => s.key === key)!.scenario);

describe("battery cut-off", () => {
  const s = demo("battery-cutoff");

  it("switches at 12.49 V / 11.40 V of battery (inverting Schmitt closed form through the divider)", () => {
    const r = simulate(s);
    // upper = (Vref·rFb + Voh·rRef)/(rRef + rFb) with Voh 4.98 V, Vol 0.02 V (tests/REFERENCES.md);
    // battery = pin / (18/86) (voltage divider rule). Noise (4 mV rms) and offset allowed: 30 mV.
    const upper = (2.5 * 680e3 + 4.98 * 33e3) / 713e3 / (18 / 86);
    const lower = (2.5 * 680e3 + 0.02 * 33e3) / 713e3 / (18 / 86);
    expect(r.metrics.source!.unit).toBe("V");
    expect(Math.abs(r.metrics.source!.upperThreshold! - upper)).toBeLessThan(0.03);
    expect(Math.abs(r.metrics.source!.lowerThreshold! - lower)).toBeLessThan(0.03);
    expect(r.source![0]).toBeCloseTo(13, 9);
  });

  it("lists every resistor on the board and keeps its spec", () => {
    const bom = billOfMaterials(s);
    expect(bom.lines.map((l) => l.code)).toEqual(["68K", "18K", "33K", "680K"]);
    expect(s.spec?.target).toEqual({ upperThreshold: 12.5, lowerThreshold: 11.4 });
  });
});

describe("water-temperature alarm", () => {
  const s = demo("water-temperature-alarm");

  it("alarms near 19 °C and clears near 17.5 °C (Beta inverse of the Schmitt closed form)", () => {
    const r = simulate(s);
    const vref = (5 * 6.8e3) / 14.3e3;
    const rRef = (7.5e3 * 6.8e3) / 14.3e3;
    const vLow = (vref * 200e3 + 0.02 * rRef) / (rRef + 200e3);
    const vUp = (vref * 200e3 + 4.98 * rRef) / (rRef + 200e3);
    // Beta model inverse (tests/REFERENCES.md): R = 15k·V/(5 − V); T = 1/(1/T25 + ln(R/R25)/B)
    const c = (v: number) => 1 / (1 / 298.15 + Math.log((15e3 * v) / (5 - v) / 10e3) / 3977) - 273.15;
    expect(r.metrics.source!.unit).toBe("°C");
    // 3 mV rms pick-up over an 87 mV deadband: allow 0.1 °C
    expect(Math.abs(r.metrics.source!.upperThreshold! - c(vLow))).toBeLessThan(0.1);
    expect(Math.abs(r.metrics.source!.lowerThreshold! - c(vUp))).toBeLessThan(0.1);
    expect(r.metrics.source!.upperThreshold!).toBeGreaterThan(r.metrics.source!.lowerThreshold!);
  });

  it("lists the NTC, its fixed resistor and the reference divider, and spreads over R25 and Beta", () => {
    expect(billOfMaterials(s).lines.map((l) => `${l.ref} ${l.code}`)).toEqual([
      "TH1 10K",
      "R1 15K",
      "R2 200K",
      "R3 7K5",
      "R4 6K8",
    ]);
    const wc = circuitWorstCase(s);
    expect(wc.varied.map((v) => v.name)).toEqual(
      expect.arrayContaining(["source.sensor.model.r25", "source.sensor.model.beta", "stage.referenceDivider.rTop"]),
    );
    expect(wc.sourceUpperThreshold![0]).toBeLessThan(19);
    expect(wc.sourceUpperThreshold![1]).toBeGreaterThan(19);
  });
});

describe("bilge float bounce filter", () => {
  const s = demo("bilge-float");

  it("filters the raw float capture with its RC filter: one edge per float movement, no chatter", () => {
    expect(s.filter).toEqual({ r: 4.7e3, c: 2.2e-6 });
    const r = simulate(s);
    expect(r.filtered!.length).toBe(r.t.length);
    // The capture holds the float's toggles; bounces 3–8 ms apart are shorter than the filter's
    // τ = 2.2 µF·(4.7 k ∥ 57 k) = 9.6 ms [derived, Thevenin + RC time constant], so each lift,
    // slosh and drop gives one clean edge.
    expect(r.metrics.chatter).toBe(0);
    expect(r.events.length).toBe(6);
    // The raw 80 mV rms pickup is smoothed on the filter node: its sample-to-sample steps are far
    // smaller than the capture's (first-order low-pass, common practice).
    let rawStep = 0;
    let filteredStep = 0;
    for (let i = 1; i < 1000; i++) {
      rawStep = Math.max(rawStep, Math.abs(r.input[i] - r.input[i - 1]));
      filteredStep = Math.max(filteredStep, Math.abs(r.filtered![i] - r.filtered![i - 1]));
    }
    expect(filteredStep).toBeLessThan(rawStep / 5);
  });
});

describe("enclosure humidity flag (open-drain comparator)", () => {
  it("flags at 2.6 V (75 %RH), high level set by the 10 k pull-up to 3.3 V and the 100 k load", () => {
    const s = demo("humidity-flag");
    expect(s.output).toEqual({ kind: "open-drain", pullUp: 10e3, pullUpTo: 3.3, load: { r: 100e3, to: 0 } });
    const r = simulate(s);
    // 3.3 V · 100 k/(10 k + 100 k) = 3.0 V [derived, Ohm's law / voltage divider rule]
    expect(r.rails.high).toBeCloseTo(3.0, 9);
    expect(r.rails.low).toBeCloseTo(0.1, 12);
    expect(r.events.map((e) => e.edge)).toEqual(["rising", "falling"]);
    // Comparator switches at the reference less the part's 2 mV offset (common practice, no source)
    expect(Math.abs(r.metrics.upperThreshold! - 2.598)).toBeLessThan(1e-3);
    expect(Math.max(...r.output)).toBeCloseTo(3.0, 9);
  });
});
