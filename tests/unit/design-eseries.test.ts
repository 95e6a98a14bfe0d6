import { describe, expect, it } from "vitest";
import { SERIES_TOLERANCE, seriesInRange, seriesValues, snapToSeries } from "@/lib/design/eseries";

// Source for the literal tables: IEC 60063:2015 as quoted in tests/REFERENCES.md [published].
const E6 = [1.0, 1.5, 2.2, 3.3, 4.7, 6.8];
const E12 = [1.0, 1.2, 1.5, 1.8, 2.2, 2.7, 3.3, 3.9, 4.7, 5.6, 6.8, 8.2];
const E24 = [
  1.0, 1.1, 1.2, 1.3, 1.5, 1.6, 1.8, 2.0, 2.2, 2.4, 2.7, 3.0, 3.3, 3.6, 3.9, 4.3, 4.7, 5.1, 5.6, 6.2, 6.8, 7.5, 8.2,
  9.1,
];
// E96 as printed in the IEC 60063 table (from memory, three significant figures ×100).
const E96_TABLE = [
  100, 102, 105, 107, 110, 113, 115, 118, 121, 124, 127, 130, 133, 137, 140, 143, 147, 150, 154, 158, 162, 165, 169,
  174, 178, 182, 187, 191, 196, 200, 205, 210, 215, 221, 226, 232, 237, 243, 249, 255, 261, 267, 274, 280, 287, 294,
  301, 309, 316, 324, 332, 340, 348, 357, 365, 374, 383, 392, 402, 412, 422, 432, 442, 453, 464, 475, 487, 499, 511,
  523, 536, 549, 562, 576, 590, 604, 619, 634, 649, 665, 681, 698, 715, 732, 750, 768, 787, 806, 825, 845, 866, 887,
  909, 931, 953, 976,
];

// Independent closed form for E48–E192: round 10^(i/N) to 3 significant figures [derived, tests/REFERENCES.md].
const plainRounding = (n: number) => Array.from({ length: n }, (_, i) => Math.round(100 * 10 ** (i / n)) / 100);

describe("IEC 60063 series values", () => {
  it("E6, E12, E24 equal the published tables", () => {
    // IEC 60063:2015 [published]
    expect(seriesValues("E6")).toEqual(E6);
    expect(seriesValues("E12")).toEqual(E12);
    expect(seriesValues("E24")).toEqual(E24);
  });

  it("E24 departs from plain rounding exactly at the eight published exceptions", () => {
    // IEC 60063 / tests/REFERENCES.md: rounding 10^(i/24) gives 2.6 2.9 3.2 3.5 3.8 4.2 4.6 8.3 where the
    // standard prints 2.7 3.0 3.3 3.6 3.9 4.3 4.7 8.2.
    const rounded = Array.from({ length: 24 }, (_, i) => Math.round(10 * 10 ** (i / 24)) / 10);
    const diffs = E24.map((v, i) => [v, rounded[i]] as const).filter(([a, b]) => a !== b);
    expect(diffs).toEqual([
      [2.7, 2.6],
      [3.0, 2.9],
      [3.3, 3.2],
      [3.6, 3.5],
      [3.9, 3.8],
      [4.3, 4.2],
      [4.7, 4.6],
      [8.2, 8.3],
    ]);
    expect(seriesValues("E24")).toEqual(E24);
  });

  it("E48, E96, E192 are the rounded geometric series with E192 i = 185 printed as 9.20", () => {
    // tests/REFERENCES.md [derived, matches the published tables]
    const e192 = plainRounding(192);
    expect(e192[185]).toBe(9.19);
    e192[185] = 9.2;
    expect(seriesValues("E192")).toEqual(e192);
    expect(seriesValues("E192")[185]).toBe(9.2);
    expect(seriesValues("E96")).toEqual(plainRounding(96));
    expect(seriesValues("E48")).toEqual(plainRounding(48));
    // Literal E96 table (from memory of IEC 60063's printed table).
    expect(seriesValues("E96").map((v) => Math.round(v * 100))).toEqual(E96_TABLE);
    expect(seriesValues("E48").length).toBe(48);
    expect(seriesValues("E192").length).toBe(192);
  });

  it("lists the usual tolerances (IEC 60063 usage, tests/REFERENCES.md)", () => {
    expect(SERIES_TOLERANCE).toEqual({ E6: 0.2, E12: 0.1, E24: 0.05, E48: 0.02, E96: 0.01, E192: 0.005 });
  });
});

describe("snapping by ratio", () => {
  it("1.097 snaps to 1.2 in E12 (nearer 1.0 by difference, nearer 1.2 by ratio)", () => {
    // tests/REFERENCES.md [derived]: ln 1.097 = 0.0926 > ln(1.2/1.097) = 0.0897
    expect(Math.log(1.097)).toBeCloseTo(0.0926, 4);
    expect(Math.log(1.2 / 1.097)).toBeCloseTo(0.0897, 4);
    expect(snapToSeries(1.097, "E12")).toBe(1.2);
    expect(snapToSeries(1097, "E12")).toBe(1200);
    expect(snapToSeries(0.001097, "E12")).toBeCloseTo(0.0012, 12);
  });

  it("up and down modes pick the neighbouring values; series values map to themselves", () => {
    // common practice, no source
    expect(snapToSeries(4700, "E24", "up")).toBe(4700);
    expect(snapToSeries(4700, "E24", "down")).toBe(4700);
    expect(snapToSeries(4701, "E24", "up")).toBe(5100);
    expect(snapToSeries(4699, "E24", "down")).toBe(4300);
    expect(snapToSeries(9.6, "E12")).toBe(10);
    expect(snapToSeries(0.95, "E24", "down")).toBe(0.91);
    expect(snapToSeries(9.7e3, "E96", "up")).toBe(9760);
  });

  it("nearest by ratio in every series: no other value is closer in log distance", () => {
    for (const name of ["E6", "E12", "E24", "E48", "E96", "E192"] as const) {
      const all = seriesInRange(name, 1, 1e4);
      for (let x = 1.01; x < 9.99e3; x *= 1.0371) {
        const s = snapToSeries(x, name);
        const best = Math.min(...all.map((v) => Math.abs(Math.log(v / x))));
        expect(Math.abs(Math.log(s / x))).toBeCloseTo(best, 12);
      }
    }
  });

  it("seriesInRange spans decades inclusively", () => {
    expect(seriesInRange("E6", 1e3, 1e4)).toEqual([1000, 1500, 2200, 3300, 4700, 6800, 10000]);
    expect(seriesInRange("E24", 1e3, 1e6).length).toBe(3 * 24 + 1);
  });

  it("rejects non-positive values and unknown series", () => {
    expect(() => snapToSeries(0, "E24")).toThrow(/positive/);
    // @ts-expect-error unknown series on purpose
    expect(() => seriesValues("E7")).toThrow(/unknown series/);
  });
});
