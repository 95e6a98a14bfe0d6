// The default solver: exact piecewise solution of the behavioural op-amp model.
//
// Between input breakpoints the input is affine in time plus sines, and in each regime the
// model is a linear ODE with a closed-form solution:
//   linear      dvo/dt = ωp(A0·vd − vo)   (scalar exponential, or a 2×2 system with the timing capacitor)
//   slew        dvo/dt = +SR or −SRfall
//   rail        vo = Voh or Vol
// Every quantity inside a piece is a combination of the basis
//   1, τ, E1(τ), E2(τ), sin(ω_j τ), cos(ω_j τ)
// (E1/E2 = e^{λ1τ}, e^{λ2τ}, or e^{μτ}cos ντ, e^{μτ}sin ντ for complex eigenvalues), so regime
// exits (slew entry/exit, rail entry/exit) and the monitored crossings are located by
// bracketing root finding on that closed form. Nothing here depends on the output sample grid,
// and the stiffness of a negative-feedback loop costs nothing: a 60 s ramp is a few pieces.
//
// Allocation: all coefficient vectors are allocated once per run; the piece loop allocates
// nothing (events are the only objects created, one per output edge).
import type { Network } from "./network";
import type { InputSignal } from "./signals";
import { MONITOR_VD, Recorder } from "./measure";
import { SimCancelled, SimFailed } from "./errors";

export interface ExactParams {
  net: Network;
  signal: InputSignal;
  rails: { high: number; low: number };
  openLoopGain: number;
  gainBandwidth: number;
  slewRate: number;
  slewRateFall: number;
  propagationDelay: number;
  duration: number;
  vo0: number;
  vc0: number;
  sampleTimes: Float64Array;
  output: Float64Array;
  recorder: Recorder;
  trackVd: boolean;
  onProgress?: (fraction: number) => void;
  shouldCancel?: () => boolean;
  /** Piece budget (default unlimited); a server may pass one as a last line of defence. */
  maxSteps?: number;
}

const LINEAR = 0;
const SLEW_UP = 1;
const SLEW_DOWN = 2;
const RAIL_HIGH = 3;
const RAIL_LOW = 4;

/** Largest growth exponent allowed inside one piece (e^40 ≈ 2e17 keeps coefficients finite). */
const MAX_GROWTH = 40;

const ulp = (x: number) => Math.max(Math.abs(x) * 2.220446049250313e-16, 5e-324);

export class ExactSolver {
  // Model constants
  private readonly wp: number;
  private readonly A0: number;
  private readonly SR: number;
  private readonly SRf: number;
  private readonly Voh: number;
  private readonly Vol: number;
  private readonly al: number;
  private readonly be: number;
  private readonly ga: number;
  private readonly de: number;
  private readonly w: number; // 1/τc, 0 without a capacitor
  private readonly twoD: boolean;
  private readonly td: number;
  private readonly m: number; // number of sines
  private readonly nb: number; // basis size
  private readonly omega: Float64Array;
  private readonly chunkSine: number; // scan step for pieces containing sines
  private readonly pieceCapSine: number;

  // Piece state
  private lam1 = 0;
  private lam2 = 0;
  private cplx = false;
  private nu = 0;
  private useE1 = false;
  private useE2 = false;
  private smooth = true; // no sines and no complex pair: analytic extremum splitting applies

  // Coefficient vectors (allocated once)
  private readonly B: Float64Array;
  private readonly U: Float64Array;
  private readonly VO: Float64Array;
  private readonly VC: Float64Array;
  private readonly F: Float64Array;
  private readonly G: Float64Array;
  private readonly D: Float64Array;
  private readonly sides = new Uint8Array(4);

  steps = 0;
  evaluations = 0;
  private readonly maxSteps: number;
  private tx = 0;
  private next = -1;

  /** Keep the earliest exit found so far. */
  private consider(tau: number, regime: number): void {
    if (tau === tau && tau <= this.tx) {
      this.tx = tau;
      this.next = regime;
    }
  }

  constructor(private readonly p: ExactParams) {
    this.maxSteps = p.maxSteps ?? Infinity;
    this.A0 = p.openLoopGain;
    this.wp = (2 * Math.PI * p.gainBandwidth) / p.openLoopGain;
    this.SR = p.slewRate;
    this.SRf = p.slewRateFall;
    this.Voh = p.rails.high;
    this.Vol = p.rails.low;
    this.al = p.net.alpha;
    this.be = p.net.beta;
    this.ga = p.net.gamma;
    this.de = p.net.delta;
    this.twoD = p.net.tauC > 0;
    this.w = this.twoD ? 1 / p.net.tauC : 0;
    this.td = p.propagationDelay;
    // The stage ignores the input when alpha = 0 (oscillator): drop the sines from the basis.
    this.omega = this.al === 0 ? new Float64Array(0) : p.signal.sineOmega;
    this.m = this.omega.length;
    this.nb = 4 + 2 * this.m;
    let wMax = 0;
    for (let j = 0; j < this.m; j++) wMax = Math.max(wMax, this.omega[j]);
    const tMin = wMax > 0 ? (2 * Math.PI) / wMax : Infinity;
    this.chunkSine = tMin / 32;
    this.pieceCapSine = tMin / 8;
    const nb = this.nb;
    this.B = new Float64Array(nb);
    this.U = new Float64Array(nb);
    this.VO = new Float64Array(nb);
    this.VC = new Float64Array(nb);
    this.F = new Float64Array(nb);
    this.G = new Float64Array(nb);
    this.D = new Float64Array(nb);
  }

  // ---- basis -------------------------------------------------------------------------------

  private basis(tau: number): void {
    const B = this.B;
    this.evaluations++;
    B[0] = 1;
    B[1] = tau;
    if (this.cplx) {
      const g = Math.exp(this.lam1 * tau);
      B[2] = g * Math.cos(this.nu * tau);
      B[3] = g * Math.sin(this.nu * tau);
    } else {
      B[2] = this.useE1 ? Math.exp(this.lam1 * tau) : 0;
      B[3] = this.useE2 ? Math.exp(this.lam2 * tau) : 0;
    }
    for (let j = 0; j < this.m; j++) {
      const x = this.omega[j] * tau;
      B[4 + 2 * j] = Math.sin(x);
      B[5 + 2 * j] = Math.cos(x);
    }
  }

  private dot(c: Float64Array): number {
    const B = this.B;
    let s = c[0] + c[1] * B[1] + c[2] * B[2] + c[3] * B[3];
    for (let i = 4; i < this.nb; i++) s += c[i] * B[i];
    return s;
  }

  private valueAt(c: Float64Array, tau: number): number {
    if (!this.useE1 && !this.useE2 && this.m === 0) {
      this.evaluations++;
      return c[0] + c[1] * tau;
    }
    this.basis(tau);
    return this.dot(c);
  }

  /** Interior extremum of c (sine-free, real eigenvalues) in (0, tMax), else NaN. */
  private extremum(c: Float64Array, tMax: number): number {
    const c1 = c[1];
    const a = this.useE1 ? c[2] * this.lam1 : 0;
    const b = this.useE2 ? c[3] * this.lam2 : 0;
    let tau = NaN;
    if (a !== 0 && b === 0) {
      const r = -c1 / a;
      if (r > 0) tau = Math.log(r) / this.lam1;
    } else if (a === 0 && b !== 0) {
      const r = -c1 / b;
      if (r > 0) tau = Math.log(r) / this.lam2;
    } else if (a !== 0 && b !== 0 && c1 === 0) {
      const r = -b / a;
      if (r > 0) tau = Math.log(r) / (this.lam1 - this.lam2);
    } else if (a !== 0 && b !== 0) {
      return -1; // both exponentials and a slope: fall back to uniform scanning
    }
    return tau > 0 && tau < tMax ? tau : NaN;
  }

  /** Scan step for c over (0, tMax): Infinity when one analytic split suffices. */
  private chunkFor(c: Float64Array, tMax: number): number {
    let chunk = Infinity;
    if (this.m > 0) chunk = this.chunkSine;
    if (this.cplx) chunk = Math.min(chunk, Math.PI / (4 * this.nu));
    if (chunk === Infinity && this.extremum(c, tMax) === -1) chunk = tMax / 64;
    return chunk;
  }

  /** Next scan point after a. */
  private nextPoint(a: number, chunk: number, ext: number, tMax: number): number {
    let b = chunk === Infinity ? tMax : Math.min(tMax, a + chunk);
    if (ext > a && ext < b) b = ext;
    return b;
  }

  /**
   * Root of c in [a, b] with c(a) on side `sa` (true = ≥ 0) and c(b) on the other side.
   * Returns the end of the final bracket on the far side (strictly past the crossing).
   */
  private bracket(c: Float64Array, a: number, b: number, ga: number, gb: number, t0: number): number {
    let side = 0;
    for (let it = 0; it < 200; it++) {
      if (b - a <= 2 * ulp(t0 + b) || b - a <= 1e-300) break;
      let x = (a * gb - b * ga) / (gb - ga);
      if (!(x > a && x < b)) x = 0.5 * (a + b);
      // Illinois: alternate with bisection when one end sticks
      if (it % 4 === 3) x = 0.5 * (a + b);
      const gx = this.valueAt(c, x);
      if (gx >= 0 === ga >= 0) {
        a = x;
        ga = gx;
        if (side === -1) gb *= 0.5;
        side = -1;
      } else {
        b = x;
        gb = gx;
        if (side === 1) ga *= 0.5;
        side = 1;
      }
    }
    return b;
  }

  /** First τ in (0, tMax] where c becomes > 0 (c(0) taken as ≤ 0); NaN if none. */
  private firstExit(c: Float64Array, tMax: number, t0: number): number {
    const chunk = this.chunkFor(c, tMax);
    const ext = chunk === Infinity ? this.extremum(c, tMax) : NaN;
    let a = 0;
    let ga = this.valueAt(c, 0);
    while (a < tMax) {
      const b = this.nextPoint(a, chunk, ext, tMax);
      const gb = this.valueAt(c, b);
      if (gb > 0) {
        // Past the boundary at both ends of a monotone chunk: the exit condition already holds
        // (a regime entered on a grazing crossing, e.g. the output reaches the rail just as the
        // drive turns round). Ignoring it would hold the regime for the whole piece, which for
        // a DC-driven oscillator is the rest of the run: leave at the next representable time.
        // A start past the boundary by rounding only that comes back within the chunk has
        // gb ≤ 0 and is skipped below.
        if (ga > 0) return a === 0 ? Math.min(tMax, ulp(t0)) : a;
        // find first point with g > 0
        const r = this.bracketPositive(c, a, b, ga, gb, t0);
        // An exit closer than the time resolution at t0 (late in a long run) would not move
        // the clock and could cycle between two regimes at one instant: step to the next
        // representable time instead (g stays past the crossing there: the chunk is monotone).
        return t0 + r > t0 ? r : Math.min(tMax, ulp(t0));
      }
      a = b;
      ga = gb;
    }
    return NaN;
  }

  private bracketPositive(c: Float64Array, a: number, b: number, ga: number, gb: number, t0: number): number {
    for (let it = 0; it < 200; it++) {
      if (b - a <= 2 * ulp(t0 + b)) break;
      let x = (a * gb - b * ga) / (gb - ga);
      if (!(x > a && x < b) || it % 4 === 3) x = 0.5 * (a + b);
      const gx = this.valueAt(c, x);
      if (gx > 0) {
        b = x;
        gb = gx;
      } else {
        a = x;
        ga = gx;
      }
    }
    return b;
  }

  /** Report every sign change of c in (0, tEnd] as a crossing of monitor `id`. */
  private monitor(c: Float64Array, id: number, tEnd: number, t0: number): void {
    const rec = this.p.recorder;
    const chunk = this.chunkFor(c, tEnd);
    const ext = chunk === Infinity ? this.extremum(c, tEnd) : NaN;
    let side = this.sides[id] === 1;
    let a = 0;
    let ga = NaN;
    while (a < tEnd) {
      const b = this.nextPoint(a, chunk, ext, tEnd);
      const gb = this.valueAt(c, b);
      const sb = gb >= 0;
      if (sb !== side) {
        if (Number.isNaN(ga)) ga = this.valueAt(c, a);
        const root = ga >= 0 === sb ? a : this.bracket(c, a, b, ga, gb, t0);
        rec.push(t0 + root, id, sb);
        side = sb;
      }
      a = b;
      ga = gb;
    }
    this.sides[id] = side ? 1 : 0;
  }

  // ---- regimes -----------------------------------------------------------------------------

  /**
   * Input coefficients of the piece starting at t (seen through the transport delay);
   * returns the end of the input piece in solver time.
   */
  private inputPiece(t: number): number {
    // U[2], U[3] (exponential slots) stay 0 for inputs; every other slot is written below.
    const U = this.U;
    const sig = this.p.signal;
    if (this.al === 0) return Infinity;
    const ts = t - this.td;
    if (ts < 0) {
      U.fill(0);
      U[0] = sig.valueAt(0);
      return this.td;
    }
    sig.piece(ts);
    U[0] = sig.pieceValue;
    U[1] = sig.pieceSlope;
    for (let j = 0; j < this.m; j++) {
      const ph = this.omega[j] * ts + sig.sinePhase[j];
      U[4 + 2 * j] = sig.sineAmp[j] * Math.cos(ph);
      U[5 + 2 * j] = sig.sineAmp[j] * Math.sin(ph);
    }
    return sig.pieceEnd + this.td;
  }

  /**
   * Sets up the input piece at t and returns its end (≤ T). A breakpoint closer than the time
   * resolution at t (it can round onto t after the delay shift) would give an empty piece and
   * no progress: the piece then runs to the next representable time.
   */
  private pieceEnd(t: number, T: number): number {
    const e = Math.min(T, this.inputPiece(t));
    return e > t ? e : Math.min(T, t + ulp(t));
  }

  private uAt0(): number {
    let u = this.U[0];
    for (let j = 0; j < this.m; j++) u += this.U[5 + 2 * j];
    return u;
  }

  private fLin(u: number, vo: number, vc: number): number {
    return this.wp * (this.A0 * (this.al * u + this.be * vo + this.ga * vc + this.de) - vo);
  }

  private select(vo: number, vc: number): number {
    const f = this.fLin(this.uAt0(), vo, vc);
    if (vo >= this.Voh && f >= 0) return RAIL_HIGH;
    if (vo <= this.Vol && f <= 0) return RAIL_LOW;
    if (f > this.SR) return SLEW_UP;
    if (f < -this.SRf) return SLEW_DOWN;
    return LINEAR;
  }

  /** Fill VO/VC and the basis exponents for the regime; returns the growth cap on the piece. */
  private setupRegime(regime: number, vo: number, vc: number): number {
    const VO = this.VO;
    const VC = this.VC;
    const U = this.U;
    VO.fill(0);
    VC.fill(0);
    this.cplx = false;
    this.useE1 = false;
    this.useE2 = false;
    this.smooth = this.m === 0;
    let cap = Infinity;
    const wpA0 = this.wp * this.A0;
    if (regime === LINEAR) {
      let k = this.wp * (this.A0 * this.be - 1);
      if (!this.twoD) {
        // Exactly A0·β = 1 makes the pole vanish: nudge it (a degenerate design, not physical).
        if (Math.abs(k) < 1e-9 * this.wp) k = -1e-9 * this.wp;
        const F0 = wpA0 * (this.al * U[0] + this.de);
        const F1 = wpA0 * this.al * U[1];
        const p1 = -F1 / k;
        const p0 = (p1 - F0) / k;
        VO[0] = p0;
        VO[1] = p1;
        let vp0 = p0;
        for (let j = 0; j < this.m; j++) {
          const om = this.omega[j];
          const Fs = wpA0 * this.al * U[4 + 2 * j];
          const Fc = wpA0 * this.al * U[5 + 2 * j];
          const den = k * k + om * om;
          const P = (-k * Fs + om * Fc) / den;
          const Q = (-k * Fc - om * Fs) / den;
          VO[4 + 2 * j] = P;
          VO[5 + 2 * j] = Q;
          vp0 += Q;
        }
        VO[2] = vo - vp0;
        this.lam1 = k;
        this.useE1 = true;
        if (k > 0) cap = MAX_GROWTH / k;
      } else {
        // x' = M x + [F0, 0], M = [[k, g], [w, −w]]; the oscillator's input is not connected.
        const g = wpA0 * this.ga;
        const w = this.w;
        const F0 = wpA0 * this.de;
        let kg = k + g;
        if (Math.abs(kg) < 1e-12 * Math.abs(g)) kg = -1e-12 * Math.abs(g);
        const xs = -F0 / kg;
        const d0 = vo - xs;
        const d1 = vc - xs;
        const tr = k - w;
        const det = -w * kg;
        const disc = 0.25 * tr * tr - det;
        VO[0] = xs;
        VC[0] = xs;
        if (disc > 0) {
          const s = Math.sqrt(disc);
          let l1: number;
          let l2: number;
          if (tr >= 0) {
            l1 = 0.5 * tr + s;
            l2 = det / l1;
          } else {
            l2 = 0.5 * tr - s;
            l1 = det / l2;
          }
          const dl = l1 - l2;
          const a0 = ((k - l2) * d0 + g * d1) / dl;
          const a1 = (w * d0 + (-w - l2) * d1) / dl;
          VO[2] = a0;
          VC[2] = a1;
          VO[3] = d0 - a0;
          VC[3] = d1 - a1;
          this.lam1 = l1;
          this.lam2 = l2;
          this.useE1 = true;
          this.useE2 = true;
          const grow = Math.max(l1, l2);
          if (grow > 0) cap = MAX_GROWTH / grow;
        } else {
          const mu = 0.5 * tr;
          const nu = Math.sqrt(Math.max(-disc, 1e-300));
          VO[2] = d0;
          VC[2] = d1;
          VO[3] = ((k - mu) * d0 + g * d1) / nu;
          VC[3] = (w * d0 + (-w - mu) * d1) / nu;
          this.lam1 = mu;
          this.nu = nu;
          this.cplx = true;
          this.useE1 = true;
          this.useE2 = true;
          this.smooth = false;
          if (mu > 0) cap = MAX_GROWTH / mu;
        }
      }
    } else if (regime === SLEW_UP || regime === SLEW_DOWN) {
      const S = regime === SLEW_UP ? this.SR : -this.SRf;
      VO[0] = vo;
      VO[1] = S;
      if (this.twoD) {
        const w = this.w;
        VC[0] = vo - S / w;
        VC[1] = S;
        VC[2] = vc - vo + S / w;
        this.lam1 = -w;
        this.useE1 = true;
      }
    } else {
      const V = regime === RAIL_HIGH ? this.Voh : this.Vol;
      VO[0] = V;
      if (this.twoD) {
        VC[0] = V;
        VC[2] = vc - V;
        this.lam1 = -this.w;
        this.useE1 = true;
      }
    }
    // f_lin and vd as combinations of the same basis
    const F = this.F;
    const wp = this.wp;
    for (let i = 0; i < this.nb; i++) F[i] = wp * (this.A0 * (this.al * U[i] + this.be * VO[i] + this.ga * VC[i]) - VO[i]);
    F[0] += wpA0 * this.de;
    return cap;
  }

  // ---- main loop ---------------------------------------------------------------------------

  run(): void {
    const p = this.p;
    const T = p.duration;
    const ts = p.sampleTimes;
    const out = p.output;
    const rec = p.recorder;
    const levels = rec.levels;
    const G = this.G;
    const VO = this.VO;
    const VC = this.VC;
    const F = this.F;
    const U = this.U;
    let t = 0;
    let vo = p.vo0;
    let vc = p.vc0;
    let sample = 0;
    let regime = LINEAR;
    // Initial sides of the monitors
    for (let i = 0; i < 3; i++) this.sides[i] = vo >= levels[i] ? 1 : 0;
    {
      this.inputPiece(0);
      const f0 = this.fLin(this.uAt0(), vo, vc);
      const held = (vo >= this.Voh && f0 >= 0) || (vo <= this.Vol && f0 <= 0);
      rec.startupDirection = held || f0 === 0 ? 0 : f0 > 0 ? 1 : -1;
    }
    let guard = 0;
    const fastRail = !this.twoD && this.m === 0;
    while (t < T) {
      // Every piece starts in the regime the state calls for, never one carried over from the
      // exit that ended the last piece: an exit found already past at the start of a piece (a
      // rail left at an input step, a grazing rail entry) can land anywhere, e.g. in a slew.
      this.inputPiece(t);
      regime = this.select(vo, vc);
      if (fastRail && (regime === RAIL_HIGH || regime === RAIL_LOW)) {
        // Held at a rail (the bulk of a noisy comparator or Schmitt run): while the drive keeps
        // pushing into the rail and vd keeps its sign, a piece needs no root finding at all.
        const high = regime === RAIL_HIGH;
        const V = high ? this.Voh : this.Vol;
        const vdSide = this.sides[MONITOR_VD] === 1;
        const A0V = V / this.A0;
        let held = 0;
        const sig = p.signal;
        const kn = sig.noise;
        if (kn !== null && this.td === 0) {
          // Knot-stepping: between noise knots the input is linear, so checking the drive and
          // vd at each knot is the whole test. Breaks out (to the per-piece code below) at the
          // first knot that fails, at a breakpoint of the other components, or at the end.
          this.inputPiece(t); // validates the cache of the other components at t
          const dt = sig.noiseDt;
          const lastK = kn.length - 1;
          let k = Math.floor(t / dt);
          if ((k + 1) * dt <= t) k++;
          const pEnd = Math.min(T, sig.partsTo);
          const refT = sig.partsRefT;
          const refV = sig.partsRefV;
          const slope = sig.partsSlope;
          const al = this.al;
          const c0 = this.be * V + this.de;
          const trackVd = p.trackVd;
          while (k < lastK) {
            const tb = (k + 1) * dt;
            if (!(tb > t) || tb >= pEnd) break;
            const b = al * (refV + slope * (tb - refT) + kn[k + 1]) + c0;
            if (high ? b < A0V : b > A0V) break;
            if (trackVd && b >= 0 !== vdSide) break;
            while (sample < ts.length && ts[sample] <= tb) out[sample++] = V;
            held += tb - t;
            t = tb;
            k++;
            if ((++this.steps & 1023) === 0) {
              if (p.shouldCancel?.()) throw new SimCancelled();
              p.onProgress?.(t / T);
            }
          }
        }
        while (t < T) {
          const tb = this.pieceEnd(t, T);
          const h = tb - t;
          const a = this.al * U[0] + this.be * V + this.de;
          const b = a + this.al * U[1] * h;
          if (high ? a < A0V || b < A0V : a > A0V || b > A0V) break;
          if (p.trackVd && b >= 0 !== vdSide) break;
          while (sample < ts.length && ts[sample] <= tb) out[sample++] = V;
          held += h;
          t = tb;
          if ((++this.steps & 1023) === 0) {
            if (p.shouldCancel?.()) throw new SimCancelled();
            p.onProgress?.(t / T);
          }
        }
        rec.clippedTime += held;
        vo = V;
        if (t >= T) break;
      }
      const tb = Math.min(this.pieceEnd(t, T), this.m > 0 ? t + this.pieceCapSine : Infinity);
      if (this.steps === 0 && p.trackVd) {
        const vd0 = this.al * this.uAt0() + this.be * vo + this.ga * vc + this.de;
        this.sides[MONITOR_VD] = vd0 >= 0 ? 1 : 0;
      }
      const cap = this.setupRegime(regime, vo, vc);
      const h = Math.min(tb - t, cap);
      this.steps++;

      // Earliest regime exit
      this.tx = h;
      this.next = -1;
      switch (regime) {
        case LINEAR:
          for (let i = 0; i < this.nb; i++) G[i] = F[i];
          G[0] -= this.SR;
          this.consider(this.firstExit(G, this.tx, t), SLEW_UP);
          for (let i = 0; i < this.nb; i++) G[i] = -F[i];
          G[0] -= this.SRf;
          this.consider(this.firstExit(G, this.tx, t), SLEW_DOWN);
          for (let i = 0; i < this.nb; i++) G[i] = VO[i];
          G[0] -= this.Voh;
          this.consider(this.firstExit(G, this.tx, t), RAIL_HIGH);
          for (let i = 0; i < this.nb; i++) G[i] = -VO[i];
          G[0] += this.Vol;
          this.consider(this.firstExit(G, this.tx, t), RAIL_LOW);
          break;
        case SLEW_UP:
          for (let i = 0; i < this.nb; i++) G[i] = -F[i];
          G[0] += this.SR;
          this.consider(this.firstExit(G, this.tx, t), LINEAR);
          for (let i = 0; i < this.nb; i++) G[i] = VO[i];
          G[0] -= this.Voh;
          this.consider(this.firstExit(G, this.tx, t), RAIL_HIGH);
          break;
        case SLEW_DOWN:
          for (let i = 0; i < this.nb; i++) G[i] = F[i];
          G[0] += this.SRf;
          this.consider(this.firstExit(G, this.tx, t), LINEAR);
          for (let i = 0; i < this.nb; i++) G[i] = -VO[i];
          G[0] += this.Vol;
          this.consider(this.firstExit(G, this.tx, t), RAIL_LOW);
          break;
        case RAIL_HIGH:
          for (let i = 0; i < this.nb; i++) G[i] = -F[i];
          this.consider(this.firstExit(G, this.tx, t), LINEAR);
          break;
        case RAIL_LOW:
          for (let i = 0; i < this.nb; i++) G[i] = F[i];
          this.consider(this.firstExit(G, this.tx, t), LINEAR);
          break;
      }

      const tx = this.tx;
      const next = this.next;
      const tEndAbs = next < 0 && h === tb - t ? tb : t + tx;

      // Monitored crossings within (0, tx]
      if (regime !== RAIL_HIGH && regime !== RAIL_LOW) {
        for (let lv = 0; lv < 3; lv++) {
          for (let i = 0; i < this.nb; i++) G[i] = VO[i];
          G[0] -= levels[lv];
          this.monitor(G, lv, tx, t);
        }
      }
      if (p.trackVd) {
        for (let i = 0; i < this.nb; i++) G[i] = this.al * U[i] + this.be * VO[i] + this.ga * VC[i];
        G[0] += this.de;
        this.monitor(G, MONITOR_VD, tx, t);
      }
      if (rec.startupEnd === Infinity) this.startupCheck(regime, t);
      rec.flush();

      // Output samples inside the piece
      while (sample < ts.length && ts[sample] <= tEndAbs) {
        const v = this.valueAt(VO, ts[sample] - t);
        out[sample++] = v > this.Voh ? this.Voh : v < this.Vol ? this.Vol : v;
      }

      // Clipping time and slew (the power-on transient does not count towards the slew rate)
      if (regime === RAIL_HIGH || regime === RAIL_LOW) rec.clippedTime += tx;
      else if (t + tx > rec.startupEnd) {
        if (regime === SLEW_UP) rec.maxSlew = Math.max(rec.maxSlew, this.SR);
        else if (regime === SLEW_DOWN) rec.maxSlew = Math.max(rec.maxSlew, this.SRf);
        else rec.maxSlew = Math.max(rec.maxSlew, this.maxAbs(F, Math.max(0, rec.startupEnd - t), tx, t));
      }

      // Advance
      let voN = this.valueAt(VO, tx);
      const vcN = this.twoD ? this.valueAt(VC, tx) : 0;
      if (next === RAIL_HIGH || voN > this.Voh) voN = this.Voh;
      if (next === RAIL_LOW || voN < this.Vol) voN = this.Vol;
      if (regime === RAIL_HIGH) voN = this.Voh;
      if (regime === RAIL_LOW) voN = this.Vol;
      vo = voN;
      vc = vcN;
      if (next >= 0) {
        if (tEndAbs <= t) {
          if (++guard > 1000) throw new SimFailed(`the exact solver could not advance past t = ${t} s (regime chatter at one instant)`);
        } else guard = 0;
      }
      t = tEndAbs;
      if ((this.steps & 1023) === 0) {
        if (p.shouldCancel?.()) throw new SimCancelled();
        p.onProgress?.(t / T);
        if (this.steps > this.maxSteps)
          throw new SimFailed(`the exact solver reached its step limit (${this.maxSteps.toLocaleString("en")} pieces) at t = ${t.toPrecision(4)} s of ${T} s`);
      }
    }
    // Any sample left (rounding at the very end) takes the final state.
    while (sample < ts.length) out[sample++] = vo;
  }

  /** End the power-on transient when dvo/dt turns against its initial direction (see Recorder). */
  private startupCheck(regime: number, t0: number): void {
    const rec = this.p.recorder;
    const dir = rec.startupDirection;
    if (dir === 0 || regime === RAIL_HIGH || regime === RAIL_LOW) {
      rec.startupEnd = t0;
      return;
    }
    if (regime === SLEW_UP || regime === SLEW_DOWN) {
      if ((regime === SLEW_UP ? 1 : -1) !== dir) rec.startupEnd = t0;
      return;
    }
    const G = this.D; // scratch: −dir·F > 0 means moving back
    for (let i = 0; i < this.nb; i++) G[i] = -dir * this.F[i];
    const tau = this.firstExit(G, this.tx, t0);
    if (tau === tau) rec.startupEnd = t0 + tau;
  }

  /** max |c(τ)| over [0, tMax]: ends plus interior extrema located on the derivative. */
  private maxAbs(c: Float64Array, tMin: number, tMax: number, t0: number): number {
    let best = Math.max(Math.abs(this.valueAt(c, tMin)), Math.abs(this.valueAt(c, tMax)));
    if (this.smooth) {
      const e = this.extremum(c, tMax);
      if (e > tMin) best = Math.max(best, Math.abs(this.valueAt(c, e)));
      if (e !== -1) return best;
    }
    // Derivative coefficients, then scan for its sign changes.
    const D = this.D;
    D.fill(0);
    D[0] = c[1];
    if (this.cplx) {
      D[2] = this.lam1 * c[2] + this.nu * c[3];
      D[3] = this.lam1 * c[3] - this.nu * c[2];
    } else {
      D[2] = this.lam1 * c[2];
      D[3] = this.lam2 * c[3];
    }
    for (let j = 0; j < this.m; j++) {
      const om = this.omega[j];
      D[4 + 2 * j] = -om * c[5 + 2 * j];
      D[5 + 2 * j] = om * c[4 + 2 * j];
    }
    const chunk = Math.min(this.chunkFor(D, tMax), (tMax - tMin) / 4);
    let a = tMin;
    let da = this.valueAt(D, tMin);
    while (a < tMax) {
      const b = Math.min(tMax, a + chunk);
      const db = this.valueAt(D, b);
      if (db >= 0 !== da >= 0) {
        const r = this.bracket(D, a, b, da, db, t0);
        best = Math.max(best, Math.abs(this.valueAt(c, r)));
      }
      a = b;
      da = db;
    }
    return best;
  }
}
