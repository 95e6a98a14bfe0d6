// The shared min/max thinner (lib/plot/min-max.ts), checked against a brute-force recomputation of
// each bucket's extremes. Min/max ("peak-detect") decimation keeps every bucket's extremes: common
// practice, no source.
import { describe, expect, it } from "vitest";
import { MinMaxThinner, minMaxIndices, pickAt } from "@/lib/plot/min-max";

/** A seeded linear congruential generator (Numerical Recipes constants), for test data only. */
function lcg(seed: number) {
  let s = seed >>> 0;
  return () => {
    s = (Math.imul(s, 1664525) + 1013904223) >>> 0;
    return s / 2 ** 32;
  };
}

function bruteForce(columns: Float64Array[], buckets: number): number[] {
  const n = columns[0].length;
  const keep = new Set<number>([0, n - 1]);
  for (let b = 0; b < buckets; b++) {
    const from = 1 + Math.floor((b * (n - 2)) / buckets);
    const to = 1 + Math.floor(((b + 1) * (n - 2)) / buckets);
    if (to <= from) continue;
    for (const col of columns) {
      const slice = Array.from(col.subarray(from, to));
      // First occurrence of each extreme, as the thinner keeps.
      keep.add(from + slice.indexOf(Math.min(...slice)));
      keep.add(from + slice.indexOf(Math.max(...slice)));
    }
  }
  return [...keep].sort((a, b) => a - b);
}

describe("min/max thinner", () => {
  it("keeps exactly each bucket's extremes of every column, in time order", () => {
    const rand = lcg(7);
    for (const n of [3, 10, 1001, 25_013]) {
      const a = Float64Array.from({ length: n }, () => rand());
      const b = Float64Array.from({ length: n }, () => rand() * 5 - 2);
      for (const buckets of [1, 7, 64, 999]) {
        const got = Array.from(new MinMaxThinner([a, b], buckets).finish());
        expect(got).toEqual(bruteForce([a, b], buckets));
      }
    }
  });

  it("gives the same answer in slices as in one pass", () => {
    const rand = lcg(11);
    const n = 100_000;
    const a = Float64Array.from({ length: n }, () => rand());
    const whole = new MinMaxThinner([a], 4096).finish();
    const sliced = new MinMaxThinner([a], 4096);
    let steps = 0;
    while (!sliced.advance(100)) steps++;
    expect(steps).toBeGreaterThan(30);
    expect(Array.from(sliced.finish())).toEqual(Array.from(whole));
  });

  it("never drops a one-sample spike or a narrow pulse", () => {
    const n = 1_000_000;
    const out = new Float64Array(n).fill(0.05);
    out[123_457] = 4.95; // a one-sample spike
    for (let i = 700_000; i < 700_003; i++) out[i] = 4.95; // a 3-sample pulse
    const input = new Float64Array(n);
    input[999_000] = -3; // a dip only in the other column
    const idx = minMaxIndices([input, out], 4000);
    expect(idx.length).toBeLessThanOrEqual(4000);
    const kept = pickAt(out, idx);
    expect(Array.from(idx)).toContain(123_457);
    expect(Array.from(idx).some((i) => i >= 700_000 && i < 700_003)).toBe(true);
    expect(Array.from(idx)).toContain(999_000);
    expect(Math.max(...kept)).toBe(4.95);
    expect(idx[0]).toBe(0);
    expect(idx[idx.length - 1]).toBe(n - 1);
    for (let j = 1; j < idx.length; j++) expect(idx[j]).toBeGreaterThan(idx[j - 1]);
  });

  it("returns every index when the columns are already short enough", () => {
    const a = new Float64Array([1, 2, 3]);
    expect(Array.from(minMaxIndices([a], 4000))).toEqual([0, 1, 2]);
    expect(Array.from(minMaxIndices([new Float64Array(0)], 10))).toEqual([]);
  });
});
