// Input signal of a scenario: the sum of its waveform components plus seeded noise.
// Everything except sines is piecewise linear between breakpoints (noise knots, pwl/capture
// points, pulse/ramp corners, triangle vertices); the solver asks for the affine piece around a
// time and for the next breakpoint, and handles the sines in closed form.
//
// Waveform conventions (lib/schemas/README.md § Input signal): sine and triangle equal `offset` at t = 0 and rise first,
// `phase` (degrees) shifts both; ramp holds `from` before `start` and `to` after
// `start + duration`; pulse starts low and begins its rise at `delay`; pwl and capture
// interpolate linearly and hold their end values. Values are right-continuous at jumps.
// Pulse duty: the high part runs from the start of the rise to the start of the fall and lasts
// duty·period (so with rise = fall the duty is also the share of time above half amplitude).
import type { InputComponent, Scenario } from "@/lib/schemas/scenario";
import { noiseInterval, noiseKnots, releaseKnots } from "./noise";

type Compiled =
  | { kind: "const"; level: number }
  | { kind: "triangle"; amplitude: number; frequency: number; shift: number; offset: number }
  | { kind: "ramp"; from: number; to: number; start: number; end: number }
  | {
      kind: "pulse";
      low: number;
      high: number;
      period: number;
      rise: number;
      fallStart: number;
      fallEnd: number;
      delay: number;
    }
  | { kind: "table"; times: Float64Array; values: Float64Array };

function compile(c: InputComponent): Compiled {
  switch (c.kind) {
    case "dc":
      return { kind: "const", level: c.level };
    case "sine":
      // The sine itself is kept apart (closed form); only its offset is piecewise constant.
      return { kind: "const", level: c.offset ?? 0 };
    case "triangle":
      return {
        kind: "triangle",
        amplitude: c.amplitude,
        frequency: c.frequency,
        shift: (c.phase ?? 0) / 360,
        offset: c.offset ?? 0,
      };
    case "ramp":
      return { kind: "ramp", from: c.from, to: c.to, start: c.start, end: c.start + c.duration };
    case "pulse": {
      const rise = c.rise ?? 0;
      const fall = c.fall ?? 0;
      const fallStart = Math.min(Math.max(rise, c.duty * c.period), c.period - fall);
      return {
        kind: "pulse",
        low: c.low,
        high: c.high,
        period: c.period,
        rise,
        fallStart,
        fallEnd: fallStart + fall,
        delay: c.delay ?? 0,
      };
    }
    case "pwl":
    case "capture": {
      const pts = c.kind === "pwl" ? c.points : c.samples;
      const times = new Float64Array(pts.length);
      const values = new Float64Array(pts.length);
      for (let i = 0; i < pts.length; i++) {
        times[i] = pts[i][0];
        values[i] = pts[i][1];
      }
      return { kind: "table", times, values };
    }
  }
}

/** Index of the last table time ≤ t (−1 when t is before the first). */
function lastAtOrBefore(times: Float64Array, t: number): number {
  let lo = 0;
  let hi = times.length; // answer in [lo-1, hi-1]
  while (lo < hi) {
    const mid = (lo + hi) >>> 1;
    if (times[mid] <= t) lo = mid + 1;
    else hi = mid;
  }
  return lo - 1;
}

export class InputSignal {
  private readonly parts: Compiled[];
  /** Sine components: amplitude·sin(omega·t + phase). */
  readonly sineAmp: Float64Array;
  readonly sineOmega: Float64Array;
  readonly sinePhase: Float64Array;
  readonly noise: Float64Array | null;
  readonly noiseDt: number;
  /** Longest period among the periodic components (sine, triangle, pulse); null if none. */
  readonly longestPeriod: number | null;

  /** Set by `affineAt`: value and slope of the piecewise-linear part. */
  value = 0;
  slope = 0;

  /**
   * `reuseNoise`: fill a knot buffer an earlier run released (noise.ts), for a caller that
   * calls `release()` once it is done with this signal.
   */
  constructor(scenario: Scenario, duration: number, reuseNoise = false) {
    const comps = scenario.input.components;
    this.parts = comps.map(compile);
    const sines = comps.filter((c) => c.kind === "sine");
    this.sineAmp = Float64Array.from(sines, (s) => s.amplitude);
    this.sineOmega = Float64Array.from(sines, (s) => 2 * Math.PI * s.frequency);
    this.sinePhase = Float64Array.from(sines, (s) => ((s.phase ?? 0) * Math.PI) / 180);
    let longest: number | null = null;
    for (const c of comps) {
      const p = c.kind === "sine" || c.kind === "triangle" ? 1 / c.frequency : c.kind === "pulse" ? c.period : null;
      if (p !== null && (longest === null || p > longest)) longest = p;
    }
    this.longestPeriod = longest;
    const noise = scenario.input.noise;
    if (noise && noise.rms > 0) {
      this.noise = noiseKnots(noise, duration, reuseNoise);
      this.noiseDt = noiseInterval(noise);
    } else {
      this.noise = null;
      this.noiseDt = Infinity;
    }
  }

  /** Hand the noise knots back for the next run; this signal must not be read afterwards. */
  release(): void {
    if (this.noise !== null) releaseKnots(this.noise);
  }

  // Cache of the non-noise part: affine on [partsFrom, partsTo) through (partsRefT, partsRefV).
  // Read by the solver's knot-stepping loop; written only by `piece`.
  partsFrom = NaN;
  partsTo = -Infinity;
  partsRefT = 0;
  partsRefV = 0;
  partsSlope = 0;
  /** Set by `piece`: affine input (value at t, slope) valid up to pieceEnd. */
  pieceValue = 0;
  pieceSlope = 0;
  pieceEnd = Infinity;

  /**
   * The affine piece of the piecewise-linear part that starts at t: sets pieceValue (value just
   * after t), pieceSlope and pieceEnd (next breakpoint). The non-noise components are cached
   * between their own breakpoints, so a noisy run costs one knot lookup per piece.
   */
  piece(t: number): void {
    if (!(t >= this.partsFrom && t < this.partsTo)) {
      const b = this.nextBreak(t, false);
      const mid = b === Infinity ? t + 1 : 0.5 * (t + b);
      this.affineAt(mid, false);
      this.partsFrom = t;
      this.partsTo = b;
      this.partsRefT = mid;
      this.partsRefV = this.value;
      this.partsSlope = this.slope;
    }
    let v = this.partsRefV + this.partsSlope * (t - this.partsRefT);
    let s = this.partsSlope;
    let end = this.partsTo;
    const kn = this.noise;
    if (kn !== null) {
      const dt = this.noiseDt;
      let k = Math.floor(t / dt);
      if (k < 0) k = 0;
      if (k >= kn.length - 1) v += kn[kn.length - 1];
      else {
        let kb = (k + 1) * dt;
        if (kb <= t) {
          k += 1;
          kb += dt;
        }
        if (k >= kn.length - 1) v += kn[kn.length - 1];
        else {
          const d = kn[k + 1] - kn[k];
          v += kn[k] + d * (t / dt - k);
          s += d / dt;
          if (kb < end) end = kb;
        }
      }
    }
    this.pieceValue = v;
    this.pieceSlope = s;
    this.pieceEnd = end;
  }

  get sineCount(): number {
    return this.sineAmp.length;
  }

  /** Value and slope of the piecewise-linear part (everything but the sines) at t → this.value/this.slope. */
  affineAt(t: number, withNoise = true): void {
    let v = 0;
    let s = 0;
    for (let i = 0; i < this.parts.length; i++) {
      const p = this.parts[i];
      switch (p.kind) {
        case "const":
          v += p.level;
          break;
        case "triangle": {
          const x = p.frequency * t + p.shift;
          const frac = x - Math.floor(x);
          const a = p.amplitude;
          const k = 4 * a * p.frequency;
          if (frac < 0.25) {
            v += p.offset + 4 * a * frac;
            s += k;
          } else if (frac < 0.75) {
            v += p.offset + a * (2 - 4 * frac);
            s -= k;
          } else {
            v += p.offset + a * (4 * frac - 4);
            s += k;
          }
          break;
        }
        case "ramp":
          if (t < p.start) v += p.from;
          else if (t >= p.end) v += p.to;
          else {
            const k = (p.to - p.from) / (p.end - p.start);
            v += p.from + k * (t - p.start);
            s += k;
          }
          break;
        case "pulse": {
          const tp = t - p.delay;
          if (tp < 0) {
            v += p.low;
            break;
          }
          const ph = tp - Math.floor(tp / p.period) * p.period;
          const span = p.high - p.low;
          if (ph < p.rise) {
            v += p.low + (span * ph) / p.rise;
            s += span / p.rise;
          } else if (ph < p.fallStart) v += p.high;
          else if (ph < p.fallEnd) {
            v += p.high - (span * (ph - p.fallStart)) / (p.fallEnd - p.fallStart);
            s -= span / (p.fallEnd - p.fallStart);
          } else v += p.low;
          break;
        }
        case "table": {
          const i = lastAtOrBefore(p.times, t);
          const n = p.times.length;
          if (i < 0) v += p.values[0];
          else if (i >= n - 1) v += p.values[n - 1];
          else {
            const dt = p.times[i + 1] - p.times[i];
            const k = (p.values[i + 1] - p.values[i]) / dt;
            v += p.values[i] + k * (t - p.times[i]);
            s += k;
          }
          break;
        }
      }
    }
    if (withNoise && this.noise !== null) {
      const kn = this.noise;
      const x = t / this.noiseDt;
      let k = Math.floor(x);
      if (k < 0) k = 0;
      if (k >= kn.length - 1) v += kn[kn.length - 1];
      else {
        const frac = x - k;
        const d = kn[k + 1] - kn[k];
        v += kn[k] + d * frac;
        s += d / this.noiseDt;
      }
    }
    this.value = v;
    this.slope = s;
  }

  /** Sum of the sine components at t. */
  sinesAt(t: number): number {
    let v = 0;
    for (let j = 0; j < this.sineAmp.length; j++)
      v += this.sineAmp[j] * Math.sin(this.sineOmega[j] * t + this.sinePhase[j]);
    return v;
  }

  /** Full input value at t (right-continuous). */
  valueAt(t: number): number {
    this.affineAt(t);
    return this.sineAmp.length ? this.value + this.sinesAt(t) : this.value;
  }

  /** Smallest breakpoint of the piecewise-linear part strictly after t (Infinity if none). */
  nextBreak(t: number, withNoise = true): number {
    let best = Infinity;
    for (let i = 0; i < this.parts.length; i++) {
      const p = this.parts[i];
      let b = Infinity;
      switch (p.kind) {
        case "const":
          break;
        case "triangle": {
          // Vertices at x = 1/4 + n/2.
          const x = p.frequency * t + p.shift;
          let n = Math.floor((x - 0.25) * 2) + 1;
          b = (0.25 + n / 2 - p.shift) / p.frequency;
          while (b <= t) {
            n += 1;
            b = (0.25 + n / 2 - p.shift) / p.frequency;
          }
          break;
        }
        case "ramp":
          b = t < p.start ? p.start : t < p.end ? p.end : Infinity;
          break;
        case "pulse": {
          const tp = t - p.delay;
          if (tp < 0) {
            b = p.delay;
            break;
          }
          let n = Math.floor(tp / p.period);
          for (let guard = 0; guard < 3 && b === Infinity; guard++, n++) {
            const base = p.delay + n * p.period;
            const c0 = base;
            const c1 = base + p.rise;
            const c2 = base + p.fallStart;
            const c3 = base + p.fallEnd;
            if (c0 > t) b = c0;
            else if (c1 > t) b = c1;
            else if (c2 > t) b = c2;
            else if (c3 > t) b = c3;
          }
          break;
        }
        case "table": {
          const i = lastAtOrBefore(p.times, t);
          b = i + 1 < p.times.length ? p.times[i + 1] : Infinity;
          break;
        }
      }
      if (b < best) best = b;
    }
    if (withNoise && this.noise !== null) {
      const dt = this.noiseDt;
      let b = (Math.floor(t / dt) + 1) * dt;
      if (b <= t) b += dt;
      if (b < best) best = b;
    }
    return best;
  }
}

/** The scenario's input (components + noise) at the given times. */
export function evaluateInputSignal(signal: InputSignal, t: Float64Array): Float64Array {
  const out = new Float64Array(t.length);
  for (let i = 0; i < t.length; i++) out[i] = signal.valueAt(t[i]);
  return out;
}
