// The rail-hold fast path: while the output sits at a limit (the bulk of a noisy comparator or
// Schmitt run) a piece needs no closed form at all. The output is held while the drive keeps
// pushing into the rail, i.e. vd stays on the rail's side of V/A0, and (when tracked) vd keeps
// its sign. Over a piece vd = alpha·u + beta·V + delta is affine in the input except for the
// sines; a sine of amplitude A and angular frequency ω departs from its tangent by at most
// A·ω²·h²/2 over a piece of length h (and from its chord by A·ω²·h²/8), so checking the affine
// part at both ends with that margin dismisses a piece in one evaluation.
// Stages with a capacitor state never take this path (their rail pieces still move x).
import { MONITOR_VD } from "../measure";
import { SLOT_ONE, SLOT_SINES, SLOT_TAU } from "./basis";
import type { ExactSolver } from "./solver";

/** Knots between re-seeding the rotated sine phases with Math.sin/cos. */
const RESEED = 4096;

/** Both ends of the affine vd on the held side of the rail (and of 0 when tracked), with `margin` to spare. */
function holds(
  a: number,
  b: number,
  margin: number,
  high: boolean,
  threshold: number,
  trackVd: boolean,
  vdSide: boolean,
): boolean {
  const lo = Math.min(a, b) - margin;
  const hi = Math.max(a, b) + margin;
  if (high ? lo < threshold : hi > threshold) return false;
  return !trackVd || (vdSide ? lo >= 0 : hi < 0);
}

/** Slots of ExactSolver.holdNumbers: stepKnots's numbers (time, end, vd = alpha·u + c0, margin, threshold). */
export const HOLD_T = 0;
export const HOLD_END = 1;
export const HOLD_ALPHA = 2;
export const HOLD_C0 = 3;
export const HOLD_MARGIN = 4;
export const HOLD_THRESHOLD = 5;
export const HOLD_SLOTS = 6;

/** Knots per block of the knot-stepping loop (the sines are bounded over a block). */
export const KNOT_BLOCK = 32;

/**
 * The knot-stepping loop of holdAtRail: from knot index k (t at or after knot k, before knot
 * k + 1) steps knot to knot while vd at the next knot holds the rail, and returns the index of
 * the last knot reached (k when none). The sines are evaluated once per block of KNOT_BLOCK
 * knots: within a block they move by at most Σ|A_j·ω_j| times the time since the block's start,
 * so a knot whose vd clears the limit by that much more holds whatever the sines do, and only a
 * knot near the limit gets its sines (from the block's phases by one rotation each).
 * A function of its own, on typed arrays and numbers only, so its optimised code is not thrown
 * away with the rarely taken paths of holdAtRail (which left this loop running unoptimised,
 * boxing a number per knot: garbage collections).
 */
function stepKnots(s: ExactSolver, knots: Float64Array, k: number, high: boolean, vdSide: boolean): number {
  // The numbers come in a typed array (HOLD_* slots), not as arguments: V8 boxes each double
  // argument of a call it does not inline into a new heap number.
  const h = s.holdNumbers;
  const t = h[HOLD_T];
  const end = h[HOLD_END];
  const alpha = h[HOLD_ALPHA];
  const c0 = h[HOLD_C0];
  const margin = h[HOLD_MARGIN];
  const threshold = h[HOLD_THRESHOLD];
  const sig = s.p.signal;
  const trackVd = s.p.trackVd;
  const dt = sig.noiseDt;
  // The loop carries integers only (a number carried from one pass to the next may be kept
  // boxed by the code that enters a running loop): a knot's time is (k + 1)·dt.
  const lastK = Math.min(knots.length - 1, Math.ceil(end / dt) + 1);
  if (!((k + 1) * dt > t)) return k;
  const refT = sig.partsRefT;
  const refV = sig.partsRefV;
  const slope = sig.partsSlope;
  const omega = sig.sineOmega;
  const phase0 = sig.sinePhase;
  const amp = sig.sineAmp;
  const m = amp.length;
  const sn = s.sineSin;
  const cs = s.sineCos;
  const offSin = s.stepSin;
  const offCos = s.stepCos;
  let sineRate = 0;
  for (let j = 0; j < m; j++) sineRate += Math.abs(amp[j] * omega[j]);
  // how far vd can move with the sines over a block, beyond the knots' own margin
  const widened = margin + Math.abs(alpha) * sineRate * (KNOT_BLOCK - 1) * dt;
  const steps0 = s.steps;
  const k0 = k;
  let blocks = RESEED; // blocks since the phases were last taken from Math.sin/cos
  while (k < lastK) {
    // a block starts at knot k + 1: its phases, and the sines' sum there
    let s0 = 0;
    if (m > 0) {
      if (blocks * KNOT_BLOCK >= RESEED) {
        const tb = (k + 1) * dt;
        for (let j = 0; j < m; j++) {
          const phase = omega[j] * tb + phase0[j];
          sn[j] = Math.sin(phase);
          cs[j] = Math.cos(phase);
        }
        blocks = 0;
      } else {
        const o = KNOT_BLOCK * m;
        for (let j = 0; j < m; j++) {
          const a = sn[j];
          const b = cs[j];
          sn[j] = a * offCos[o + j] + b * offSin[o + j];
          cs[j] = b * offCos[o + j] - a * offSin[o + j];
        }
      }
      blocks++;
      for (let j = 0; j < m; j++) s0 += amp[j] * sn[j];
    }
    const kBlock = k;
    let failed = false;
    for (let i = 0; i < KNOT_BLOCK && k < lastK; i++) {
      const tb = (k + 1) * dt;
      if (tb >= end) {
        failed = true;
        break;
      }
      const affine = refV + slope * (tb - refT) + knots[k + 1];
      const loose = alpha * (affine + s0) + c0;
      if (!holds(loose, loose, widened, high, threshold, trackVd, vdSide)) {
        // near the limit: the sines at this knot, rotated from the block's start
        let sines = 0;
        const o = (k - kBlock) * m;
        for (let j = 0; j < m; j++) sines += amp[j] * (sn[j] * offCos[o + j] + cs[j] * offSin[o + j]);
        const b = alpha * (affine + sines) + c0;
        if (!holds(b, b, margin, high, threshold, trackVd, vdSide)) {
          failed = true;
          break;
        }
      }
      k++;
      if (((k - k0) & 1023) === 0) {
        s.steps = steps0 + (k - k0);
        s.checkIn(k * dt);
      }
    }
    if (failed) break;
    // the next block starts KNOT_BLOCK knots on; a block cut short by lastK ends the loop
    if (k - kBlock < KNOT_BLOCK) break;
  }
  s.steps = steps0;
  return k;
}

/**
 * Hold the output at the rail from s.t; leaves the time reached in s.t (the caller goes on from
 * there). The time comes and goes through the field, and the loop's time starts from it
 * through unary plus: a loop variable first set from an argument may stay a tagged value in
 * V8's optimised code, and one that the function returns is boxed on every pass of the loop.
 */
export function holdAtRail(s: ExactSolver, high: boolean): void {
  let t = +s.t;
  const p = s.p;
  const m = s.model;
  const T = p.duration;
  const V = high ? p.rails.high : p.rails.low;
  const threshold = V / p.openLoopGain;
  const vdSide = s.sides[MONITOR_VD] === 1;
  const trackVd = p.trackVd;
  const alpha = m.alpha;
  const c0 = m.beta * V + m.delta;
  const ts = p.sampleTimes;
  const out = p.output;
  const U = m.U;
  const omega = m.basis.omega;
  const sineCount = m.basis.sineCount;
  const curvature = Math.abs(alpha) * s.sineCurvature; // |alpha|·Σ A_j·ω_j²
  let held = 0;
  const sig = p.signal;
  const knots = sig.noise;
  const stepping = knots !== null && s.delay === 0;
  while (t < T) {
    if (stepping) {
      // Knot-stepping: between noise knots the rest of the input is affine (plus the sines),
      // so checking vd at each knot is the whole test. Stops at the first knot that fails, at a
      // breakpoint of the other components, or at the end.
      s.t = t;
      s.pieceEnd(); // validates the cache of the other components at t
      const dt = sig.noiseDt;
      const margin = (curvature * dt * dt) / 8;
      const v0 = alpha * m.inputAtStart() + c0;
      if (holds(v0, v0, margin, high, threshold, trackVd, vdSide)) {
        let k = Math.floor(t / dt);
        if ((k + 1) * dt <= t) k++;
        const h = s.holdNumbers;
        h[HOLD_T] = t;
        h[HOLD_END] = Math.min(T, sig.partsTo);
        h[HOLD_ALPHA] = alpha;
        h[HOLD_C0] = c0;
        h[HOLD_MARGIN] = margin;
        h[HOLD_THRESHOLD] = threshold;
        const kEnd = stepKnots(s, knots, k, high, vdSide);
        if (kEnd > k) {
          const reached = kEnd * dt;
          s.steps += kEnd - k;
          held += reached - t;
          t = reached;
          while (s.sample < ts.length && ts[s.sample] <= t) out[s.sample++] = V;
        }
      }
      if (!(t < T)) break;
    }
    // One piece by its own check: the whole hold without noise; with noise the piece across a
    // breakpoint of the other components, after which the knot stepping resumes (a knot that
    // failed there fails this stricter check too, and the hold ends).
    s.t = t;
    s.pieceEnd();
    let tb = s.tb;
    if (sineCount > 0) tb = Math.min(tb, t + s.scan.chunkSine);
    const h = tb - t;
    let u0 = U[SLOT_ONE];
    let u1 = U[SLOT_TAU];
    for (let j = 0; j < sineCount; j++) {
      u0 += U[SLOT_SINES + 1 + 2 * j];
      u1 += omega[j] * U[SLOT_SINES + 2 * j];
    }
    const a = alpha * u0 + c0;
    const b = alpha * (u0 + u1 * h) + c0;
    if (!holds(a, b, (curvature * h * h) / 2, high, threshold, trackVd, vdSide)) break;
    while (s.sample < ts.length && ts[s.sample] <= tb) out[s.sample++] = V;
    held += h;
    t = tb;
    if ((++s.steps & 1023) === 0) s.checkIn(t);
  }
  p.recorder.clippedTime += held;
  s.t = t;
}
