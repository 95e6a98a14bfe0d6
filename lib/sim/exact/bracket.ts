// The one root bracketer of the exact solver: Illinois regula falsi with a bisection every
// fourth step, on any function of τ given as a coefficient vector of the piece's basis.

export interface Evaluator {
  valueAt(c: Float64Array, tau: number): number;
}

/** Spacing of doubles near x (at least the smallest subnormal). */
export const ulp = (x: number): number => Math.max(Math.abs(x) * 2.220446049250313e-16, 5e-324);

/**
 * Sign change of c inside [a, b], where ga = c(a) and gb = c(b) lie on different sides
 * (side = value ≥ 0). Narrows the bracket until it is two time resolutions wide at the absolute
 * time t0 + b and returns its far end: the first point found on b's side of the crossing.
 */
export function bracketRoot(
  f: Evaluator,
  c: Float64Array,
  a: number,
  b: number,
  ga: number,
  gb: number,
  t0: number,
): number {
  const sideB = gb >= 0;
  let stuck = 0; // +1: a moved last, −1: b moved last
  for (let it = 0; it < 200; it++) {
    if (b - a <= 2 * ulp(t0 + b) || b - a <= 1e-300) break;
    let x = (a * gb - b * ga) / (gb - ga);
    if (!(x > a && x < b) || it % 4 === 3) x = 0.5 * (a + b);
    const gx = f.valueAt(c, x);
    if (gx >= 0 === sideB) {
      b = x;
      gb = gx;
      if (stuck === -1) ga *= 0.5;
      stuck = -1;
    } else {
      a = x;
      ga = gx;
      if (stuck === 1) gb *= 0.5;
      stuck = 1;
    }
  }
  return b;
}
