// Finding where a combination of the basis changes sign inside a piece: the first regime exit
// and every monitored crossing. Sine-free real pieces are split at their one analytic extremum
// (so each part is monotone and needs one bracket); pieces with sines or a complex pair are
// scanned in chunks short against their fastest oscillation.
import { SLOT_E1, SLOT_E2, SLOT_TAU, type Basis } from "./basis";
import { bracketRoot } from "./bracket";
import type { Recorder } from "../measure";

export class Scanner {
  /** Chunk for pieces with sines: 1/32 of the shortest sine period. */
  readonly chunkSine: number;

  constructor(private readonly basis: Basis) {
    let wMax = 0;
    for (let j = 0; j < basis.sineCount; j++) wMax = Math.max(wMax, basis.omega[j]);
    this.chunkSine = wMax > 0 ? (2 * Math.PI) / wMax / 32 : Infinity;
  }

  valueAt(c: Float64Array, tau: number): number {
    return this.basis.valueAt(c, tau);
  }

  /**
   * Scan step for c over (0, tMax): Infinity when one analytic split suffices, −1 when the
   * scan steps from extremum to extremum of a complex pair (each step monotone).
   */
  chunkFor(c: Float64Array, tMax: number): number {
    const basis = this.basis;
    if (this.periodicExtrema(c)) return -1;
    let chunk = basis.sineCount > 0 ? this.chunkSine : Infinity;
    if (basis.complex) chunk = Math.min(chunk, Math.PI / (4 * basis.nu));
    if (chunk === Infinity && basis.extremum(c, tMax) === -1) chunk = tMax / 64;
    return chunk;
  }

  /**
   * A complex pair without sines or slope: c = c0 + e^{μτ}(A·cos ντ + B·sin ντ) has its extrema
   * where (μA + νB)·cos ντ + (μB − νA)·sin ντ = 0, every π/ν: true when that applies to c.
   */
  private periodicExtrema(c: Float64Array): boolean {
    return this.basis.complex && this.basis.sineCount === 0 && c[SLOT_TAU] === 0;
  }

  /** First extremum of such a c strictly after a. */
  private nextComplexExtremum(c: Float64Array, a: number): number {
    const { lambda1: mu, nu } = this.basis;
    const A = c[SLOT_E1];
    const B = c[SLOT_E2];
    const P = mu * A + nu * B;
    const Q = mu * B - nu * A;
    const theta0 = Q === 0 ? Math.PI / 2 : Math.atan(-P / Q);
    let k = Math.floor((nu * a - theta0) / Math.PI) + 1;
    let tau = (theta0 + k * Math.PI) / nu;
    while (!(tau > a)) tau = (theta0 + ++k * Math.PI) / nu;
    return tau;
  }

  private nextPoint(c: Float64Array, a: number, chunk: number, extremum: number, tMax: number): number {
    if (chunk === -1) return Math.min(tMax, this.nextComplexExtremum(c, a));
    let b = chunk === Infinity ? tMax : Math.min(tMax, a + chunk);
    if (extremum > a && extremum < b) b = extremum;
    return b;
  }

  /**
   * First τ in (0, tMax] where c turns ≥ 0, given that the condition does not hold at τ = 0
   * (the caller decided that from the value and slope at the start); NaN if none.
   */
  firstExit(c: Float64Array, tMax: number, t0: number): number {
    const chunk = this.chunkFor(c, tMax);
    const ext = chunk === Infinity ? this.basis.extremum(c, tMax) : NaN;
    let a = 0;
    // At or just past the boundary by rounding, moving inward: count the start as inside.
    let ga = Math.min(this.valueAt(c, 0), -Number.MIN_VALUE);
    if (ga >= 0) ga = -Number.MIN_VALUE;
    while (a < tMax) {
      const b = this.nextPoint(c, a, chunk, ext, tMax);
      const gb = this.valueAt(c, b);
      if (gb >= 0) return bracketRoot(this, c, a, b, ga, gb, t0);
      a = b;
      ga = gb;
    }
    return NaN;
  }

  /**
   * Every sign change of c in (0, tEnd], pushed to the recorder as a crossing of `monitor` at
   * t0 + τ. `side` is the side at τ = 0 (true = ≥ 0); returns the side at tEnd.
   */
  crossings(c: Float64Array, monitor: number, side: boolean, tEnd: number, t0: number, recorder: Recorder): boolean {
    const chunk = this.chunkFor(c, tEnd);
    const ext = chunk === Infinity ? this.basis.extremum(c, tEnd) : NaN;
    let a = 0;
    let ga = NaN;
    while (a < tEnd) {
      const b = this.nextPoint(c, a, chunk, ext, tEnd);
      const gb = this.valueAt(c, b);
      const sb = gb >= 0;
      if (sb !== side) {
        if (Number.isNaN(ga)) ga = this.valueAt(c, a);
        const root = ga >= 0 === sb ? a : bracketRoot(this, c, a, b, ga, gb, t0);
        recorder.push(t0 + root, monitor, sb);
        side = sb;
      }
      a = b;
      ga = gb;
    }
    return side;
  }

  /** max |c(τ)| over [tMin, tMax]: the ends plus interior extrema located on the derivative. */
  maxAbs(c: Float64Array, scratch: Float64Array, tMin: number, tMax: number, t0: number): number {
    const basis = this.basis;
    let best = Math.max(Math.abs(this.valueAt(c, tMin)), Math.abs(this.valueAt(c, tMax)));
    if (basis.smooth) {
      const e = basis.extremum(c, tMax);
      if (e > tMin) best = Math.max(best, Math.abs(this.valueAt(c, e)));
      if (e !== -1) return best;
    }
    const D = scratch;
    basis.derivative(c, D);
    const dChunk = this.chunkFor(D, tMax);
    const chunk = Math.min(dChunk === -1 ? Math.PI / (4 * basis.nu) : dChunk, (tMax - tMin) / 4);
    let a = tMin;
    let da = this.valueAt(D, tMin);
    while (a < tMax) {
      const b = Math.min(tMax, a + chunk);
      const db = this.valueAt(D, b);
      if (db >= 0 !== da >= 0) {
        const r = bracketRoot(this, D, a, b, da, db, t0);
        best = Math.max(best, Math.abs(this.valueAt(c, r)));
      }
      a = b;
      da = db;
    }
    return best;
  }
}
