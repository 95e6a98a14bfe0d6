import { describe, expect, it } from "vitest";
import { formatQuantity, formatRkm, formatTicks, parseQuantity, quantityProblem } from "@/lib/design/notation";

describe("RKM codes (IEC 60062)", () => {
  it("parses the published examples", () => {
    // IEC 60062 via tests/REFERENCES.md [published]: 4K7 = 4.7 kΩ, 2R2 = 2.2 Ω, 1M0 = 1 MΩ, 470R = 470 Ω
    expect(parseQuantity("4K7")).toBe(4700);
    expect(parseQuantity("2R2")).toBe(2.2);
    expect(parseQuantity("1M0")).toBe(1e6);
    expect(parseQuantity("470R")).toBe(470);
    // IEC 60062 capacitor letters (from memory): 4n7 = 4.7 nF, R47 = 0.47 Ω
    expect(parseQuantity("4n7")).toBeCloseTo(4.7e-9, 20);
    expect(parseQuantity("R47")).toBe(0.47);
    expect(parseQuantity("4K7 Ω")).toBe(4700);
  });

  it("formats resistances as RKM and parses them back", () => {
    // IEC 60062 examples [published]
    expect(formatRkm(4700)).toBe("4K7");
    expect(formatRkm(2.2)).toBe("2R2");
    expect(formatRkm(1e6)).toBe("1M0");
    expect(formatRkm(470)).toBe("470R");
    // common practice, no source
    expect(formatRkm(10_000)).toBe("10K");
    expect(formatRkm(0.47)).toBe("R47");
    expect(formatRkm(10_200)).toBe("10K2");
    for (const r of [1, 1.5, 10, 47.5, 100, 953, 1000, 1020, 9090, 33_000, 249_000, 1_500_000]) {
      expect(parseQuantity(formatRkm(r))).toBe(r);
    }
    expect(() => formatRkm(0)).toThrow();
  });
});

describe("engineering notation", () => {
  it("parses prefixes and unit suffixes", () => {
    // SI prefixes (BIPM SI Brochure, 9th ed., table 7) [published]
    expect(parseQuantity("4.7k")).toBe(4700);
    expect(parseQuantity("100n")).toBeCloseTo(1e-7, 20);
    expect(parseQuantity("2.2M")).toBe(2.2e6);
    expect(parseQuantity("10u")).toBeCloseTo(1e-5, 20);
    expect(parseQuantity("10µ")).toBeCloseTo(1e-5, 20);
    expect(parseQuantity("10μ")).toBeCloseTo(1e-5, 20);
    expect(parseQuantity("1m")).toBe(0.001);
    expect(parseQuantity("100 nF")).toBeCloseTo(1e-7, 20);
    expect(parseQuantity("4.7 kΩ")).toBe(4700);
    expect(parseQuantity("10kohm")).toBe(10_000);
    expect(parseQuantity("5V")).toBe(5);
    expect(parseQuantity("1.5 Hz")).toBe(1.5);
    expect(parseQuantity("-2.5")).toBe(-2.5);
    expect(parseQuantity("1e3")).toBe(1000);
    expect(parseQuantity(" 750p ")).toBeCloseTo(7.5e-10, 22);
  });

  it("returns null for text that is not a quantity", () => {
    for (const bad of ["", "abc", "k", "4.7x", "1..2", "R", "--1", "4K7K"]) expect(parseQuantity(bad)).toBeNull();
  });

  it("formats with SI prefixes and significant figures", () => {
    expect(formatQuantity(4700, "Ω")).toBe("4.7 kΩ");
    expect(formatQuantity(1e-7, "F")).toBe("100 nF");
    expect(formatQuantity(2.5, "V")).toBe("2.5 V");
    expect(formatQuantity(-0.0012, "V")).toBe("-1.2 mV");
    expect(formatQuantity(999.96, "Ω")).toBe("1 kΩ");
    expect(formatQuantity(9618.03, "Hz", 4)).toBe("9.618 kHz");
    expect(formatQuantity(0, "V")).toBe("0 V");
    expect(formatQuantity(4700, "")).toBe("4.7k");
    for (const v of [1, 4.7e3, 2.2e6, 1e-7, 3.3e-12]) expect(parseQuantity(formatQuantity(v, "Ω"))).toBeCloseTo(v, 20);
  });
});

describe("only SI prefixes and RKM codes", () => {
  // SI prefix symbols are case-sensitive single letters (BIPM SI Brochure, 9th ed., table 7);
  // "meg" is neither an SI prefix nor an IEC 60062 letter code [published].
  it("refuses meg in any case and says what to write instead", () => {
    for (const text of ["2.2meg", "1MEG", "4.7Meg", "10 meg"]) {
      expect(parseQuantity(text)).toBeNull();
      expect(quantityProblem(text)).toMatch(/write M for mega.*2M2/);
    }
    expect(quantityProblem("2.2M")).toBeNull();
    expect(quantityProblem("2M2")).toBeNull();
    expect(quantityProblem("six")).toBe("not a value");
    expect(quantityProblem("  ")).toBe("required");
  });
});

describe("tick labels", () => {
  // Each label must show its tick's value (common practice, no source): ticks every 0.25 s
  // once read 0.3, 0.8 s and every 2.5 V read 3, 8 V.
  it("shows quarter steps and half-volt steps exactly", () => {
    expect(formatTicks([0, 0.25, 0.5, 0.75, 1], "s")).toEqual(["0.00 s", "0.25 s", "0.50 s", "0.75 s", "1.00 s"]);
    expect(formatTicks([0, 2.5, 5, 7.5, 10], "V")).toEqual(["0.0 V", "2.5 V", "5.0 V", "7.5 V", "10.0 V"]);
    expect(formatTicks([-5, -2.5, 0, 2.5, 5], "V")).toEqual(["-5.0 V", "-2.5 V", "0.0 V", "2.5 V", "5.0 V"]);
  });

  it("uses one engineering prefix per axis and parses back to the tick value", () => {
    expect(formatTicks([0, 0.02, 0.04, 0.06], "s")).toEqual(["0 ms", "20 ms", "40 ms", "60 ms"]);
    expect(formatTicks([0.0005, 0.001, 0.0015], "s")).toEqual(["0.5 ms", "1.0 ms", "1.5 ms"]);
    expect(formatTicks([1e-6, 2e-6, 3e-6], "s")).toEqual(["1 µs", "2 µs", "3 µs"]);
    expect(formatTicks([2000, 4000], "Hz")).toEqual(["2 kHz", "4 kHz"]);
    const ticks = [0.1, 0.125, 0.15, 0.175];
    const labels = formatTicks(ticks, "V");
    labels.forEach((l, i) => expect(parseQuantity(l)).toBeCloseTo(ticks[i], 12));
  });
});
