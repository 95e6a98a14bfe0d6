// Noise margin study against a case whose chatter statistics are known in closed form.
//
// Case [derived]: a comparator without hysteresis (input on v+, reference 0 V) sits at a DC
// input −d with Gaussian noise of rms σ added. The scenario contract's noise is independent
// N(0, σ²) values every Δ = 1/(2B), linearly interpolated (lib/schemas/README.md § Input signal). A piecewise-linear
// function peaks at a knot, so the input reaches the reference during the run iff one of the
// M knots in [0, T] exceeds d. An ideal comparator then leaves its low state: the noise-free
// run has no transition, so that seed chatters. Per seed:
//     p(σ) = 1 − Φ(d/σ)^M,   M = 2BT + 1 knots (both ends included),
// and the count over n independent seeds is Binomial(n, p). The part profile below is fast
// (GBW 10 GHz, A0 1e9, SR 10 kV/µs) so the overdrive it needs to swing past mid-level
// (a few µV for a 0.5 ms excursion) is negligible against σ = 2.5…10 mV.
import { describe, expect, it } from "vitest";
import { binomialDistribution, errorFunction } from "simple-statistics";
import { parseScenario } from "@/lib/schemas/scenario";
import { simulate } from "@/lib/sim";
import { noiseMarginConfigSchema } from "@/lib/schemas/study";
import { noiseLevels, summarizeNoiseMargin, RULE_OF_THUMB_FACTOR } from "@/lib/studies/noise-margin";
import { runStudyInProcess } from "@/lib/studies/study";
import type { NoiseTaskOutput } from "@/lib/studies/noise-margin";

const d = 0.01; // V below the reference
const B = 1000; // Hz → knots every 0.5 ms
const T = 0.01; // s → 21 knots
const M = 2 * B * T + 1;

const scenario = parseScenario({
  schema: "railwise.scenario/1",
  supply: { positive: 5, negative: -5 },
  opamp: {
    openLoopGain: 1e9,
    gainBandwidth: 1e10,
    slewRate: 1e10,
    outputHeadroomHigh: 0.5,
    outputHeadroomLow: 0.5,
    inputOffset: 0,
  },
  stage: { kind: "comparator", reference: 0, inputAt: "noninverting" },
  input: { components: [{ kind: "dc", level: -d }] },
  run: { duration: T, points: 2001, initialOutput: "low" },
});

const Phi = (x: number) => 0.5 * (1 + errorFunction(x / Math.SQRT2)); // simple-statistics erf

/** Two-sided acceptance region of Binomial(n, p) holding all but `alpha` of the mass. */
function acceptance(n: number, p: number, alpha: number): [number, number] {
  const pmf = binomialDistribution(n, p) as number[];
  let lo = 0,
    hi = n,
    tailLo = 0,
    tailHi = 0;
  while (lo < n && tailLo + (pmf[lo] ?? 0) <= alpha / 2) tailLo += pmf[lo++] ?? 0;
  while (hi > 0 && tailHi + (pmf[hi] ?? 0) <= alpha / 2) tailHi += pmf[hi--] ?? 0;
  return [lo, hi];
}

describe("noise margin study", () => {
  const config = noiseMarginConfigSchema.parse({
    kind: "noise-margin",
    seed: 20261201,
    rmsFrom: 0.0025,
    rmsTo: 0.01,
    levels: 4,
    seedsPerLevel: 200,
    bandwidth: B,
    limit: 0.05,
  });
  const tasks = runStudyInProcess({ scenario, config }, simulate) as NoiseTaskOutput[];
  const summary = summarizeNoiseMargin(config, tasks);

  it("has a quiet noise-free reference", () => {
    expect(summary.referenceTransitions).toBe(0);
    expect(summary.deadband).toBe(0);
  });

  it("agrees with the binomial model per level (simple-statistics binomialDistribution) [derived]", () => {
    const rows = summary.levels.map((l) => {
      const p = 1 - Phi(d / l.rms) ** M;
      const [lo, hi] = acceptance(l.seeds, p, 0.002);
      return { rms: l.rms, p, k: l.chattered, lo, hi, wilson: [l.low, l.high] };
    });
    // The levels chosen span p ≈ 0.0001 … 0.94, so the check is not trivially at 0 or 1.
    expect(rows[0].p).toBeLessThan(0.01);
    expect(rows[rows.length - 1].p).toBeGreaterThan(0.8);
    for (const r of rows) {
      expect(r.k, `rms ${r.rms}: ${r.k}/200 vs p = ${r.p.toFixed(4)}`).toBeGreaterThanOrEqual(r.lo);
      expect(r.k, `rms ${r.rms}: ${r.k}/200 vs p = ${r.p.toFixed(4)}`).toBeLessThanOrEqual(r.hi);
    }
    // Pooled check: Σ (k − np)² / (np(1−p)) is about χ²(levels); far beyond 20 means a bias.
    const chi2 = rows
      .filter((r) => r.p > 1e-3 && r.p < 1 - 1e-3)
      .reduce((s, r) => s + (r.k - 200 * r.p) ** 2 / (200 * r.p * (1 - r.p)), 0);
    expect(chi2).toBeLessThan(20);
  });

  it("reports the largest level under the limit and the rule-of-thumb marker", () => {
    const levels = noiseLevels(config);
    const firstOver = summary.levels.findIndex((l) => l.probability > config.limit);
    expect(firstOver).toBeGreaterThan(0);
    expect(summary.safeRms).toBe(levels[firstOver - 1]);
    expect(summary.ruleOfThumbRms).toBe(summary.deadband / RULE_OF_THUMB_FACTOR);
    for (const l of summary.levels) {
      expect(l.low).toBeLessThanOrEqual(l.probability);
      expect(l.high).toBeGreaterThanOrEqual(l.probability);
    }
  });
});
