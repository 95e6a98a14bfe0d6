// The closed-form basis of one piece and its evaluation.
//
// Inside a piece every quantity of the model (output, capacitor state, drive, vd) is a
// combination Σ c_i·b_i(τ) of the same basis, τ being the time since the piece started:
//   slot 0  1
//   slot 1  τ
//   slot 2  E1(τ) = e^{lambda1·τ}            or e^{mu·τ}·cos(nu·τ) for a complex pair
//   slot 3  E2(τ) = e^{lambda2·τ}            or e^{mu·τ}·sin(nu·τ)
//   slot 4+2j, 5+2j  sin(omega_j·τ), cos(omega_j·τ)   for each sine component j of the input
// A coefficient vector is a Float64Array of `size` entries in that order.

export const SLOT_ONE = 0;
export const SLOT_TAU = 1;
export const SLOT_E1 = 2;
export const SLOT_E2 = 3;
export const SLOT_SINES = 4;

export class Basis {
  readonly size: number;
  readonly sineCount: number;
  /** Values of the basis at the last evaluated τ. */
  readonly values: Float64Array;
  /** Growth rate of E1 (the real part mu for a complex pair) and of E2. */
  lambda1 = 0;
  lambda2 = 0;
  /** Angular frequency of a complex pair (complex = true). */
  nu = 0;
  complex = false;
  useE1 = false;
  useE2 = false;
  /** Evaluations of the basis, reported as solver work. */
  evaluations = 0;

  constructor(readonly omega: Float64Array) {
    this.sineCount = omega.length;
    this.size = SLOT_SINES + 2 * this.sineCount;
    this.values = new Float64Array(this.size);
  }

  /** No exponentials: the next regime sets what it uses. */
  clearExponentials(): void {
    this.complex = false;
    this.useE1 = false;
    this.useE2 = false;
  }

  setE1(lambda: number): void {
    this.lambda1 = lambda;
    this.useE1 = true;
  }

  setRealPair(lambda1: number, lambda2: number): void {
    this.lambda1 = lambda1;
    this.lambda2 = lambda2;
    this.useE1 = true;
    this.useE2 = true;
    this.complex = false;
  }

  setComplexPair(mu: number, nu: number): void {
    this.lambda1 = mu;
    this.nu = nu;
    this.useE1 = true;
    this.useE2 = true;
    this.complex = true;
  }

  /** No sines and no complex pair: a combination has at most one analytic interior extremum. */
  get smooth(): boolean {
    return this.sineCount === 0 && !this.complex;
  }

  evaluate(tau: number): void {
    const b = this.values;
    this.evaluations++;
    b[SLOT_ONE] = 1;
    b[SLOT_TAU] = tau;
    if (this.complex) {
      const g = Math.exp(this.lambda1 * tau);
      b[SLOT_E1] = g * Math.cos(this.nu * tau);
      b[SLOT_E2] = g * Math.sin(this.nu * tau);
    } else {
      b[SLOT_E1] = this.useE1 ? Math.exp(this.lambda1 * tau) : 0;
      b[SLOT_E2] = this.useE2 ? Math.exp(this.lambda2 * tau) : 0;
    }
    for (let j = 0; j < this.sineCount; j++) {
      const x = this.omega[j] * tau;
      b[SLOT_SINES + 2 * j] = Math.sin(x);
      b[SLOT_SINES + 1 + 2 * j] = Math.cos(x);
    }
  }

  /** Σ c_i·b_i at the last evaluated τ. */
  dot(c: Float64Array): number {
    const b = this.values;
    let s = c[0] + c[1] * b[1] + c[2] * b[2] + c[3] * b[3];
    for (let i = SLOT_SINES; i < this.size; i++) s += c[i] * b[i];
    return s;
  }

  valueAt(c: Float64Array, tau: number): number {
    if (!this.useE1 && !this.useE2 && this.sineCount === 0) {
      this.evaluations++;
      return c[0] + c[1] * tau;
    }
    this.evaluate(tau);
    return this.dot(c);
  }

  /** Value at τ = 0 without evaluating anything. */
  valueAtStart(c: Float64Array): number {
    let s = c[SLOT_ONE];
    if (this.useE1) s += c[SLOT_E1];
    if (this.useE2 && !this.complex) s += c[SLOT_E2];
    for (let j = 0; j < this.sineCount; j++) s += c[SLOT_SINES + 1 + 2 * j];
    return s;
  }

  /** Σ |c_i·b_i(0)|: the magnitude that rounds into valueAtStart. */
  magnitudeAtStart(c: Float64Array): number {
    let s = Math.abs(c[SLOT_ONE]);
    if (this.useE1) s += Math.abs(c[SLOT_E1]);
    if (this.useE2 && !this.complex) s += Math.abs(c[SLOT_E2]);
    for (let j = 0; j < this.sineCount; j++) s += Math.abs(c[SLOT_SINES + 1 + 2 * j]);
    return s;
  }

  /** dc/dτ at τ = 0. */
  slopeAtStart(c: Float64Array): number {
    let s = c[SLOT_TAU];
    if (this.complex) s += this.lambda1 * c[SLOT_E1] + this.nu * c[SLOT_E2];
    else {
      if (this.useE1) s += this.lambda1 * c[SLOT_E1];
      if (this.useE2) s += this.lambda2 * c[SLOT_E2];
    }
    for (let j = 0; j < this.sineCount; j++) s += this.omega[j] * c[SLOT_SINES + 2 * j];
    return s;
  }

  /** Coefficients of dc/dτ into `out` (same basis). */
  derivative(c: Float64Array, out: Float64Array): void {
    out.fill(0);
    out[SLOT_ONE] = c[SLOT_TAU];
    if (this.complex) {
      out[SLOT_E1] = this.lambda1 * c[SLOT_E1] + this.nu * c[SLOT_E2];
      out[SLOT_E2] = this.lambda1 * c[SLOT_E2] - this.nu * c[SLOT_E1];
    } else {
      out[SLOT_E1] = this.useE1 ? this.lambda1 * c[SLOT_E1] : 0;
      out[SLOT_E2] = this.useE2 ? this.lambda2 * c[SLOT_E2] : 0;
    }
    for (let j = 0; j < this.sineCount; j++) {
      const w = this.omega[j];
      out[SLOT_SINES + 2 * j] = -w * c[SLOT_SINES + 1 + 2 * j];
      out[SLOT_SINES + 1 + 2 * j] = w * c[SLOT_SINES + 2 * j];
    }
  }
}

/**
 * Particular + homogeneous solution of the scalar equation y' = k·y + f(τ), y(0) = y0, where the
 * forcing f is a combination of 1, τ and the sines (coefficients in `force`): writes the
 * solution's coefficients into `out` with e^{kτ} in slot E1 (the caller sets basis E1 = k).
 * k must be nonzero.
 */
export function solveScalar(k: number, force: Float64Array, y0: number, omega: Float64Array, out: Float64Array): void {
  const f0 = force[SLOT_ONE];
  const f1 = force[SLOT_TAU];
  const p1 = -f1 / k;
  const p0 = (p1 - f0) / k;
  out[SLOT_ONE] = p0;
  out[SLOT_TAU] = p1;
  out[SLOT_E2] = 0;
  let atStart = p0;
  for (let j = 0; j < omega.length; j++) {
    const w = omega[j];
    const fs = force[SLOT_SINES + 2 * j];
    const fc = force[SLOT_SINES + 1 + 2 * j];
    const den = k * k + w * w;
    const ps = (-k * fs + w * fc) / den; // sin coefficient
    const pc = (-k * fc - w * fs) / den; // cos coefficient
    out[SLOT_SINES + 2 * j] = ps;
    out[SLOT_SINES + 1 + 2 * j] = pc;
    atStart += pc;
  }
  out[SLOT_E1] = y0 - atStart;
}
