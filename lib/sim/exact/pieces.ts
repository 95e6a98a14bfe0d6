// Closed form of one piece in each regime. The state is the output vo and, when the stage has
// one, a capacitor voltage x (the oscillator's timing capacitor, a filter node):
//   dx/dt = kappaU·u + kappaX·x + kappaO·vo + kappa0
//   vd    = alpha·u + beta·vo + gamma·x + delta
// The input u over a piece is affine plus sines (coefficients in U). Every quantity is written
// as a coefficient vector of the piece's Basis: VO (output), X (capacitor), VD and DRIVE
// (ωp·(A0·vd − vo), the linear-regime rate that the regime conditions compare).
import type { Network } from "../network";
import { Basis, SLOT_E1, SLOT_E2, SLOT_ONE, SLOT_SINES, SLOT_TAU, solveScalar } from "./basis";
import { LINEAR, RAIL_HIGH, SLEW_DOWN, SLEW_UP, type Regime } from "./regimes";

/** Largest growth exponent allowed inside one piece (e^40 ≈ 2e17 keeps coefficients finite). */
const MAX_GROWTH = 40;

export interface ModelConstants {
  openLoopGain: number;
  gainBandwidth: number;
  slewRate: number;
  slewRateFall: number;
  high: number;
  low: number;
}

export class PieceModel {
  readonly basis: Basis;
  readonly size: number;
  /** ωp = 2π·GBW/A0 and ωp·A0. */
  readonly omegaP: number;
  readonly omegaPA0: number;
  readonly alpha: number;
  readonly beta: number;
  readonly gamma: number;
  readonly delta: number;
  readonly hasState: boolean;
  readonly kappaU: number;
  readonly kappaX: number;
  readonly kappaO: number;
  readonly kappa0: number;
  /** The stage sees the input (directly or through the capacitor state). */
  readonly inputConnected: boolean;
  /** Open-drain output whose high level moves with u or x (network.ts HighLevel). */
  readonly variableHigh: boolean;
  readonly h0: number;
  readonly hU: number;
  readonly hX: number;

  readonly U: Float64Array;
  readonly VO: Float64Array;
  readonly X: Float64Array;
  readonly VD: Float64Array;
  readonly DRIVE: Float64Array;
  /** The high level h0 + hU·u + hX·x over the piece (variableHigh only). */
  readonly HIGH: Float64Array;
  private readonly force: Float64Array;

  constructor(
    net: Network,
    private readonly k: ModelConstants,
    sineOmega: Float64Array,
  ) {
    this.omegaP = (2 * Math.PI * k.gainBandwidth) / k.openLoopGain;
    this.omegaPA0 = 2 * Math.PI * k.gainBandwidth;
    this.alpha = net.alpha;
    this.beta = net.beta;
    this.gamma = net.gamma;
    this.delta = net.delta;
    this.hasState = net.state !== null;
    this.kappaU = net.state?.kappaU ?? 0;
    this.kappaX = net.state?.kappaX ?? 0;
    this.kappaO = net.state?.kappaO ?? 0;
    this.kappa0 = net.state?.kappa0 ?? 0;
    this.inputConnected = this.alpha !== 0 || this.kappaU !== 0;
    const high = net.high ?? null;
    this.variableHigh = high !== null && (high.hU !== 0 || high.hX !== 0);
    this.h0 = high?.h0 ?? k.high;
    this.hU = high?.hU ?? 0;
    this.hX = high?.hX ?? 0;
    // A stage that ignores the input (the oscillator) drops the sines from its basis.
    this.basis = new Basis(this.inputConnected ? sineOmega : new Float64Array(0));
    this.size = this.basis.size;
    const n = this.size;
    this.U = new Float64Array(n);
    this.VO = new Float64Array(n);
    this.X = new Float64Array(n);
    this.VD = new Float64Array(n);
    this.DRIVE = new Float64Array(n);
    this.HIGH = new Float64Array(n);
    this.force = new Float64Array(n);
  }

  /** u at τ = 0 from U. */
  inputAtStart(): number {
    const U = this.U;
    let u = U[SLOT_ONE];
    for (let j = 0; j < this.basis.sineCount; j++) u += U[SLOT_SINES + 1 + 2 * j];
    return u;
  }

  /** The high level for a state (the constant Voh unless variableHigh). */
  highAt(u: number, x: number): number {
    return this.variableHigh ? this.h0 + this.hU * u + this.hX * x : this.k.high;
  }

  vdOf(u: number, vo: number, x: number): number {
    return this.alpha * u + this.beta * vo + this.gamma * x + this.delta;
  }

  /** The linear-regime rate ωp·(A0·vd − vo) for a state. */
  driveOf(u: number, vo: number, x: number): number {
    return this.omegaP * (this.k.openLoopGain * this.vdOf(u, vo, x) - vo);
  }

  /**
   * The state a piece starts from (set before setup) and the longest piece allowed by growth
   * (set by setup; Infinity when decaying). Fields, not arguments and a result: V8 boxes a
   * double that crosses a call it does not inline into a new heap number, once per piece.
   */
  startVo = 0;
  startX = 0;
  cap = Infinity;

  /**
   * Fill VO, X, VD and DRIVE for a piece in `regime` starting at (startVo, startX), set the
   * basis exponents and `cap`.
   */
  setup(regime: Regime): void {
    const vo = this.startVo;
    const x = this.startX;
    const { VO, X, U, basis } = this;
    const n = this.size;
    VO.fill(0);
    X.fill(0);
    basis.clearExponentials();
    let cap = Infinity;
    if (regime === LINEAR) {
      if (this.hasState) cap = this.setupLinearPair(vo, x);
      else {
        let k = this.omegaP * (this.k.openLoopGain * this.beta - 1);
        // Exactly A0·β = 1 makes the pole vanish: nudge it (a degenerate design, not physical).
        if (Math.abs(k) < 1e-9 * this.omegaP) k = -1e-9 * this.omegaP;
        const f = this.force;
        for (let i = 0; i < n; i++) f[i] = this.omegaPA0 * this.alpha * U[i];
        f[SLOT_ONE] += this.omegaPA0 * this.delta;
        solveScalar(k, f, vo, basis.omega, VO);
        basis.setE1(k);
        if (k > 0) cap = MAX_GROWTH / k;
      }
    } else if (regime === RAIL_HIGH && this.variableHigh) {
      // Open drain, transistor off: vo = h0 + hU·u + hX·x. With a state,
      // x' = (kappaU + kappaO·hU)·u + (kappaX + kappaO·hX)·x + kappaO·h0 + kappa0.
      if (this.hasState) {
        const rate = this.kappaX + this.kappaO * this.hX;
        const f = this.force;
        const kU = this.kappaU + this.kappaO * this.hU;
        for (let i = 0; i < n; i++) f[i] = kU * U[i];
        f[SLOT_ONE] += this.kappaO * this.h0 + this.kappa0;
        solveScalar(rate, f, x, basis.omega, X);
        basis.setE1(rate);
        if (rate > 0) cap = MAX_GROWTH / rate;
      }
      for (let i = 0; i < n; i++) VO[i] = this.hU * U[i] + this.hX * X[i];
      VO[SLOT_ONE] += this.h0;
      this.combine();
      // Held while the op-amp pushes the output up faster than the level moves: the drive is
      // compared with dH/dτ (0 for a push-pull rail), so entering from linear (d(vo − H)/dτ > 0)
      // and staying are the same inequality.
      const D = this.DRIVE;
      const H = this.HIGH;
      const b = this.basis;
      D[SLOT_ONE] -= H[SLOT_TAU];
      if (b.useE1) D[SLOT_E1] -= b.lambda1 * H[SLOT_E1];
      for (let j = 0; j < b.sineCount; j++) {
        const w = b.omega[j];
        D[SLOT_SINES + 2 * j] += w * H[SLOT_SINES + 1 + 2 * j];
        D[SLOT_SINES + 1 + 2 * j] -= w * H[SLOT_SINES + 2 * j];
      }
      this.cap = cap;
      return;
    } else {
      // The output is given: vo + S·τ while slewing, the limit at a rail.
      if (regime === SLEW_UP || regime === SLEW_DOWN) {
        VO[SLOT_ONE] = vo;
        VO[SLOT_TAU] = regime === SLEW_UP ? this.k.slewRate : -this.k.slewRateFall;
      } else VO[SLOT_ONE] = regime === RAIL_HIGH ? this.k.high : this.k.low;
      if (this.hasState) {
        // x' = kappaX·x + kappaU·u + kappaO·vo(τ) + kappa0: one exponential e^{kappaX·τ}.
        const f = this.force;
        for (let i = 0; i < n; i++) f[i] = this.kappaU * U[i];
        f[SLOT_ONE] += this.kappaO * VO[SLOT_ONE] + this.kappa0;
        f[SLOT_TAU] += this.kappaO * VO[SLOT_TAU];
        solveScalar(this.kappaX, f, x, basis.omega, X);
        basis.setE1(this.kappaX);
        if (this.kappaX > 0) cap = MAX_GROWTH / this.kappaX;
      }
    }
    this.combine();
    this.cap = cap;
  }

  /** VD and DRIVE from U, VO and X. */
  private combine(): void {
    const { U, VO, X, VD, DRIVE } = this;
    const A0 = this.k.openLoopGain;
    for (let i = 0; i < this.size; i++) {
      VD[i] = this.alpha * U[i] + this.beta * VO[i] + this.gamma * X[i];
    }
    VD[SLOT_ONE] += this.delta;
    for (let i = 0; i < this.size; i++) DRIVE[i] = this.omegaP * (A0 * VD[i] - VO[i]);
    if (this.variableHigh) {
      const H = this.HIGH;
      for (let i = 0; i < this.size; i++) H[i] = this.hU * U[i] + this.hX * X[i];
      H[SLOT_ONE] += this.h0;
    }
  }

  /**
   * Linear regime with a capacitor: y = [vo, x], y' = M·y + b(τ) with
   *   M = [[k, g], [kappaO, kappaX]],  k = ωp·(A0·β − 1), g = ωp·A0·γ,
   *   b = [ωp·A0·(α·u + δ), kappaU·u + kappa0].
   * Particular solution for the affine and sine parts of b, plus the homogeneous part on the
   * eigenvalues of M (a real pair or a complex pair).
   */
  private setupLinearPair(vo: number, x: number): number {
    const { VO, X, U, basis } = this;
    const k = this.omegaP * (this.k.openLoopGain * this.beta - 1);
    const g = this.omegaPA0 * this.gamma;
    const kO = this.kappaO;
    const kX = this.kappaX;
    const wA = this.omegaPA0 * this.alpha;
    let det = k * kX - g * kO;
    const detScale = 1e-12 * (Math.abs(k * kX) + Math.abs(g * kO));
    if (Math.abs(det) < detScale) det = detScale; // singular M: a degenerate design, nudged
    const tr = k + kX;
    // Affine part: M·p1 + b1 = 0, M·p0 + b0 = p1 (M⁻¹ = [[kX, −g], [−kO, k]] / det).
    const b0v = wA * U[SLOT_ONE] + this.omegaPA0 * this.delta;
    const b0x = this.kappaU * U[SLOT_ONE] + this.kappa0;
    const b1v = wA * U[SLOT_TAU];
    const b1x = this.kappaU * U[SLOT_TAU];
    const p1v = -(kX * b1v - g * b1x) / det;
    const p1x = -(-kO * b1v + k * b1x) / det;
    const rv = p1v - b0v;
    const rx = p1x - b0x;
    const p0v = (kX * rv - g * rx) / det;
    const p0x = (-kO * rv + k * rx) / det;
    VO[SLOT_ONE] = p0v;
    VO[SLOT_TAU] = p1v;
    X[SLOT_ONE] = p0x;
    X[SLOT_TAU] = p1x;
    let startV = p0v;
    let startX = p0x;
    // Sines: (iω·I − M)·Z = c − i·s for forcing s·sin + c·cos; then cos coef = Re Z, sin coef = −Im Z.
    for (let j = 0; j < basis.sineCount; j++) {
      const w = basis.omega[j];
      const sv = wA * U[SLOT_SINES + 2 * j];
      const cv = wA * U[SLOT_SINES + 1 + 2 * j];
      const sx = this.kappaU * U[SLOT_SINES + 2 * j];
      const cx = this.kappaU * U[SLOT_SINES + 1 + 2 * j];
      // det(iω − M) = (det − ω²) − i·ω·tr
      const dRe = det - w * w;
      const dIm = -w * tr;
      const dd = dRe * dRe + dIm * dIm;
      // adj(iω − M) = [[iω − kX, g], [kO, iω − k]] applied to r = (cv − i·sv, cx − i·sx)
      const zvRe = -kX * cv + w * sv + g * cx;
      const zvIm = w * cv + kX * sv - g * sx;
      const zxRe = kO * cv - k * cx + w * sx;
      const zxIm = -kO * sv + w * cx + k * sx;
      // divide by det(iω − M)
      const vRe = (zvRe * dRe + zvIm * dIm) / dd;
      const vIm = (zvIm * dRe - zvRe * dIm) / dd;
      const xRe = (zxRe * dRe + zxIm * dIm) / dd;
      const xIm = (zxIm * dRe - zxRe * dIm) / dd;
      VO[SLOT_SINES + 2 * j] = -vIm;
      VO[SLOT_SINES + 1 + 2 * j] = vRe;
      X[SLOT_SINES + 2 * j] = -xIm;
      X[SLOT_SINES + 1 + 2 * j] = xRe;
      startV += vRe;
      startX += xRe;
    }
    const d0 = vo - startV;
    const d1 = x - startX;
    const disc = 0.25 * tr * tr - det;
    let cap = Infinity;
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
      // Component along l1: (M − l2·I)·d / (l1 − l2); the rest along l2.
      const dl = l1 - l2;
      const a0 = ((k - l2) * d0 + g * d1) / dl;
      const a1 = (kO * d0 + (kX - l2) * d1) / dl;
      VO[SLOT_E1] = a0;
      X[SLOT_E1] = a1;
      VO[SLOT_E2] = d0 - a0;
      X[SLOT_E2] = d1 - a1;
      basis.setRealPair(l1, l2);
      const grow = Math.max(l1, l2);
      if (grow > 0) cap = MAX_GROWTH / grow;
    } else {
      // e^{mu·τ}·(d·cos ντ + (M − mu·I)·d/ν·sin ντ)
      const mu = 0.5 * tr;
      const nu = Math.sqrt(Math.max(-disc, 1e-300));
      VO[SLOT_E1] = d0;
      X[SLOT_E1] = d1;
      VO[SLOT_E2] = ((k - mu) * d0 + g * d1) / nu;
      X[SLOT_E2] = (kO * d0 + (kX - mu) * d1) / nu;
      basis.setComplexPair(mu, nu);
      if (mu > 0) cap = MAX_GROWTH / mu;
    }
    return cap;
  }
}
