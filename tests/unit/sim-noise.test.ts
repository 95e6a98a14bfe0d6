import { describe, expect, it } from "vitest";
import { errorFunction, mean, sampleKurtosis, sampleSkewness, standardDeviation } from "simple-statistics";
import { evaluateInput, simulate } from "@/lib/sim";
import { fillStandardNormal, noiseInterval, normalQuantile, portableLn } from "@/lib/sim/noise";
import { scenario } from "./sim-fixtures";

describe("seeded Gaussian noise generator", () => {
  const n = 100_000;
  const z = fillStandardNormal(new Float64Array(n), 12345);
  const xs = Array.from(z);

  it("has mean 0 and rms 1 (simple-statistics)", () => {
    // Standard error of the mean 1/√n; of the standard deviation ≈ 1/√(2n) (textbook sampling
    // theory, from memory): allow 4 standard errors.
    expect(Math.abs(mean(xs))).toBeLessThan(4 / Math.sqrt(n));
    expect(Math.abs(standardDeviation(xs) - 1)).toBeLessThan(4 / Math.sqrt(2 * n));
  });

  it("is normal: skewness ≈ 0, excess kurtosis ≈ 0, Kolmogorov–Smirnov below the 1 % critical value", () => {
    // Standard errors √(6/n) and √(24/n) of skewness and kurtosis (from memory); KS critical
    // value 1.63/√n at α = 0.01 (common tables); Φ(x) = (1 + erf(x/√2))/2 from simple-statistics.
    expect(Math.abs(sampleSkewness(xs))).toBeLessThan(4 * Math.sqrt(6 / n));
    expect(Math.abs(sampleKurtosis(xs))).toBeLessThan(4 * Math.sqrt(24 / n));
    const sorted = xs.slice().sort((a, b) => a - b);
    let d = 0;
    for (let i = 0; i < n; i++) {
      const cdf = 0.5 * (1 + errorFunction(sorted[i] / Math.SQRT2));
      d = Math.max(d, Math.abs(cdf - i / n), Math.abs(cdf - (i + 1) / n));
    }
    expect(d).toBeLessThan(1.63 / Math.sqrt(n));
    // Share outside ±3.3σ (a 6.6σ peak-to-peak window): erfc(6.6/(2√2)) = 0.097 % (tests/REFERENCES.md).
    const outside = xs.filter((x) => Math.abs(x) > 3.3).length / n;
    expect(outside).toBeGreaterThan(0.0005);
    expect(outside).toBeLessThan(0.0015);
  });

  it("its normal quantile matches published z-values and inverts the normal CDF", () => {
    // Standard normal table values (any statistics handbook, e.g. NIST/SEMATECH e-Handbook
    // 1.3.6.7.1): z(0.975) = 1.959964, z(0.995) = 2.575829, z(0.999) = 3.090232,
    // z(0.9999) = 3.719016; the approximation is Acklam's (relative error < 1.15e-9).
    expect(normalQuantile(0.975)).toBeCloseTo(1.959964, 6);
    expect(normalQuantile(0.995)).toBeCloseTo(2.575829, 6);
    expect(normalQuantile(0.001)).toBeCloseTo(-3.090232, 6);
    expect(normalQuantile(0.9999)).toBeCloseTo(3.719016, 6);
    expect(normalQuantile(0.5)).toBe(0);
    // Round trip through Φ(x) = (1 + erf(x/√2))/2 (simple-statistics' erf, accurate to ~1e-7).
    for (const p of [0.01, 0.02425, 0.2, 0.6, 0.93])
      expect(0.5 * (1 + errorFunction(normalQuantile(p) / Math.SQRT2))).toBeCloseTo(p, 6);
  });

  it("its portable logarithm agrees with Math.log to a few ulp", () => {
    // Reference: the engine's Math.log (IEEE 754 double, correctly rounded or nearly).
    for (const x of [1e-300, 1e-17, 0.001, 0.1, 0.3, 0.5, 0.7071, 0.9, 0.999999, 1]) {
      expect(Math.abs(portableLn(x) - Math.log(x))).toBeLessThanOrEqual(4e-16 * Math.max(1, Math.abs(Math.log(x))));
    }
  });

  it("is reproducible bit for bit from its seed (golden values pinned for cross-platform checks)", () => {
    const a = fillStandardNormal(new Float64Array(8), 42);
    const b = fillStandardNormal(new Float64Array(8), 42);
    expect(Array.from(a)).toEqual(Array.from(b));
    expect(Array.from(fillStandardNormal(new Float64Array(8), 43))).not.toEqual(Array.from(a));
    // Common practice, no source: pinning a few values catches any change of generator or
    // arithmetic that would make runs differ between Node and the browser.
    expect(Array.from(a.slice(0, 3))).toEqual(GOLDEN_SEED_42);
  });
});

const GOLDEN_SEED_42 = [-1.8103848289372257, -0.5110788283674769, -0.7095197728607138];

describe("noise in the input signal", () => {
  const s = scenario({
    input: { components: [{ kind: "dc", level: 1 }], noise: { rms: 0.01, bandwidth: 1e5, seed: 9 } },
    run: { duration: 1e-2, points: 11 },
  });

  it("has knots at 1/(2·bandwidth) and is linear between them", () => {
    const dt = noiseInterval(s.input.noise!);
    expect(dt).toBe(5e-6);
    const t = Float64Array.from([10 * dt, 10.5 * dt, 11 * dt, 10.25 * dt]);
    const v = evaluateInput(s, t);
    expect(v[1]).toBeCloseTo((v[0] + v[2]) / 2, 14);
    expect(v[3]).toBeCloseTo(0.75 * v[0] + 0.25 * v[2], 14);
    // rms of the knots equals noise.rms (within sampling error) around the dc level
    const knots = evaluateInput(
      s,
      Float64Array.from({ length: 1999 }, (_, i) => i * dt),
    );
    const dev = Array.from(knots, (x) => x - 1);
    expect(Math.abs(standardDeviation(dev) / 0.01 - 1)).toBeLessThan(4 / Math.sqrt(2 * 1999));
  });

  it("the same scenario gives the same run bit for bit; another seed gives another run", () => {
    const noisy = scenario({
      stage: { kind: "schmitt-noninverting", rInput: 10e3, rFeedback: 100e3, reference: 0 },
      input: {
        components: [{ kind: "triangle", amplitude: 1, frequency: 100 }],
        noise: { rms: 0.2, bandwidth: 1e5, seed: 5 },
      },
      run: { duration: 0.02, points: 2001 },
    });
    const a = simulate(noisy);
    const b = simulate(structuredClone(noisy));
    expect(Buffer.from(a.output.buffer).equals(Buffer.from(b.output.buffer))).toBe(true);
    expect(Buffer.from(a.input.buffer).equals(Buffer.from(b.input.buffer))).toBe(true);
    expect(a.events).toEqual(b.events);
    expect(a.metrics).toEqual(b.metrics);
    const c = simulate({ ...noisy, input: { ...noisy.input, noise: { ...noisy.input.noise!, seed: 6 } } });
    expect(c.events).not.toEqual(a.events);
  });
});
