// Small statistics used by the studies: Wilson score interval, summary and histogram.
import type { MeasureSpread, SpreadSummary } from "@/lib/schemas/study";

/** One figure's spread and histogram, in their stored shapes (lib/schemas/study.ts). */
export type Summary = SpreadSummary;
export type Histogram = MeasureSpread["histogram"];

/** z for a two-sided 95 % interval (Φ⁻¹(0.975)). */
export const Z95 = 1.959963984540054;

/**
 * Wilson score interval for a binomial proportion k/n (Wilson 1927; Newcombe 1998, method 3).
 * Stays inside [0, 1] and behaves at k = 0 and k = n, unlike the Wald interval.
 */
export function wilsonInterval(k: number, n: number, z = Z95): { low: number; high: number } {
  if (n <= 0) return { low: 0, high: 1 };
  const p = k / n;
  const z2 = z * z;
  const denom = 1 + z2 / n;
  const centre = (p + z2 / (2 * n)) / denom;
  const half = (z / denom) * Math.sqrt((p * (1 - p)) / n + z2 / (4 * n * n));
  return { low: Math.max(0, centre - half), high: Math.min(1, centre + half) };
}

export function summarize(values: readonly number[]): Summary {
  const n = values.length;
  if (n === 0) return { count: 0, mean: null, std: null, min: null, max: null };
  let sum = 0;
  let min = Infinity;
  let max = -Infinity;
  for (const v of values) {
    sum += v;
    if (v < min) min = v;
    if (v > max) max = v;
  }
  const mean = sum / n;
  let ss = 0;
  for (const v of values) ss += (v - mean) * (v - mean);
  return { count: n, mean, std: n > 1 ? Math.sqrt(ss / (n - 1)) : 0, min, max };
}

/** Equal-width histogram over [lo, hi]; values outside are clamped into the end bins. */
export function histogram(values: readonly number[], lo: number, hi: number, bins: number): Histogram {
  if (!(hi > lo)) {
    const pad = Math.abs(lo) * 1e-3 || 1e-6;
    lo -= pad;
    hi += pad;
  }
  const width = (hi - lo) / bins;
  const edges = Array.from({ length: bins + 1 }, (_, i) => lo + i * width);
  const counts = new Array<number>(bins).fill(0);
  for (const v of values) {
    const i = Math.min(bins - 1, Math.max(0, Math.floor((v - lo) / width)));
    counts[i]++;
  }
  return { edges, counts };
}

/** FNV-1a over a string, as 8 hex digits: a cheap fingerprint, not a security hash. */
export function fingerprint(text: string): string {
  let h = 0x811c9dc5;
  for (let i = 0; i < text.length; i++) {
    h ^= text.charCodeAt(i);
    h = Math.imul(h, 0x01000193);
  }
  return (h >>> 0).toString(16).padStart(8, "0");
}
