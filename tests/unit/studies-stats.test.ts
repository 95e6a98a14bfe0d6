// Statistics under the studies: Wilson interval, seeds, histograms, deviation draws.
import { describe, expect, it } from "vitest";
import { errorFunction } from "simple-statistics";
import { createStream, deviationSigma, drawDeviation, taskSeed } from "@/lib/studies/random";
import { histogram, wilsonInterval, Z95 } from "@/lib/studies/stats";

describe("Wilson score interval", () => {
  // Newcombe R.G. (1998), "Two-sided confidence intervals for the single proportion: comparison
  // of seven methods", Statistics in Medicine 17:857–872, Table II, method 3 (score interval
  // without continuity correction) — values from memory, four decimals as printed there.
  const worked: Array<[number, number, number, number]> = [
    [81, 263, 0.2553, 0.3662],
    [15, 148, 0.0624, 0.1605],
    [0, 20, 0, 0.1611],
    [1, 29, 0.0061, 0.1718],
  ];
  it.each(worked)("%i/%i → [%f, %f] (Newcombe 1998, from memory)", (k, n, lo, hi) => {
    const ci = wilsonInterval(k, n);
    expect(ci.low).toBeCloseTo(lo, 4);
    expect(ci.high).toBeCloseTo(hi, 4);
  });

  it("is the set of p the score test does not reject (Wilson 1927 definition) [derived]", () => {
    // Our z is Φ⁻¹(0.975): check it with simple-statistics' error function, Φ(x) = ½(1 + erf(x/√2)).
    expect(0.5 * (1 + errorFunction(Z95 / Math.SQRT2))).toBeCloseTo(0.975, 6);
    for (const [k, n] of [
      [3, 50],
      [25, 50],
      [49, 50],
      [7, 1000],
    ]) {
      const ci = wilsonInterval(k, n);
      const phat = k / n;
      const score = (p: number) => Math.abs(phat - p) / Math.sqrt((p * (1 - p)) / n);
      // At both ends the score statistic equals z (interior ends only).
      if (ci.low > 0) expect(score(ci.low)).toBeCloseTo(Z95, 6);
      if (ci.high < 1) expect(score(ci.high)).toBeCloseTo(Z95, 6);
      expect(score((ci.low + ci.high) / 2)).toBeLessThan(Z95);
    }
  });
});

describe("task seeds and deviation draws", () => {
  it("gives every (study seed, task) its own seed, the same every time", () => {
    const seen = new Set<number>();
    for (const s of [0, 1, 2, 42]) for (let i = 0; i < 5000; i++) seen.add(taskSeed(s, i));
    expect(seen.size).toBe(20000); // no collision among 20,000 nearby pairs
    expect(taskSeed(42, 7)).toBe(taskSeed(42, 7));
  });

  it("starts every stream afresh: the first draws of 1,000 small seeds are uniform, not all near 1", () => {
    // pure-rand's own xoroshiro128plus(seed) gives a first uniform ≈ 1.0 for small seeds; the
    // hashed seeding (lib/sim/seeded.ts) must not. Mean of n uniforms: 0.5 ± 1/√(12n) (σ ≈ 0.009
    // for n = 1000), so ± 0.05 is over 5σ (common practice, no source).
    const first = Array.from({ length: 1000 }, (_, seed) => createStream(seed).uniform());
    const mean = first.reduce((a, b) => a + b, 0) / first.length;
    expect(Math.abs(mean - 0.5)).toBeLessThan(0.05);
    expect(first.filter((u) => u > 0.99).length).toBeLessThan(50); // ~10 expected
  });

  it("draws uniform and truncated-normal deviations with the stated spread (common practice: tolerance = 3σ)", () => {
    for (const spread of ["uniform", "normal"] as const) {
      const s = createStream(123);
      const xs = Array.from({ length: 200_000 }, () => drawDeviation(s, spread));
      const mean = xs.reduce((a, b) => a + b, 0) / xs.length;
      const sd = Math.sqrt(xs.reduce((a, b) => a + (b - mean) ** 2, 0) / (xs.length - 1));
      expect(xs.every((x) => x >= -1 && x <= 1)).toBe(true);
      expect(Math.abs(mean)).toBeLessThan(0.005);
      // Uniform on ±1: σ = 1/√3 [derived]; normal σ = 1/3 truncated at ±3σ [derived].
      expect(sd).toBeCloseTo(deviationSigma(spread), 2);
    }
  });
});

describe("histogram", () => {
  it("counts every value once, clamping the ends", () => {
    const h = histogram([0, 0.1, 0.5, 0.99, 1, 5, -3], 0, 1, 4);
    expect(h.edges).toEqual([0, 0.25, 0.5, 0.75, 1]);
    expect(h.counts).toEqual([3, 0, 1, 3]);
  });
});
