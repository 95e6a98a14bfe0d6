// Readings in the sensor's units, the From spec seed from a stored spec, and the samples CSV's
// extra columns (lib/workbench/source-readings.ts, spec-seed.ts; components/plots/export.ts).
import { describe, expect, it } from "vitest";
import Papa from "papaparse";
import { scenarioSchema, type Scenario } from "@/lib/schemas/scenario";
import { DEMO_SCENARIOS } from "@/lib/demo/scenarios";
import { simulate } from "@/lib/sim";
import { buildChecks } from "@/lib/workbench/readings-logic";
import {
  extraSampleColumns,
  formatSource,
  sourceRows,
  sourceSentence,
  sourceTerms,
} from "@/lib/workbench/source-readings";
import { specSeed } from "@/lib/workbench/spec-seed";
import { samplesCsv } from "@/components/plots/export";

const demo = (key: string): Scenario => scenarioSchema.parse(DEMO_SCENARIOS.find((d) => d.key === key)!.scenario);

// Unloaded voltage divider: Vout = Vin · Rb / (Rt + Rb), so Vin = Vout · (Rt + Rb) / Rb
// (any circuits handbook, e.g. Horowitz & Hill, The Art of Electronics, §1.2.3).
const batteryOf = (pin: number) => (pin * (68e3 + 18e3)) / 18e3;

describe("readings in the sensor's units", () => {
  const battery = demo("battery-cutoff");

  it("maps pin volts through the battery divider", () => {
    const t = sourceTerms(battery)!;
    expect(t.unit).toBe("V");
    expect(t.quantity).toBe("battery");
    expect(t.inverted).toBe(false);
    expect(t.toSource(2.5)!).toBeCloseTo(batteryOf(2.5), 9);
    expect(sourceTerms(demo("hydrophone-preamp"))).toBeNull();
  });

  it("formats source values before pin volts", () => {
    expect(formatSource(11.4, { unit: "V", quantity: "battery" })).toBe("11.40 V battery");
    expect(formatSource(1.09, { unit: "V", quantity: "battery" }, true)).toBe("1.090 V");
    const rows = sourceRows(
      { unit: "V", upperThreshold: 12.49, lowerThreshold: 11.4, hysteresis: 1.09 },
      { upperThreshold: 2.615, lowerThreshold: 2.385, hysteresis: 0.23 },
      { quantity: "battery", inverted: false },
    );
    expect(rows.map((r) => [r.label, r.value, r.pin])).toEqual([
      ["Upper switching point", "12.49 V", "2.615 V at the pin"],
      ["Lower switching point", "11.40 V", "2.385 V at the pin"],
      ["Deadband", "1.090 V", "0.2300 V at the pin"],
    ]);
    // An inverted sensor: the source's upper point is the pin's lower threshold.
    const inv = sourceSentence(
      { unit: "°C", upperThreshold: 19, lowerThreshold: 17.5, hysteresis: 1.5 },
      { upperThreshold: 2.4, lowerThreshold: 2.3 },
      { quantity: "water temperature", inverted: true },
    );
    expect(inv).toBe(
      "Switches at 19.00 °C water temperature rising and 17.50 °C water temperature falling (deadband 1.500 °C); at the pin 2.300 V and 2.400 V.",
    );
  });

  it("gives the battery run's checks in battery volts, pass/fail on pin volts", () => {
    const r = simulate(battery);
    expect(r.metrics.source?.unit).toBe("V");
    const checks = buildChecks(battery, r.metrics, null);
    const upper = checks.find((c) => c.label === "Upper switching point")!;
    const lower = checks.find((c) => c.label === "Lower switching point")!;
    const band = checks.find((c) => c.label === "Deadband")!;
    expect(upper.source!.designed!).toBeCloseTo(batteryOf(upper.designed), 9);
    expect(upper.source!.measured!).toBeCloseTo(batteryOf(upper.measured!), 9);
    expect(lower.source!.designed!).toBeCloseTo(batteryOf(lower.designed), 9);
    expect(band.source!.difference).toBe(true);
    expect(band.source!.designed!).toBeCloseTo(batteryOf(upper.designed) - batteryOf(lower.designed), 9);
    // The designed pin thresholds of this stage (circuit notes: 2.6148 / 2.3852 V), i.e. about
    // 12.49 V / 11.40 V of battery: "cuts at 11.40 V, reconnects at 12.49 V".
    expect(upper.source!.designed!).toBeCloseTo(12.49, 1);
    expect(lower.source!.designed!).toBeCloseTo(11.4, 1);
    expect(upper.pass).toBe(true);
    expect(lower.pass).toBe(true);
  });

  it("orders the water alarm's checks in °C (NTC at the bottom inverts)", () => {
    const water = demo("water-temperature-alarm");
    const t = sourceTerms(water)!;
    expect(t.unit).toBe("°C");
    expect(t.inverted).toBe(true);
    const r = simulate(water);
    const checks = buildChecks(water, r.metrics, null);
    const upper = checks.find((c) => c.label === "Upper switching point")!;
    const lower = checks.find((c) => c.label === "Lower switching point")!;
    expect(upper.source!.designed!).toBeGreaterThan(lower.source!.designed!);
    // Its spec asks for 19 °C / 17.5 °C (demo data); E24 parts land near, not exactly.
    expect(upper.source!.designed!).toBeCloseTo(19, 0);
    expect(lower.source!.designed!).toBeCloseTo(17.5, 0);
    // Upper in °C is the pin's LOWER threshold.
    expect(upper.designed).toBeLessThan(lower.designed);
  });

  it("adds source, filter-node and capacitor columns to the samples CSV", () => {
    const battery = demo("battery-cutoff");
    const cols = extraSampleColumns(battery, { source: [13, 12], filtered: [2.6, 2.5] });
    expect(cols.map((c) => c.name)).toEqual(["battery_V", "filter_node_V"]);
    const csv = samplesCsv([0, 0.5], [2.7, 2.6], [0, 5], cols);
    const parsed = Papa.parse<string[]>(csv.trim()).data;
    expect(parsed[0]).toEqual(["time_s", "input_V", "output_V", "battery_V", "filter_node_V"]);
    expect(parsed[2]).toEqual(["0.5", "2.6", "5", "12", "2.5"]);
    expect(extraSampleColumns(demo("water-temperature-alarm"), { source: [20] })[0].name).toBe(
      "water_temperature_degC",
    );
  });
});

describe("From spec reopens with the stored spec", () => {
  it("seeds the water alarm's 19 °C / 17.5 °C and its NTC", () => {
    const seed = specSeed(demo("water-temperature-alarm"));
    expect(seed.from).toContain("19 °C");
    expect(seed.form.upper).toBe(19);
    expect(seed.form.lower).toBe(17.5);
    expect(seed.form.referenceAuto).toBe(true);
    expect(seed.form.tolerancePct).toBeCloseTo(1, 12);
    expect(seed.sensor).toEqual({ kind: "ntc", r25: 10e3, beta: 3977, rFixed: 15e3, position: "bottom", vSupply: 5 });
  });

  it("seeds the battery's 12.5 V / 11.4 V through its divider", () => {
    const seed = specSeed(demo("battery-cutoff"));
    expect(seed.form.upper).toBe(12.5);
    expect(seed.form.lower).toBe(11.4);
    expect(seed.form.reference).toBe(2.5);
    expect(seed.sensor).toEqual({ kind: "divider", rTop: 68e3, rBottom: 18e3 });
  });

  it("falls back to the defaults without a spec", () => {
    const s = demo("hydrophone-preamp");
    const seed = specSeed(s);
    expect(seed.from).toBeNull();
    expect(seed.sensor).toEqual({ kind: "volts" });
    expect(seed.form.kind).toBe(s.stage.kind);
  });
});
