// Seeded streams for studies. Every task draws from its own generator whose seed is a pure
// function of (study seed, task index): the numbers a task sees never depend on which worker
// ran it or how the tasks were split, so a study is identical for any pool size.
import { uniformFloat64 } from "pure-rand/distribution/uniformFloat64";
import { portableLn } from "@/lib/sim/noise";
import { fmix32, seededGenerator } from "@/lib/sim/seeded";

/** Seed of task `index` of a study seeded with `studySeed` (both whole numbers ≥ 0). */
export function taskSeed(studySeed: number, index: number): number {
  // Mix the two words separately so (s, i) and (s', i') rarely collide for small values.
  return fmix32(fmix32(studySeed >>> 0) ^ Math.imul((index >>> 0) + 1, 0x9e3779b9)) >>> 0;
}

export interface Stream {
  /** Uniform in [0, 1). */
  uniform(): number;
  /** Uniform in [−1, 1). */
  symmetric(): number;
  /** Standard normal (Marsaglia's polar method). */
  normal(): number;
}

export function createStream(seed: number): Stream {
  const rng = seededGenerator(seed);
  const uniform = () => uniformFloat64(rng);
  return {
    uniform,
    symmetric: () => 2 * uniform() - 1,
    normal: () => {
      // Polar method with lib/sim's basic-arithmetic logarithm: Math.log/cos may round
      // differently between engines, and the server re-runs tasks to check a saved study.
      for (;;) {
        const u = 2 * uniform() - 1;
        const v = 2 * uniform() - 1;
        const s = u * u + v * v;
        if (s >= 1 || s === 0) continue;
        return u * Math.sqrt((-2 * portableLn(s)) / s);
      }
    },
  };
}

export type Spread = "uniform" | "normal";

/**
 * A deviation in [−1, 1] (to be scaled by the tolerance). "uniform": flat over ±tolerance.
 * "normal": the tolerance is read as 3σ (common practice, no single source) and draws beyond
 * ±tolerance are redrawn, so a part never leaves its stated band.
 */
export function drawDeviation(stream: Stream, spread: Spread): number {
  if (spread === "uniform") return stream.symmetric();
  for (let i = 0; i < 64; i++) {
    const z = stream.normal() / 3;
    if (z >= -1 && z <= 1) return z;
  }
  return 0; // unreachable in practice: P(|z| > 3σ) = 0.27 % per try
}

/** Standard deviation of a deviation drawn by `drawDeviation`, in units of the tolerance. */
export function deviationSigma(spread: Spread): number {
  if (spread === "uniform") return 1 / Math.sqrt(3);
  // Normal σ = 1/3 truncated at ±3σ: variance factor 1 − 2·3·φ(3)/(2Φ(3) − 1).
  const phi3 = Math.exp(-4.5) / Math.sqrt(2 * Math.PI);
  const mass = 0.9973002039367398; // 2Φ(3) − 1
  return (1 / 3) * Math.sqrt(1 - (6 * phi3) / mass);
}
