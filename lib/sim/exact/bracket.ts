// The one root bracketer of the exact solver: Illinois regula falsi with a bisection every
// fourth step, on any function of τ given as a coefficient vector of the piece's basis.

export interface Evaluator {
  valueAt(c: Float64Array, tau: number): number;
}

/** Spacing of doubles near x (at least the smallest subnormal). */
export const ulp = (x: number): number => Math.max(Math.abs(x) * 2.220446049250313e-16, 5e-324);

/**
 * Slots of a bracket: its ends a < b and the values there, on different sides (≥ 0 or not),
 * and the absolute time t0 at τ = 0 (which sets the time resolution).
 */
export const BRACKET_A = 0;
export const BRACKET_B = 1;
export const BRACKET_GA = 2;
export const BRACKET_GB = 3;
export const BRACKET_T0 = 4;

/** A bracket's numbers in a typed array (the callers each keep one). */
export const newBracket = (): Float64Array => new Float64Array(5);

/**
 * Sign change of c inside the bracket [a, b] (slots above). Narrows it in place until it is two
 * time resolutions wide at the absolute time t0 + b; the root is then `bracket[BRACKET_B]`, the
 * first point found on b's side of the crossing.
 *
 * The numbers go in and out through the typed array because of how V8 compiles this loop: a
 * double passed to or returned from a call that is not inlined is boxed into a new heap number,
 * and a loop variable that the function returns is boxed on every iteration (with the four
 * ends as arguments this took about 500 bytes per call, the garbage collections of a noisy run).
 * Read from and written to a Float64Array, they stay plain doubles.
 */
export function bracketRoot(f: Evaluator, c: Float64Array, bracket: Float64Array): void {
  let a = bracket[BRACKET_A];
  let b = bracket[BRACKET_B];
  let ga = bracket[BRACKET_GA];
  let gb = bracket[BRACKET_GB];
  const time = bracket[BRACKET_T0];
  const sideB = gb >= 0;
  let stuck = 0; // +1: a moved last, −1: b moved last
  for (let it = 0; it < 200; it++) {
    if (b - a <= 2 * ulp(time + b) || b - a <= 1e-300) break;
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
  bracket[BRACKET_A] = a;
  bracket[BRACKET_B] = b;
  bracket[BRACKET_GA] = ga;
  bracket[BRACKET_GB] = gb;
}
