// Seeded Gaussian noise. Uniform numbers come from pure-rand's xoroshiro128+ (a well-known,
// portable generator); the normal deviates use Marsaglia's polar method. Math.log is not
// guaranteed to round identically in every JavaScript engine, so the polar method uses its own
// logarithm built from +, −, ×, ÷ only (IEEE 754 rounds those exactly): the same seed gives the
// same samples bit for bit in Node, every browser and every worker.
import { xoroshiro128plus } from "pure-rand/generator/xoroshiro128plus";
import { uniformFloat64 } from "pure-rand/distribution/uniformFloat64";
import type { Noise } from "@/lib/schemas/scenario";

const SQRT_HALF = 0.7071067811865476;
const LN2 = 0.6931471805599453;

/** Natural logarithm of x in (0, 1] with basic arithmetic only (deterministic everywhere). */
export function portableLn(x: number): number {
  let m = x;
  let e = 0;
  // Scale into [√½, √2) by exact powers of two.
  while (m < SQRT_HALF) {
    m *= 2;
    e -= 1;
  }
  while (m >= 2 * SQRT_HALF) {
    m *= 0.5;
    e += 1;
  }
  // ln m = 2·atanh(z), z = (m−1)/(m+1), |z| ≤ 0.1716: the odd series converges to 1 ulp by z^29.
  const z = (m - 1) / (m + 1);
  const z2 = z * z;
  const s =
    1 +
    z2 * (1 / 3 + z2 * (1 / 5 + z2 * (1 / 7 + z2 * (1 / 9 + z2 * (1 / 11 + z2 * (1 / 13 + z2 * (1 / 15 +
    z2 * (1 / 17 + z2 * (1 / 19 + z2 * (1 / 21 + z2 * (1 / 23 + z2 * (1 / 25 + z2 * (1 / 27 + z2 * (1 / 29))))))))))))));
  return 2 * z * s + e * LN2;
}

/** Fills `out` with independent standard normal deviates from the given 32-bit seed. */
export function fillStandardNormal(out: Float64Array, seed: number): Float64Array {
  const rng = xoroshiro128plus(seed >>> 0);
  const n = out.length;
  let i = 0;
  while (i < n) {
    // Uniform in [−1, 1) with 53 random bits each (pure-rand's uniformFloat64).
    const u = uniformFloat64(rng) * 2 - 1;
    const v = uniformFloat64(rng) * 2 - 1;
    const s = u * u + v * v;
    if (s >= 1 || s === 0) continue;
    const f = Math.sqrt((-2 * portableLn(s)) / s);
    out[i++] = u * f;
    if (i < n) out[i++] = v * f;
  }
  return out;
}

/** Knot interval of the noise: samples at 1/(2·bandwidth) (DESIGN.md). */
export function noiseInterval(noise: Noise): number {
  return 1 / (2 * noise.bandwidth);
}

/** Number of noise segments (knot intervals) needed to cover `duration`. */
export function noiseSegmentCount(noise: Noise, duration: number): number {
  return Math.max(1, Math.ceil(duration / noiseInterval(noise) - 1e-9));
}

/** Noise knot values (volts) covering [0, duration]: segments + 1 knots, scaled by rms. */
export function noiseKnots(noise: Noise, duration: number): Float64Array {
  const knots = fillStandardNormal(new Float64Array(noiseSegmentCount(noise, duration) + 1), noise.seed);
  const rms = noise.rms;
  for (let i = 0; i < knots.length; i++) knots[i] *= rms;
  return knots;
}
