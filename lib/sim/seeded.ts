// Seeded random generators shared by the noise of a run (lib/sim/noise.ts) and the studies'
// streams (lib/studies/random.ts): one seeding recipe, so no caller feeds a raw seed to
// pure-rand (whose own `xoroshiro128plus(seed)` puts the seed into the state almost as is, so
// its first outputs are nearly the same for every seed: the first uniform is ≈ 1.0).
import { xoroshiro128plusFromState } from "pure-rand/generator/xoroshiro128plus";

/** MurmurHash3's 32-bit finaliser (Appleby, public domain): a well-known avalanche mix of an integer. */
export function fmix32(x: number): number {
  let h = x | 0;
  h ^= h >>> 16;
  h = Math.imul(h, 0x85ebca6b);
  h ^= h >>> 13;
  h = Math.imul(h, 0xc2b2ae35);
  h ^= h >>> 16;
  return h | 0;
}

/** xoroshiro128+ whose four state words are hashed from a 32-bit seed, with a few outputs dropped. */
export function seededGenerator(seed: number) {
  const s = seed >>> 0;
  const rng = xoroshiro128plusFromState([1, 2, 3, 4].map((k) => fmix32(s + Math.imul(k, 0x9e3779b9))));
  for (let i = 0; i < 8; i++) rng.next();
  return rng;
}
