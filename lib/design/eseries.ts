export type SeriesName = "E6" | "E12" | "E24" | "E48" | "E96" | "E192";

export const SERIES_NAMES: SeriesName[] = ["E6", "E12", "E24", "E48", "E96", "E192"];

/** Usual tolerance of each series (IEC 60063 usage): E6 20 %, E12 10 %, E24 5 %, E48 2 %, E96 1 %, E192 0.5 %. */
export const SERIES_TOLERANCE: Record<SeriesName, number> = {
  E6: 0.2,
  E12: 0.1,
  E24: 0.05,
  E48: 0.02,
  E96: 0.01,
  E192: 0.005,
};

// E6–E24 are hard-coded: the published values differ from plain rounding of 10^(i/24) at
// 2.7, 3.0, 3.3, 3.6, 3.9, 4.3, 4.7 and 8.2 (IEC 60063).
const E24 = [
  1.0, 1.1, 1.2, 1.3, 1.5, 1.6, 1.8, 2.0, 2.2, 2.4, 2.7, 3.0, 3.3, 3.6, 3.9, 4.3, 4.7, 5.1, 5.6, 6.2, 6.8, 7.5, 8.2,
  9.1,
];
const E12 = E24.filter((_, i) => i % 2 === 0);
const E6 = E24.filter((_, i) => i % 4 === 0);

// E48–E192 follow round(10^(i/N), 3 significant figures) except E192 i = 185, published as 9.20.
function rounded(n: number): number[] {
  const out: number[] = [];
  for (let i = 0; i < n; i++) out.push(Number((10 ** (i / n)).toPrecision(3)));
  return out;
}
const E192 = rounded(192);
E192[185] = 9.2;
const E96 = E192.filter((_, i) => i % 2 === 0);
const E48 = E192.filter((_, i) => i % 4 === 0);

const TABLE: Record<SeriesName, readonly number[]> = {
  E6: Object.freeze(E6),
  E12: Object.freeze(E12),
  E24: Object.freeze(E24),
  E48: Object.freeze(E48),
  E96: Object.freeze(E96),
  E192: Object.freeze(E192),
};

export function isSeriesName(name: unknown): name is SeriesName {
  return typeof name === "string" && (SERIES_NAMES as string[]).includes(name);
}

/** The mantissas of one decade, 1.0 ≤ m < 10, ascending (e.g. E12 → 1.0, 1.2, … 8.2). */
export function seriesValues(name: SeriesName): readonly number[] {
  if (!isSeriesName(name)) throw new RangeError(`unknown series "${String(name)}" (use ${SERIES_NAMES.join(", ")})`);
  return TABLE[name];
}

function scaled(mantissa: number, decade: number): number {
  return Number((mantissa * 10 ** decade).toPrecision(6));
}

export type SnapMode = "nearest" | "up" | "down";

/**
 * The series value nearest to `value` by ratio (|ln(v/s)|), or the next one up/down.
 * A value already in the series (to 1 ppm) maps to itself in every mode.
 */
export function snapToSeries(value: number, name: SeriesName, mode: SnapMode = "nearest"): number {
  if (!Number.isFinite(value) || value <= 0)
    throw new RangeError(`snapToSeries needs a positive, finite value (got ${value})`);
  const values = seriesValues(name);
  const decade = Math.floor(Math.log10(value));
  // Candidates from the decade below to the decade above cover float edge cases at 10^k.
  let best = NaN;
  let bestScore = Infinity;
  for (let d = decade - 1; d <= decade + 1; d++) {
    for (const m of values) {
      const s = scaled(m, d);
      const r = Math.log(s / value);
      const same = Math.abs(r) < 1e-6;
      let score: number;
      if (mode === "nearest") score = Math.abs(r);
      else if (mode === "up") score = same || r > 0 ? Math.max(r, 0) : Infinity;
      else score = same || r < 0 ? Math.max(-r, 0) : Infinity;
      if (score < bestScore) {
        bestScore = score;
        best = s;
      }
    }
  }
  return best;
}

/** Every series value in [min, max] (ohms or any unit), ascending. */
export function seriesInRange(name: SeriesName, min: number, max: number): number[] {
  if (!(min > 0) || !(max >= min)) throw new RangeError(`seriesInRange needs 0 < min ≤ max (got ${min}, ${max})`);
  const values = seriesValues(name);
  const out: number[] = [];
  const lo = Math.floor(Math.log10(min)) - 1;
  const hi = Math.ceil(Math.log10(max)) + 1;
  for (let d = lo; d <= hi; d++) {
    for (const m of values) {
      const s = scaled(m, d);
      if (s >= min * (1 - 1e-9) && s <= max * (1 + 1e-9)) out.push(s);
    }
  }
  return out;
}
