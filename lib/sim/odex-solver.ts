// The general non-stiff solver: odex (Gragg–Bulirsch–Stoer extrapolation with dense output)
// on the same behavioural model written as one ODE with clamps. It restarts at every input
// breakpoint so the kinks of the input never sit inside a step; regime kinks (slew and rail
// entry) are left to the step-size control. Crossings are located on the dense output.
// Used as the independent cross-check of the exact solver; stiff closed loops are not its job
// (it reports SimFailed when it runs out of steps).
import { Outcome, Solver } from "./odex";
import type { ExactParams } from "./exact";
import { MONITOR_VD } from "./measure";
import { SimCancelled, SimFailed } from "./errors";

export interface OdexParams extends ExactParams {
  relativeTolerance?: number;
}

export interface OdexStats {
  steps: number;
  evaluations: number;
  /** The high level the first time the output is held there (NaN if never). */
  firstHigh: number;
}

const SUBDIVISIONS = 4;

export function runOdex(p: OdexParams): OdexStats {
  const A0 = p.openLoopGain;
  const wp = (2 * Math.PI * p.gainBandwidth) / A0;
  const { alpha: al, beta: be, gamma: ga, delta: de } = p.net;
  const st = p.net.state;
  const twoD = st !== null;
  const kU = st?.kappaU ?? 0;
  const kX = st?.kappaX ?? 0;
  const kO = st?.kappaO ?? 0;
  const k0 = st?.kappa0 ?? 0;
  const Voh = p.rails.high;
  const Vol = p.rails.low;
  const SR = p.slewRate;
  const SRf = p.slewRateFall;
  const td = p.propagationDelay;
  const T = p.duration;
  const sig = p.signal;
  const rec = p.recorder;
  const levels = rec.levels;
  const n = twoD ? 3 : 2; // vo, [x], clipped time
  const iClip = n - 1;

  const inputConnected = al !== 0 || kU !== 0;
  const uSeen = (x: number) => (inputConnected ? sig.valueAt(Math.max(0, x - td)) : 0);
  // An open drain's high level h0 + hU·u + hX·x (the constant Voh for a push-pull output).
  const hi = p.net.high ?? null;
  const h0 = hi?.h0 ?? Voh;
  const hU = hi?.hU ?? 0;
  const hX = hi?.hX ?? 0;
  const variableHigh = hU !== 0 || hX !== 0;
  const highOf = (u: number, vc: number) => (variableHigh ? h0 + hU * u + hX * vc : Voh);
  /** du/dt seen by the stage at x (right derivative: odex restarts at every input corner). */
  const slopeSeen = (x: number): number => {
    if (!inputConnected || x < td) return 0;
    const ts = x - td;
    sig.affineAt(ts);
    let d = sig.slope;
    for (let j = 0; j < sig.sineAmp.length; j++)
      d += sig.sineAmp[j] * sig.sineOmega[j] * Math.cos(sig.sineOmega[j] * ts + sig.sinePhase[j]);
    return d;
  };
  /** dH/dt of the high level at x (0 for a push-pull output). */
  const highSlope = (x: number, vc: number, u: number, H: number): number => {
    if (!variableHigh) return 0;
    const xDot = twoD ? kU * u + kX * vc + kO * H + k0 : 0;
    return hU * slopeSeen(x) + hX * xDot;
  };
  // The output at its high level H is held there while the op-amp drives it up faster than H
  // moves (drive ≥ dH/dt; for a push-pull output dH/dt = 0): it then follows H, so the state
  // never climbs above a falling open-drain level. Below that it leaves H at its own rate, and
  // never faster upward than H moves (the pin cannot rise above its pull-up level). The same
  // condition as the exact solver's rail-high regime (lib/sim/exact/pieces.ts).
  const rate = (x: number, vo: number, vc: number, u: number): number => {
    const H = highOf(u, vc);
    const v = vo > H ? H : vo < Vol ? Vol : vo;
    const drive = wp * (A0 * (al * u + be * v + ga * vc + de) - v);
    let f = drive > SR ? SR : drive < -SRf ? -SRf : drive;
    if (vo >= H) {
      const hDot = highSlope(x, vc, u, H);
      if (drive >= hDot || f > hDot) return hDot;
      return f;
    }
    if (vo <= Vol && f < 0) f = 0;
    return f;
  };
  let evaluations = 0;
  const rhs = (x: number, y: number[]): number[] => {
    evaluations++;
    const u = uSeen(x);
    const vo = y[0];
    const vc = twoD ? y[1] : 0;
    const H = highOf(u, vc);
    const v = vo > H ? H : vo < Vol ? Vol : vo;
    const fl = wp * (A0 * (al * u + be * v + ga * vc + de) - v);
    // Clipped while the output is held at a limit (the rate rule above; at the low limit while
    // the drive pushes down).
    const held = (vo >= H && fl >= highSlope(x, vc, u, H)) || (vo <= Vol && fl <= 0) ? 1 : 0;
    const dv = rate(x, vo, vc, u);
    return twoD ? [dv, kU * u + kX * vc + kO * v + k0, held] : [dv, held];
  };

  let wMax = 0;
  if (inputConnected) for (let j = 0; j < sig.sineOmega.length; j++) wMax = Math.max(wMax, sig.sineOmega[j]);
  const hMaxSine = wMax > 0 ? (2 * Math.PI) / wMax / 16 : Infinity;

  const solver = new Solver(n);
  solver.denseOutput = true;
  solver.relativeTolerance = p.relativeTolerance ?? 1e-11;
  const scaleV = Math.max(1, Math.abs(Voh), Math.abs(Vol));
  solver.absoluteTolerance = twoD ? [1e-11 * scaleV, 1e-11 * scaleV, 1e-11 * T] : [1e-11 * scaleV, 1e-11 * T];

  const budget = p.maxSteps ?? 200_000; // total over the run
  let steps = 0;
  let reached = 0; // furthest time integrated so far
  let y: number[] = twoD ? [p.vo0, p.x0, 0] : [p.vo0, 0];
  const sides = new Uint8Array(4);
  for (let i = 0; i < 3; i++) sides[i] = p.vo0 >= levels[i] ? 1 : 0;
  sides[MONITOR_VD] = al * uSeen(0) + be * p.vo0 + ga * (twoD ? p.x0 : 0) + de >= 0 ? 1 : 0;
  {
    const f0 = rate(0, p.vo0, twoD ? p.x0 : 0, uSeen(0));
    rec.startupDirection = f0 > 0 ? 1 : f0 < 0 ? -1 : 0;
    if (f0 === 0) rec.startupEnd = 0;
  }
  const ts = p.sampleTimes;
  const out = p.output;
  let sample = 0;
  const capOut = p.capacitor;
  while (sample < ts.length && ts[sample] <= 0) {
    if (capOut !== null) capOut[sample] = p.x0;
    out[sample++] = p.vo0;
  }

  /**
   * The first input breakpoint strictly after t on the solver's axis. With a transport delay a
   * breakpoint b of the input lands at b + td, and t − td can round to just below b again: the
   * same b would come back as "next" and the restart loop would stand still at t. So a
   * breakpoint that does not lie past t is stepped over (the input's own nextBreak is strictly
   * increasing, so this ends).
   */
  const nextBreak = (t: number): number => {
    if (!inputConnected) return Infinity;
    if (t < td) return td;
    let s = t - td;
    for (;;) {
      const b = sig.nextBreak(s);
      if (b === Infinity || b + td > t) return b + td;
      s = b;
    }
  };

  let dense: ((c: number, x: number) => number) | undefined;
  const voAt = (x: number) => dense!(0, x);
  const vcAt = (x: number) => (twoD ? dense!(1, x) : 0);
  const clampAt = (x: number, v: number) => {
    const H = variableHigh ? highOf(uSeen(x), vcAt(x)) : Voh;
    return v > H ? H : v < Vol ? Vol : v;
  };
  const vdAt = (x: number) => al * uSeen(x) + be * clampAt(x, dense!(0, x)) + ga * vcAt(x) + de;
  const clampV = (v: number) => (v > Voh ? Voh : v < Vol ? Vol : v);
  let firstHigh = NaN;

  /** Bisection on the dense output for a sign change of g between a and b. */
  const locate = (g: (x: number) => number, a: number, b: number, sa: boolean): number => {
    for (let i = 0; i < 80 && b - a > 1e-15 * Math.max(1, Math.abs(b)); i++) {
      const m = 0.5 * (a + b);
      if (g(m) >= 0 === sa) a = m;
      else b = m;
    }
    return b;
  };

  const solOut = (nr: number, xOld: number, x: number, yy: number[], d?: (c: number, x: number) => number) => {
    if (x <= xOld || !d) return;
    dense = d;
    reached = x;
    steps++;
    // End of the power-on transient (see Recorder): first subdivision point where dvo/dt
    // no longer points away from the initial level.
    if (rec.startupEnd === Infinity) {
      for (let k = 1; k <= SUBDIVISIONS; k++) {
        const b = k === SUBDIVISIONS ? x : xOld + ((x - xOld) * k) / SUBDIVISIONS;
        const vb = d(0, b);
        const rb = rate(b, vb, twoD ? d(1, b) : 0, uSeen(b));
        if (rec.startupDirection === 0 || rb * rec.startupDirection <= 0) {
          rec.startupEnd = b;
          break;
        }
      }
    }
    // Crossings of the output levels and of vd's sign, at SUBDIVISIONS points per step.
    for (let k = 1; k <= SUBDIVISIONS; k++) {
      const a = xOld + ((x - xOld) * (k - 1)) / SUBDIVISIONS;
      const b = k === SUBDIVISIONS ? x : xOld + ((x - xOld) * k) / SUBDIVISIONS;
      for (let lv = 0; lv < 3; lv++) {
        const gb = voAt(b) - levels[lv] >= 0;
        if (gb !== (sides[lv] === 1)) {
          const L = levels[lv];
          rec.push(
            locate((s) => voAt(s) - L, a, b, sides[lv] === 1),
            lv,
            gb,
          );
          sides[lv] = gb ? 1 : 0;
        }
      }
      if (p.trackVd) {
        const sb = vdAt(b) >= 0;
        if (sb !== (sides[MONITOR_VD] === 1)) {
          rec.push(locate(vdAt, a, b, sides[MONITOR_VD] === 1), MONITOR_VD, sb);
          sides[MONITOR_VD] = sb ? 1 : 0;
        }
      }
    }
    rec.flush();
    while (sample < ts.length && ts[sample] <= x) {
      out[sample] = clampAt(ts[sample], voAt(ts[sample]));
      if (capOut !== null) capOut[sample] = d(1, ts[sample]);
      sample++;
    }
    // First arrival at each limit (amplifier readings), located at the step end.
    if (yy[0] >= Voh && rec.clipInputHigh !== rec.clipInputHigh) rec.clipInputHigh = uSeen(x);
    if (firstHigh !== firstHigh) {
      const H = highOf(uSeen(x), twoD ? yy[1] : 0);
      if (yy[0] >= H - 1e-9 * Math.max(1, Math.abs(H))) firstHigh = H;
    }
    if (yy[0] <= Vol && rec.clipInputLow !== rec.clipInputLow) rec.clipInputLow = uSeen(x);
    const r = Math.abs(rate(x, yy[0], twoD ? yy[1] : 0, uSeen(x)));
    if (r > rec.maxSlew && x > rec.startupEnd) rec.maxSlew = r;

    if (p.shouldCancel && (steps & 255) === 0 && p.shouldCancel()) throw new SimCancelled();
  };

  let t = 0;
  while (t < T) {
    const tEnd = Math.min(T, nextBreak(t));
    if (!(tEnd > t)) throw new SimFailed(`odex could not advance past t = ${t.toPrecision(4)} s of ${T} s`);
    solver.maxSteps = Math.max(1, budget - steps);
    solver.maxStepSize = Math.min(tEnd - t, hMaxSine, T / 100);
    solver.initialStepSize = Math.min(1e-4, (tEnd - t) / 8);
    const r = solver.solve(rhs, t, y, tEnd, solOut);
    if (r.outcome === Outcome.MaxStepsExceeded || steps >= budget) {
      throw new SimFailed(
        `odex reached its step limit (${budget.toLocaleString("en")} steps) at t = ${reached.toPrecision(4)} s of ${T} s; ` +
          "this run is stiff: use the exact solver",
      );
    }
    y = r.y.slice();
    if (variableHigh) {
      const H = highOf(uSeen(tEnd), twoD ? y[1] : 0);
      y[0] = y[0] > H ? H : y[0] < Vol ? Vol : y[0];
    } else y[0] = clampV(y[0]);
    t = tEnd;
    p.onProgress?.(t / T);
  }
  while (sample < ts.length) {
    if (capOut !== null) capOut[sample] = twoD ? y[1] : 0;
    out[sample++] = y[0];
  }
  rec.clippedTime = y[iClip];
  return { steps, evaluations, firstHigh };
}
