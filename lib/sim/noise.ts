// Seeded Gaussian noise. Uniform numbers come from pure-rand's xoroshiro128+ (a well-known,
// portable generator); each is mapped to a normal deviate by the inverse normal CDF (Acklam's
// rational approximation). Math.log is not guaranteed to round identically in every JavaScript
// engine, so the tails use a logarithm built from +, −, ×, ÷ and bit operations only (IEEE 754
// rounds those exactly): the same seed gives the same samples bit for bit in Node, every
// browser and every worker.
import { uniformFloat64 } from "pure-rand/distribution/uniformFloat64";
import type { Noise } from "@/lib/schemas/scenario";
import { seededGenerator } from "./seeded";

const SQRT_HALF = 0.7071067811865476;
const LN2 = 0.6931471805599453;

/** ln(m) for m in [√½, √2) by the atanh series (basic arithmetic only). */
function lnSeries(m: number): number {
  const z = (m - 1) / (m + 1);
  const z2 = z * z;
  // |z| ≤ 0.1716: the odd series has converged to 1 ulp by z^29.
  const s =
    1 +
    z2 *
      (1 / 3 +
        z2 *
          (1 / 5 +
            z2 *
              (1 / 7 +
                z2 *
                  (1 / 9 +
                    z2 *
                      (1 / 11 +
                        z2 *
                          (1 / 13 +
                            z2 *
                              (1 / 15 +
                                z2 *
                                  (1 / 17 +
                                    z2 *
                                      (1 / 19 +
                                        z2 *
                                          (1 / 21 +
                                            z2 * (1 / 23 + z2 * (1 / 25 + z2 * (1 / 27 + z2 * (1 / 29))))))))))))));
  return 2 * z * s;
}

/** Slow reference path: scale by exact powers of two, then the series. */
function lnByScaling(x: number): number {
  if (!(x > 0)) return x === 0 ? -Infinity : NaN;
  if (x === Infinity) return x;
  let m = x;
  let e = 0;
  while (m < SQRT_HALF) {
    m *= 2;
    e -= 1;
  }
  while (m >= 2 * SQRT_HALF) {
    m *= 0.5;
    e += 1;
  }
  return lnSeries(m) + e * LN2;
}

// Fast path: exponent and top mantissa bits read from the IEEE 754 bit pattern; ln of the
// 64 cell centres 1 + (k + ½)/64 tabulated once with the series above.
const LN_CELLS = 64;
const lnCell = new Float64Array(LN_CELLS);
for (let k = 0; k < LN_CELLS; k++) lnCell[k] = lnByScaling(1 + (k + 0.5) / LN_CELLS);
const f64 = new Float64Array(1);
const u32 = new Uint32Array(f64.buffer);
const HI = new Uint8Array(Uint16Array.of(1).buffer)[0] === 1 ? 1 : 0; // little-endian: high word at index 1
const MIN_NORMAL = 2.2250738585072014e-308;

/**
 * Natural logarithm of a positive finite x using only +, −, ×, ÷ and bit operations (which
 * IEEE 754 and JavaScript define exactly), so it gives the same bits in every engine — unlike
 * Math.log, whose rounding the language leaves to each implementation.
 */
export function portableLn(x: number): number {
  if (x < MIN_NORMAL) return lnByScaling(x);
  f64[0] = x;
  const hi = u32[HI];
  const e = (hi >>> 20) - 1023;
  const k = (hi >>> 14) & (LN_CELLS - 1);
  u32[HI] = (hi & 0x000fffff) | 0x3ff00000; // mantissa in [1, 2)
  const m = f64[0];
  const c = 1 + (k + 0.5) / LN_CELLS;
  const z = (m - c) / (m + c); // |z| < 1/256
  const z2 = z * z;
  return e * LN2 + lnCell[k] + 2 * z * (1 + z2 * (1 / 3 + z2 * (1 / 5 + z2 * (1 / 7))));
}

// Acklam's rational approximation of the inverse normal CDF (P. J. Acklam, "An algorithm for
// computing the inverse normal cumulative distribution function", 2003): relative error below
// 1.15e-9 over (0, 1). The central 95 % needs no logarithm at all, which makes a million
// samples cheap; the tails use portableLn.
const A = [
  -3.969683028665376e1, 2.209460984245205e2, -2.759285104469687e2, 1.38357751867269e2, -3.066479806614716e1,
  2.506628277459239,
];
const B = [-5.447609879822406e1, 1.615858368580409e2, -1.556989798598866e2, 6.680131188771972e1, -1.328068155288572e1];
const C = [
  -7.784894002430293e-3, -3.223964580411365e-1, -2.400758277161838, -2.549732539343734, 4.374664141464968,
  2.938163982698783,
];
const D = [7.784695709041462e-3, 3.224671290700398e-1, 2.445134137142996, 3.754408661907416];
const P_LOW = 0.02425;
const P_HIGH = 1 - P_LOW;
const TWO_POW_M54 = 5.551115123125783e-17; // stands in for p = 0 (uniformFloat64 is in [0, 1 − 2^-53])

/**
 * Φ⁻¹ of every entry of `values` (each in (0, 1)), in place. The quantile is written out in this
 * one loop rather than called per sample: a call that returns a double boxes it on the heap
 * (one allocation per sample, garbage collections during a run), a typed-array store does not.
 */
function quantilesInPlace(values: Float64Array): void {
  for (let i = 0; i < values.length; i++) {
    const p = values[i];
    if (p < P_LOW || p > P_HIGH) {
      const low = p < P_LOW;
      const q = Math.sqrt(-2 * portableLn(low ? p : 1 - p));
      const x =
        (((((C[0] * q + C[1]) * q + C[2]) * q + C[3]) * q + C[4]) * q + C[5]) /
        ((((D[0] * q + D[1]) * q + D[2]) * q + D[3]) * q + 1);
      values[i] = low ? x : -x;
    } else {
      const q = p - 0.5;
      const r = q * q;
      values[i] =
        ((((((A[0] * r + A[1]) * r + A[2]) * r + A[3]) * r + A[4]) * r + A[5]) * q) /
        (((((B[0] * r + B[1]) * r + B[2]) * r + B[3]) * r + B[4]) * r + 1);
    }
  }
}

const one = new Float64Array(1);

/** Standard normal quantile Φ⁻¹(p) for p in (0, 1). */
export function normalQuantile(p: number): number {
  one[0] = p;
  quantilesInPlace(one);
  return one[0];
}

/**
 * Fills `out` with independent standard normal deviates from the given 32-bit seed: one
 * 53-bit uniform (pure-rand's uniformFloat64 on xoroshiro128+) per sample, mapped through the
 * normal quantile (inverse-transform sampling).
 */
export function fillStandardNormal(out: Float64Array, seed: number): Float64Array {
  fillUniforms(out, seededGenerator(seed));
  quantilesInPlace(out);
  return out;
}

/**
 * 53-bit uniforms in (0, 1) into `out`. Each hot loop of the noise (this one and the quantiles)
 * is a function of its own with nothing after the loop: V8 compiles a long loop while it runs
 * (on-stack replacement), and code after the loop that has not run yet would make that code
 * fall back at every call, leaving the next call's loop unoptimised (one boxed number per
 * sample: garbage collections during a run).
 */
function fillUniforms(out: Float64Array, rng: ReturnType<typeof seededGenerator>): void {
  for (let i = 0; i < out.length; i++) {
    const u = uniformFloat64(rng);
    out[i] = u === 0 ? TWO_POW_M54 : u;
  }
}

/** Knot interval of the noise: samples at 1/(2·bandwidth) (lib/schemas/README.md § Input signal). */
export function noiseInterval(noise: Noise): number {
  return 1 / (2 * noise.bandwidth);
}

/** Number of noise segments (knot intervals) needed to cover `duration`. */
export function noiseSegmentCount(noise: Noise, duration: number): number {
  return Math.max(1, Math.ceil(duration / noiseInterval(noise) - 1e-9));
}

/**
 * The knot buffer a finished run gave back (releaseKnots), for the next run to fill again: a
 * million-segment run needs 8 MB, and a new buffer per run makes the engine collect garbage
 * for the memory outside its heap. Held weakly, so an idle process keeps nothing: the
 * collector may take it whenever it runs, and a run then allocates a new one.
 */
let spareKnots: WeakRef<Float64Array> | null = null;

/**
 * Noise knot values (volts) covering [0, duration]: segments + 1 knots, scaled by rms. With
 * `reuse`, the values go into the buffer a finished run released, when there is one large
 * enough; the caller then owns it until it calls releaseKnots (no two runs share one).
 */
export function noiseKnots(noise: Noise, duration: number, reuse = false): Float64Array {
  const n = noiseSegmentCount(noise, duration) + 1;
  let knots: Float64Array | null = null;
  if (reuse) {
    const spare = spareKnots?.deref();
    if (spare !== undefined && spare.length >= n) {
      knots = spare.length === n ? spare : spare.subarray(0, n);
      spareKnots = null;
    }
  }
  knots = fillStandardNormal(knots ?? new Float64Array(n), noise.seed);
  const rms = noise.rms;
  for (let i = 0; i < knots.length; i++) knots[i] *= rms;
  return knots;
}

/** Give a run's knot buffer back for the next run (the caller must not read it afterwards). */
export function releaseKnots(knots: Float64Array): void {
  const whole = knots.byteLength === knots.buffer.byteLength ? knots : new Float64Array(knots.buffer);
  const spare = spareKnots?.deref();
  if (spare === undefined || spare.length < whole.length) spareKnots = new WeakRef(whole);
}
