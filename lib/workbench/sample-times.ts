// Sample times for CSV export printed to the precision the time grid needs: enough decimals to
// resolve one sample step to about 1/10,000 of itself, trailing zeros dropped
// (0.00020002000200020003 → 0.00020002). Pure, no React.

/** Decimals needed for times spaced `step` apart (0 for steps of 10 s or more). */
export function timeDecimals(step: number): number {
  if (!(step > 0) || !Number.isFinite(step)) return 12;
  return Math.max(0, Math.min(15, Math.ceil(-Math.log10(step)) + 4));
}

/** One time value with `decimals` decimals and no trailing zeros. */
export function formatTime(t: number, decimals: number): string {
  const s = t.toFixed(decimals);
  return s.includes(".") ? s.replace(/\.?0+$/, "") : s;
}

/** The smallest positive step between consecutive times (the grid's resolution). */
export function smallestStep(t: ArrayLike<number>): number {
  let step = Infinity;
  for (let i = 1; i < t.length; i++) {
    const d = t[i] - t[i - 1];
    if (d > 0 && d < step) step = d;
  }
  return step;
}
