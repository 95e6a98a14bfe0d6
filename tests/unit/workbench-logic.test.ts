// Pure workbench logic in lib/workbench: the readings of an amplifier, the "no extra
// transitions" check of a switching stage, CSV sample times and the order of invalid fields.
import { describe, expect, it } from "vitest";
import {
  amplifierReadings,
  buildChecks,
  capacitorOf,
  isAmplifierKind,
  type MetricsIn,
} from "@/lib/workbench/readings-logic";
import { formatTime, smallestStep, timeDecimals } from "@/lib/workbench/sample-times";
import { describeFieldProblems, listFieldProblems } from "@/lib/workbench/field-problems";
import { scenario } from "./sim-fixtures";

const baseMetrics: MetricsIn = {
  transitions: 4,
  upperThreshold: 1,
  lowerThreshold: -1,
  hysteresis: 2,
  chatter: 0,
  clippedFraction: 0.9,
  maxSlewRate: 1e6,
  period: null,
  dutyCycle: null,
};

describe("amplifier readings", () => {
  it("knows which kinds are amplifiers", () => {
    expect(isAmplifierKind("inverting-amplifier")).toBe(true);
    expect(isAmplifierKind("noninverting-amplifier")).toBe(true);
    expect(isAmplifierKind("schmitt-inverting")).toBe(false);
    expect(isAmplifierKind("relaxation-oscillator")).toBe(false);
    expect(isAmplifierKind("comparator")).toBe(false);
  });

  it("uses the core's metrics.amplifier when present", () => {
    const amp = { gain: -9.99, clipInputHigh: -1.2, clipInputLow: 1.2 };
    expect(amplifierReadings({ ...baseMetrics, amplifier: amp }, null, null, { high: 12, low: -12 })).toBe(amp);
  });

  it("finds gain and the input levels where clipping starts from the samples", () => {
    // Ideal inverting amplifier: vo = −(Rf/Rin)·vin = −10·vin, clamped at the output limits
    // ±11.95 V (textbook inverting-gain formula, e.g. Sedra & Smith); the output reaches Voh at
    // vin = −11.95/10 = −1.195 V and Vol at +1.195 V.
    const n = 4001;
    const input = new Float64Array(n);
    const output = new Float64Array(n);
    for (let i = 0; i < n; i++) {
      input[i] = -2 + (4 * i) / (n - 1); // ramp −2 → +2 V
      output[i] = Math.max(-11.95, Math.min(11.95, -10 * input[i]));
    }
    // The ramp starts with the output already at Voh, so "first reaches" is the first sample.
    const r = amplifierReadings({ ...baseMetrics, amplifier: undefined }, input, output, { high: 11.95, low: -11.95 });
    expect(r.gain).toBeCloseTo(-10, 9);
    expect(r.clipInputHigh).toBeCloseTo(-2, 9);
    // "Reaches" allows 0.1 % of the 23.9 V swing (23.9 mV), i.e. 2.4 mV of input at gain 10.
    expect(r.clipInputLow!).toBeGreaterThan(1.195 - 0.0025);
    expect(r.clipInputLow!).toBeLessThanOrEqual(1.195 + 0.001);
  });

  it("reads the oscillator's capacitor from either result shape", () => {
    const c = new Float64Array([0, 1, 2]);
    expect(capacitorOf({ capacitor: c })).toBe(c);
    expect(Array.from(capacitorOf({ samples: { capacitor: [0, 1] } })!)).toEqual([0, 1]);
    expect(capacitorOf({ t: [] })).toBeNull();
  });
});

describe("no extra transitions", () => {
  const schmitt = scenario({ stage: { kind: "schmitt-noninverting", rInput: 10e3, rFeedback: 100e3, reference: 0 } });

  it("fails a switching stage that chatters and passes one that does not", () => {
    // lib/schemas/README.md: chatter counts edges within the hold-off of the previous one; a switching
    // stage should add none (common practice, no source).
    const failing = buildChecks(schmitt, { ...baseMetrics, chatter: 11 }, null).find(
      (c) => c.label === "No extra transitions",
    );
    expect(failing).toBeDefined();
    expect(failing!.pass).toBe(false);
    expect(failing!.measured).toBe(11);
    const passing = buildChecks(schmitt, baseMetrics, null).find((c) => c.label === "No extra transitions");
    expect(passing!.pass).toBe(true);
  });

  it("accepts chatter up to the limit the user sets", () => {
    const c = buildChecks(schmitt, { ...baseMetrics, chatter: 2 }, null, { chatterLimit: 2 }).find(
      (x) => x.label === "No extra transitions",
    );
    expect(c!.designed).toBe(2);
    expect(c!.pass).toBe(true);
  });

  it("is not a check of an amplifier", () => {
    const amp = scenario({ stage: { kind: "inverting-amplifier", rInput: 1e3, rFeedback: 10e3, reference: 0 } });
    const checks = buildChecks(amp, { ...baseMetrics, chatter: null, transitions: null }, -10);
    expect(checks.map((c) => c.label)).not.toContain("No extra transitions");
  });
});

describe("CSV sample times", () => {
  it("prints times to the precision of the grid", () => {
    // 5,000 points over 1 s: steps of 1/4999 s ≈ 200.04 µs.
    const n = 5000;
    const t = Float64Array.from({ length: n }, (_, i) => (i * 1) / (n - 1));
    const d = timeDecimals(smallestStep(t));
    expect(d).toBe(8);
    expect(formatTime(t[1], d)).toBe("0.00020004");
    expect(formatTime(t[n - 1], d)).toBe("1");
    expect(formatTime(0.5, 3)).toBe("0.5");
    expect(timeDecimals(10)).toBe(3);
  });
});

describe("fields at fault", () => {
  it("lists fields in page order, missing elements last", () => {
    // Stand-ins for DOM nodes: position i precedes j when i < j (Node.DOCUMENT_POSITION_FOLLOWING = 4).
    const el = (pos: number) => ({ pos, compareDocumentPosition: (o: { pos: number }) => (o.pos > pos ? 4 : 2) });
    const els: Record<string, ReturnType<typeof el>> = { a: el(3), b: el(1), c: el(2) };
    const problems = [
      { label: "V+", message: "not a value", inputId: "a" },
      { label: "R ground", message: "must be above 0", inputId: "b" },
      { label: "GBW", message: "required", inputId: "c" },
      { label: "Gone", message: "required", inputId: "z" },
    ];
    const ordered = listFieldProblems(problems, (id) => (els[id] as never) ?? null);
    expect(ordered.map((p) => p.label)).toEqual(["R ground", "GBW", "V+", "Gone"]);
    expect(describeFieldProblems(ordered.slice(0, 2))).toBe("R ground: must be above 0; GBW: required");
  });
});

describe("study messages in the form's words", () => {
  it("replaces config keys with the labels on the screen", async () => {
    const { studyIssueText } = await import("@/lib/workbench/study-suggest");
    expect(studyIssueText([{ message: "seedsPerLevel must be at most 10000" }])).toBe(
      "“seeds per level” must be at most 10000",
    );
    expect(studyIssueText([{ message: "rmsTo must be above rmsFrom" }])).toBe("“rms to” must be above “rms from”");
  });
});

describe("design warnings in the panel's words", () => {
  it("names the figure by its label and says where the window came from", async () => {
    const { designWarningText } = await import("@/lib/workbench/design-words");
    const t = designWarningText(
      "lowerThreshold: the worst case [1.957, 2.04] leaves the ±2.0 % window [1.96, 2.04]; tighter tolerance would help",
    );
    expect(t).toMatch(/^Lower switching point: /);
    expect(t).toMatch(/±2\.0 % window \(the default allowed error of a design\)/);
    expect(
      designWarningText("gain: the best E24 combination is 3.10 % off the target (maxError 2.00 %); a finer series"),
    ).toMatch(/^Gain: .*\(the default allowed error is 2\.00 %\)/);
  });
});
