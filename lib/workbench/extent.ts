// [min, max] of a sample column in one pass (no spread of a million arguments). Pure; used by
// the plots, the readings and the run page alike.
export function extent(a: ArrayLike<number>): [number, number] {
  let lo = Infinity;
  let hi = -Infinity;
  for (let i = 0; i < a.length; i++) {
    const v = a[i];
    if (v < lo) lo = v;
    if (v > hi) hi = v;
  }
  return [lo, hi];
}
