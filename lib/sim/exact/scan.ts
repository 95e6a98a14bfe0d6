// Finding where a combination of the basis changes sign inside a piece: the first regime exit
// and every monitored crossing. Sine-free real pieces are split at their one analytic extremum
// (so each part is monotone and needs one bracket), and a sine-free complex pair steps from
// extremum to extremum. Every other piece (sines, a complex pair with a slope, two exponentials
// with a slope) is walked left to right on a bound of its curvature (`BoundedWalk` below): an
// interval is dismissed when the bound keeps it on one side, bracketed when the bound makes it
// monotone, and halved otherwise. No fixed chunk can miss a hump between two samples, and a
// piece far from the level costs one evaluation.
import { SLOT_E1, SLOT_E2, SLOT_SINES, SLOT_TAU, type Basis } from "./basis";
import { BRACKET_A, BRACKET_B, BRACKET_GA, BRACKET_GB, BRACKET_T0, bracketRoot, newBracket, ulp } from "./bracket";
import type { Recorder } from "../measure";

/** Deepest halving of one interval in the bounded walk (2⁻⁶⁰ of a piece is below any time resolution). */
const MAX_DEPTH = 60;
/** Numbers per point of the walk: τ, value, slope, and the two exponential curvature envelopes. */
const POINT = 5;

/** A start value at or just past the boundary by rounding, moving inward, counts as inside. */
const insideStart = (g: number): number => (g < -Number.MIN_VALUE ? g : -Number.MIN_VALUE);

const FIRST_EXIT = 0;
const CROSSINGS = 1;
const EXTREMA = 2;

export class Scanner {
  /** Chunk for rail-hold pieces with sines: 1/32 of the shortest sine period. */
  readonly chunkSine: number;
  /** Derivative coefficients of the function being walked. */
  private readonly slope: Float64Array;
  /** Points of the walk: the left end at 0, pending right ends stacked above it (top = depth). */
  private readonly points = new Float64Array(POINT * (MAX_DEPTH + 2));
  /** The bracket handed to bracketRoot (numbers in a typed array, not arguments: see there). */
  private readonly bracket = newBracket();
  /** A τ and c's value there, for probeValue. */
  private readonly probe = new Float64Array(2);
  private depth = 0;
  /** |c''| factors: of E1 (a complex pair: of the pair), of E2, and of the sines together. */
  private curvE1 = 0;
  private curvE2 = 0;
  private curvSines = 0;
  /** Side at the end of the last CROSSINGS walk. */
  private walkSide = false;

  /**
   * The piece searched: its absolute start time `start` and the stretch (0, `span`] searched,
   * set by the caller before firstExit, crossings and maxAbs. firstExit leaves its answer in
   * `exit` (NaN when there is none), maxAbs in `best`. Fields, not arguments and results: V8
   * boxes a double that crosses a call it does not inline (see ExactSolver.t).
   */
  start = 0;
  span = 0;
  /** Where maxAbs starts (τ ≥ 0; the stretch before it is skipped). */
  from = 0;
  exit = Number.NaN;
  best = 0;
  /** The analytic extremum found by findExtremum (NaN when none or not used). */
  private extremum = Number.NaN;

  constructor(private readonly basis: Basis) {
    let wMax = 0;
    for (let j = 0; j < basis.sineCount; j++) wMax = Math.max(wMax, basis.omega[j]);
    this.chunkSine = wMax > 0 ? (2 * Math.PI) / wMax / 32 : Infinity;
    this.slope = new Float64Array(basis.size);
  }

  valueAt(c: Float64Array, tau: number): number {
    return this.basis.valueAt(c, tau);
  }

  /**
   * bracketRoot between point 0 and point k (their τ and values); the root is then
   * `bracket[BRACKET_B]`. Nothing crosses the call as a number (see `start`).
   */
  private rootAt(c: Float64Array, k: number): void {
    const P = this.points;
    const o = POINT * k;
    const B = this.bracket;
    B[BRACKET_A] = P[0];
    B[BRACKET_B] = P[o];
    B[BRACKET_GA] = P[1];
    B[BRACKET_GB] = P[o + 1];
    B[BRACKET_T0] = this.start;
    bracketRoot(this, c, B);
  }

  /**
   * How c is searched over (0, span]: Infinity when one analytic split suffices (at
   * `extremum`, NaN when there is none), −1 when the scan steps from extremum to extremum of a
   * complex pair (each step monotone), 0 for the bounded walk.
   */
  private chunkFor(c: Float64Array): number {
    const basis = this.basis;
    this.extremum = Number.NaN;
    if (this.periodicExtrema(c)) return -1;
    if (basis.sineCount > 0 || basis.complex) return 0;
    this.findExtremum(c);
    if (this.extremum === -1) {
      this.extremum = Number.NaN;
      return 0;
    }
    return Infinity;
  }

  /**
   * Interior extremum in (0, span) of a sine-free, real-exponent combination c, into
   * `extremum`: its τ, NaN when there is none, or −1 when it cannot be had in closed form (both
   * exponentials and a slope).
   */
  private findExtremum(c: Float64Array): void {
    const basis = this.basis;
    const slope = c[SLOT_TAU];
    const a = basis.useE1 ? c[SLOT_E1] * basis.lambda1 : 0;
    const b = basis.useE2 ? c[SLOT_E2] * basis.lambda2 : 0;
    let tau = Number.NaN;
    if (a !== 0 && b === 0) {
      const r = -slope / a;
      if (r > 0) tau = Math.log(r) / basis.lambda1;
    } else if (a === 0 && b !== 0) {
      const r = -slope / b;
      if (r > 0) tau = Math.log(r) / basis.lambda2;
    } else if (a !== 0 && b !== 0 && slope === 0) {
      const r = -b / a;
      if (r > 0) tau = Math.log(r) / (basis.lambda1 - basis.lambda2);
    } else if (a !== 0 && b !== 0) {
      this.extremum = -1;
      return;
    }
    this.extremum = tau > 0 && tau < this.span ? tau : Number.NaN;
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

  /**
   * The next point after point 0 of the searches without the bounded walk (the extremum or the
   * end of the span; the next extremum of a complex pair) into point 1, with c's value there.
   */
  private nextPoint(c: Float64Array, chunk: number): void {
    const P = this.points;
    const a = P[0];
    const tMax = this.span;
    const e = this.extremum;
    P[POINT] = chunk === -1 ? Math.min(tMax, this.nextComplexExtremum(c, a)) : e > a && e < tMax ? e : tMax;
    this.valueAtPoint(1, c);
  }

  /** c at point k's τ into its value slot (no argument nor result is a number: see `start`). */
  private valueAtPoint(k: number, c: Float64Array): void {
    const P = this.points;
    const basis = this.basis;
    basis.evaluate(P[POINT * k]);
    P[POINT * k + 1] = basis.dot(c);
  }

  /** c at τ = probe[0] into probe[1] (no argument nor result: see `start`). */
  private probeValue(c: Float64Array): void {
    const q = this.probe;
    const basis = this.basis;
    basis.evaluate(q[0]);
    q[1] = basis.dot(c);
  }

  /**
   * First τ in (0, span] where c turns ≥ 0, into `exit` (NaN if none), given that the condition
   * does not hold at τ = 0 (the caller decided that from the value and slope at the start).
   */
  firstExit(c: Float64Array): void {
    const tMax = this.span;
    const chunk = this.chunkFor(c);
    this.exit = Number.NaN;
    if (chunk === 0) {
      this.points[0] = 0;
      this.startWalk(c);
      this.points[1] = insideStart(this.points[1]);
      this.walk(c, false, FIRST_EXIT, 0, null, null);
      return;
    }
    // Numbers through the points array (see `start`); the value at τ = 0 is the same sum as
    // basis.valueAtStart, plus terms that are exactly zero there.
    const P = this.points;
    P[0] = 0;
    this.valueAtPoint(0, c);
    P[1] = insideStart(P[1]);
    while (P[0] < tMax) {
      this.nextPoint(c, chunk);
      if (P[POINT + 1] >= 0) {
        this.rootAt(c, 1);
        this.exit = this.bracket[BRACKET_B];
        return;
      }
      P.copyWithin(0, POINT, POINT + 2);
    }
  }

  /**
   * Every sign change of c in (0, span], pushed to the recorder as a crossing of `monitor` at
   * start + τ. `side` is the side at τ = 0 (true = ≥ 0); returns the side at the end.
   */
  crossings(c: Float64Array, monitor: number, side: boolean, recorder: Recorder): boolean {
    const tEnd = this.span;
    const t0 = this.start;
    const chunk = this.chunkFor(c);
    if (chunk === 0) {
      // The start counts on its given side (a value across by rounding is not a crossing).
      this.points[0] = 0;
      this.startWalk(c);
      const g0 = this.points[1];
      this.points[1] = side ? (g0 >= 0 ? g0 : 0) : g0 < 0 ? g0 : -Number.MIN_VALUE;
      this.walk(c, side, CROSSINGS, monitor, recorder, null);
      return this.walkSide;
    }
    const P = this.points;
    P[0] = 0;
    P[1] = Number.NaN; // the value at τ = 0 is needed only at a crossing
    while (P[0] < tEnd) {
      this.nextPoint(c, chunk);
      const sb = P[POINT + 1] >= 0;
      if (sb !== side) {
        if (Number.isNaN(P[1])) this.valueAtPoint(0, c);
        let root = P[0];
        if (P[1] >= 0 !== sb) {
          this.rootAt(c, 1);
          root = this.bracket[BRACKET_B];
        }
        recorder.crossingTime = t0 + root;
        recorder.pushCrossing(monitor, sb);
        side = sb;
      }
      P.copyWithin(0, POINT, POINT + 2);
    }
    return side;
  }

  /** max |c(τ)| over [from, span] into `best`: the ends plus interior extrema located on the derivative. */
  maxAbs(c: Float64Array, scratch: Float64Array): void {
    const basis = this.basis;
    const tMin = this.from;
    if (basis.smooth) this.findExtremum(c);
    else this.extremum = -1;
    const e = this.extremum;
    // The two ends and, when it lies after tMin, the analytic extremum; one probe site in the
    // loop, so V8 inlines one copy of the evaluation.
    const q = this.probe;
    this.best = 0;
    for (let i = 0; i < 3; i++) {
      if (i === 2 && !(e > tMin)) break;
      q[0] = i === 0 ? tMin : i === 1 ? this.span : e;
      this.probeValue(c);
      this.best = Math.max(this.best, Math.abs(q[1]));
    }
    if (basis.smooth && e !== -1) return;
    // The extrema are the sign changes of the derivative, found by the bounded walk.
    const D = scratch;
    basis.derivative(c, D);
    this.points[0] = tMin;
    this.startWalk(D);
    this.walk(D, this.points[1] >= 0, EXTREMA, 0, null, c);
  }

  /**
   * The bounded walk. On [a, b] with |c''| ≤ M, c lies within M·h²/8 of its chord and within
   * M·s²/2 of its tangent at either end (Taylor's theorem with the remainder bounded), and its
   * slope moves by at most M·h. So an interval whose ends are on one side is dismissed when one
   * of those bounds keeps it there, an interval whose ends differ is bracketed when its slope
   * cannot change sign (one crossing), and any other interval is halved; an interval at the
   * time resolution is taken as it looks at its ends. M: the exponentials' |c_E·λ²·e^{λτ}| at
   * the interval's larger end (a complex pair: |A + iB|·(μ² + ν²)·e^{μτ}) and the sines'
   * |A_j|·ω_j², common practice, no source.
   */
  private startWalk(c: Float64Array): void {
    const tau = this.points[0]; // set by the caller (no number argument: see `start`)
    const basis = this.basis;
    basis.derivative(c, this.slope);
    if (basis.complex) {
      this.curvE1 =
        Math.sqrt(c[SLOT_E1] * c[SLOT_E1] + c[SLOT_E2] * c[SLOT_E2]) *
        (basis.lambda1 * basis.lambda1 + basis.nu * basis.nu);
      this.curvE2 = 0;
    } else {
      this.curvE1 = basis.useE1 ? Math.abs(c[SLOT_E1]) * basis.lambda1 * basis.lambda1 : 0;
      this.curvE2 = basis.useE2 ? Math.abs(c[SLOT_E2]) * basis.lambda2 * basis.lambda2 : 0;
    }
    let sines = 0;
    for (let j = 0; j < basis.sineCount; j++) {
      const w = basis.omega[j];
      const sn = c[SLOT_SINES + 2 * j];
      const cs = c[SLOT_SINES + 1 + 2 * j];
      sines += Math.sqrt(sn * sn + cs * cs) * w * w;
    }
    this.curvSines = sines;
    const P = this.points;
    if (tau === 0) {
      // τ = 0 needs no evaluation: every exponential is 1 there.
      P[0] = 0;
      P[1] = basis.valueAtStart(c);
      P[2] = basis.valueAtStart(this.slope);
      P[3] = this.curvE1;
      P[4] = this.curvE2;
    } else {
      P[0] = tau;
      this.setPoint(0, c);
    }
  }

  /** Evaluate c into point k at the τ already in its first slot (not an argument: see `start`). */
  private setPoint(k: number, c: Float64Array): void {
    const basis = this.basis;
    const P = this.points;
    const o = POINT * k;
    basis.evaluate(P[o]);
    const v = basis.values;
    P[o + 1] = basis.dot(c);
    P[o + 2] = basis.dot(this.slope);
    if (basis.complex) {
      P[o + 3] = this.curvE1 * Math.sqrt(v[SLOT_E1] * v[SLOT_E1] + v[SLOT_E2] * v[SLOT_E2]);
      P[o + 4] = 0;
    } else {
      P[o + 3] = this.curvE1 * v[SLOT_E1];
      P[o + 4] = this.curvE2 * v[SLOT_E2];
    }
  }

  /** 0: no sign change in (left, top]; 1: exactly one; 2: undecided (halve). */
  private classify(sideLeft: boolean): number {
    const P = this.points;
    const o = POINT * this.depth;
    const a = P[0];
    const ga = P[1];
    const da = P[2];
    const b = P[o];
    const gb = P[o + 1];
    const db = P[o + 2];
    const h = b - a;
    const last = h <= 2 * ulp(this.start + b) || this.depth >= MAX_DEPTH;
    const sideRight = gb >= 0;
    const M = (P[3] > P[o + 3] ? P[3] : P[o + 3]) + (P[4] > P[o + 4] ? P[4] : P[o + 4]) + this.curvSines;
    if (sideLeft === sideRight) {
      if (last) return 0;
      const q = M * h * h;
      if (sideLeft) {
        // lowest c can reach: from the chord, or from the tangent at either end
        const chord = (ga < gb ? ga : gb) - q / 8;
        const fromA = Math.min(ga, ga + da * h - q / 2);
        const fromB = Math.min(gb, gb - db * h - q / 2);
        return Math.max(chord, fromA, fromB) >= 0 ? 0 : 2;
      }
      const chord = (ga > gb ? ga : gb) + q / 8;
      const fromA = Math.max(ga, ga + da * h + q / 2);
      const fromB = Math.max(gb, gb - db * h + q / 2);
      return Math.min(chord, fromA, fromB) < 0 ? 0 : 2;
    }
    if (last) return 1;
    const mh = M * h;
    return (sideRight ? da > mh || db > mh : da < -mh || db < -mh) ? 1 : 2;
  }

  /**
   * Walk (left, span] from the left point set by startWalk, whose side is `side`. FIRST_EXIT
   * leaves the first crossing's τ in `exit`; CROSSINGS pushes every crossing to the recorder
   * and leaves the final side in walkSide; EXTREMA raises `best` to |target| at each crossing
   * (c being the target's derivative).
   */
  private walk(
    c: Float64Array,
    side: boolean,
    mode: number,
    monitor: number,
    recorder: Recorder | null,
    target: Float64Array | null,
  ): void {
    const P = this.points;
    const t0 = this.start;
    this.depth = 1;
    P[POINT] = this.span;
    this.setPoint(1, c);
    for (;;) {
      const verdict = this.classify(side);
      const o = POINT * this.depth;
      if (verdict === 2) {
        this.depth++;
        P[POINT * this.depth] = 0.5 * (P[0] + P[o]);
        this.setPoint(this.depth, c);
        continue;
      }
      if (verdict === 1) {
        const sb = P[o + 1] >= 0;
        let root = P[0];
        if (P[1] >= 0 !== sb) {
          this.rootAt(c, this.depth);
          root = this.bracket[BRACKET_B];
        }
        if (mode === FIRST_EXIT) {
          this.exit = root;
          return;
        }
        if (mode === CROSSINGS) {
          recorder!.crossingTime = t0 + root;
          recorder!.pushCrossing(monitor, sb);
        } else {
          this.probe[0] = root;
          this.probeValue(target!);
          this.best = Math.max(this.best, Math.abs(this.probe[1]));
        }
        side = sb;
      }
      // The right end becomes the left end.
      P.copyWithin(0, o, o + POINT);
      if (--this.depth === 0) break;
    }
    this.walkSide = side;
  }
}
