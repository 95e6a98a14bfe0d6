// The default solver: exact piecewise solution of the behavioural op-amp model (DEVELOPERS.md).
//
// Between input breakpoints the input is affine in time plus sines, and in each regime
// (regimes.ts) the model is a linear ODE with a closed-form solution (pieces.ts) on a small
// basis (basis.ts). A piece starts in the regime its state calls for, runs to its earliest
// regime exit or the end of the input piece, and reports the monitored crossings inside it;
// exits and crossings are located by bracketing on the closed form (scan.ts, bracket.ts).
// Nothing depends on the output sample grid, and a stiff negative-feedback loop costs nothing:
// a 60 s ramp is a few pieces. The piece loop allocates nothing (events are the only objects
// created, one per output edge).
import type { Network } from "../network";
import type { InputSignal } from "../signals";
import { MONITOR_VD, type Recorder } from "../measure";
import { SimCancelled, SimFailed } from "../errors";
import { SLOT_ONE, SLOT_SINES, SLOT_TAU, type Basis } from "./basis";
import { ulp } from "./bracket";
import { PieceModel } from "./pieces";
import {
  DRIVE,
  EXITS,
  LEVEL_HIGH,
  LINEAR,
  OUTPUT,
  RAIL_HIGH,
  RAIL_LOW,
  SLEW_DOWN,
  SLEW_UP,
  enterRegime,
  isRail,
  levelValues,
  type Regime,
} from "./regimes";
import { Scanner } from "./scan";
import { HOLD_SLOTS, KNOT_BLOCK, holdAtRail } from "./rail-hold";

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
  /** Initial capacitor state x (ignored without one). */
  x0: number;
  sampleTimes: Float64Array;
  output: Float64Array;
  /** Samples of the capacitor state x at sampleTimes, when the stage has one. */
  capacitor: Float64Array | null;
  recorder: Recorder;
  trackVd: boolean;
  onProgress?: (fraction: number) => void;
  shouldCancel?: () => boolean;
  /** Piece budget over the run; simulate() always passes one. */
  maxSteps?: number;
}

/** Relative size below which a condition at the start of a piece is "at the boundary". */
const AT_BOUNDARY = 1e-12;
/** Units of rounding allowed for evaluating a closed form's sum at a piece start. */
const ROUNDING_ULPS = 8;

export class ExactSolver {
  readonly model: PieceModel;
  readonly basis: Basis;
  readonly scan: Scanner;
  readonly delay: number;
  readonly sides = new Uint8Array(4);
  /** Σ A_j·ω_j² of the sines, and the sines' phases along a block of noise knots (rail-hold.ts). */
  readonly sineCurvature: number;
  readonly sineSin: Float64Array;
  readonly sineCos: Float64Array;
  readonly stepSin: Float64Array;
  readonly stepCos: Float64Array;
  steps = 0;
  sample = 0;
  /** The high level the first time the output sits at it (an open drain's loaded level). */
  firstHigh = NaN;
  private readonly levels: Float64Array;
  private readonly maxSteps: number;
  private readonly pieceCapSine: number;
  private readonly G: Float64Array;
  private readonly scratch: Float64Array;
  private cap = Infinity;
  private tol = 0;

  constructor(readonly p: ExactParams) {
    this.maxSteps = p.maxSteps ?? Infinity;
    this.delay = p.propagationDelay;
    this.model = new PieceModel(
      p.net,
      {
        openLoopGain: p.openLoopGain,
        gainBandwidth: p.gainBandwidth,
        slewRate: p.slewRate,
        slewRateFall: p.slewRateFall,
        high: p.rails.high,
        low: p.rails.low,
      },
      p.signal.sineOmega,
    );
    this.basis = this.model.basis;
    this.scan = new Scanner(this.basis);
    this.levels = levelValues(p.slewRate, p.slewRateFall, p.rails.high, p.rails.low);
    const m = this.basis.sineCount;
    const omega = this.basis.omega;
    let curvature = 0;
    let wMax = 0;
    for (let j = 0; j < m; j++) {
      curvature += Math.abs(p.signal.sineAmp[j]) * omega[j] * omega[j];
      wMax = Math.max(wMax, omega[j]);
    }
    this.sineCurvature = curvature;
    this.pieceCapSine = wMax > 0 ? (2 * Math.PI) / wMax / 8 : Infinity;
    this.sineSin = new Float64Array(m);
    this.sineCos = new Float64Array(m);
    // sin/cos of ω_j·i·noiseDt for i = 0 … KNOT_BLOCK, at [i·m + j] (rail-hold.ts)
    this.stepSin = new Float64Array(m * (KNOT_BLOCK + 1));
    this.stepCos = new Float64Array(m * (KNOT_BLOCK + 1));
    for (let i = 0; i <= KNOT_BLOCK; i++)
      for (let j = 0; j < m; j++) {
        this.stepSin[i * m + j] = Math.sin(omega[j] * i * p.signal.noiseDt);
        this.stepCos[i * m + j] = Math.cos(omega[j] * i * p.signal.noiseDt);
      }
    this.G = new Float64Array(this.model.size);
    this.scratch = new Float64Array(this.model.size);
  }

  get evaluations(): number {
    return this.basis.evaluations;
  }

  /** Cancellation, progress and the piece budget, every 1024 pieces. */
  checkIn(t: number): void {
    const p = this.p;
    if (p.shouldCancel?.()) throw new SimCancelled();
    p.onProgress?.(t / p.duration);
    if (this.steps > this.maxSteps)
      throw new SimFailed(
        `the exact solver used its budget of ${this.maxSteps.toLocaleString("en")} pieces and stopped at t = ${t.toPrecision(4)} s of ${p.duration} s`,
      );
  }

  /**
   * Start of the current piece (`t`) and the end of its input piece (`tb`, set by pieceEnd).
   * Times pass between the piece loop and the methods it calls in fields, not as arguments or
   * results: V8 boxes a double into a new heap number when it crosses a call it does not
   * inline, and a noisy run makes tens of thousands of such calls (garbage collections during
   * the run), while a field keeps its double in place.
   */
  t = 0;
  tb = 0;
  /** The knot-stepping loop's numbers (rail-hold.ts HOLD_* slots), for the same reason. */
  readonly holdNumbers = new Float64Array(HOLD_SLOTS);

  /**
   * Input coefficients (model.U) of the piece starting at this.t, seen through the transport
   * delay; sets this.tb to the end of the input piece in solver time.
   */
  private inputPiece(): void {
    const t = this.t;
    const U = this.model.U;
    const sig = this.p.signal;
    if (!this.model.inputConnected) {
      this.tb = Infinity;
      return;
    }
    let ts = t - this.delay;
    if (ts < 0) {
      U.fill(0);
      U[SLOT_ONE] = sig.valueAt(0);
      this.tb = this.delay;
      return;
    }
    sig.piece(ts);
    // t − delay can round to just before an input breakpoint that lies at t on the solver's
    // axis: that piece is over here, so take the one after it (otherwise a one-ulp piece would
    // carry the old piece's slope, whose closed form can cancel to volts of rounding).
    while (this.delay !== 0 && sig.pieceEnd !== Infinity && !(sig.pieceEnd + this.delay > t)) {
      ts = sig.pieceEnd;
      sig.piece(ts);
    }
    U[SLOT_ONE] = sig.pieceValue;
    U[SLOT_TAU] = sig.pieceSlope;
    const omega = this.basis.omega;
    for (let j = 0; j < omega.length; j++) {
      const phase = omega[j] * ts + sig.sinePhase[j];
      U[SLOT_SINES + 2 * j] = sig.sineAmp[j] * Math.cos(phase);
      U[SLOT_SINES + 1 + 2 * j] = sig.sineAmp[j] * Math.sin(phase);
    }
    this.tb = sig.pieceEnd + this.delay;
  }

  /**
   * Sets up the input piece at this.t and sets this.tb to its end (≤ the run's end). A
   * breakpoint closer than the time resolution at t (it can round onto t after the delay
   * shift) would give an empty piece: the piece then runs to the next representable time.
   */
  pieceEnd(): void {
    const t = this.t;
    const T = this.p.duration;
    this.inputPiece();
    const e = Math.min(T, this.tb);
    this.tb = e > t ? e : Math.min(T, t + ulp(t));
  }

  /**
   * An exit's condition as coefficients in G: sign·(quantity − level) − tol, so it holds where
   * G > 0. The margin tol (AT_BOUNDARY of the magnitudes that round into the value) keeps the
   * rounding of a state sitting on a boundary from reading as a crossing; it moves a real exit
   * by tol/slope, far below the time resolution. Sets `this.tol`.
   */
  private exitFunction(regime: Regime, index: number): Float64Array {
    const e = EXITS[regime][index];
    const q = e.quantity === DRIVE ? this.model.DRIVE : this.model.VO;
    const G = this.G;
    for (let i = 0; i < G.length; i++) G[i] = e.sign * q[i];
    if (e.quantity === OUTPUT && e.level === LEVEL_HIGH && this.model.variableHigh) {
      // An open drain's high level moves with the input: compare with its closed form.
      const H = this.model.HIGH;
      for (let i = 0; i < G.length; i++) G[i] -= e.sign * H[i];
    } else G[SLOT_ONE] -= e.sign * this.levels[e.level];
    // AT_BOUNDARY of the sizes that meet in the comparison (the quantity and the level), plus a
    // few units of rounding of the sum the closed form evaluates. A steep input piece on a slow
    // pole has coefficients many orders above the value they cancel to: AT_BOUNDARY of those
    // would call a state volts away from a limit "on" it.
    const magnitude = this.basis.magnitudeAtStart(G);
    const size = Math.abs(this.basis.valueAtStart(q)) + Math.abs(this.levels[e.level]);
    this.tol = AT_BOUNDARY * Math.min(magnitude, size) + ROUNDING_ULPS * Number.EPSILON * magnitude;
    G[SLOT_ONE] -= this.tol;
    return G;
  }

  /**
   * The regime a piece runs in: the one the state calls for, then, at the same instant, any
   * exit whose condition already holds at the start: past its boundary by more than rounding,
   * or on the boundary (within rounding) and moving outward; the two regimes have the same
   * motion there, so the slope decides. A regime is never revisited within one instant.
   * Starts from model.startVo and model.startX; leaves model coefficients and `cap` set for
   * the regime returned.
   */
  private resolveAtStart(regime: Regime): Regime {
    let visited = 1 << regime;
    for (;;) {
      this.model.setup(regime);
      this.cap = this.model.cap;
      let next = -1;
      const exits = EXITS[regime];
      for (let i = 0; i < exits.length && next < 0; i++) {
        const G = this.exitFunction(regime, i);
        const g0 = this.basis.valueAtStart(G); // already less tol
        if (g0 > 0 || (g0 >= -2 * this.tol && this.basis.slopeAtStart(G) > 0)) next = exits[i].to;
      }
      if (next < 0 || visited & (1 << next)) return regime;
      visited |= 1 << next;
      regime = next as Regime;
    }
  }

  /** The final state (output, capacitor), kept by the piece loop. */
  private finalVo = 0;
  private finalX = 0;

  run(): void {
    this.pieces();
    // Any sample left (rounding at the very end) takes the final state.
    const p = this.p;
    while (this.sample < p.sampleTimes.length) {
      if (p.capacitor !== null) p.capacitor[this.sample] = this.finalX;
      p.output[this.sample++] = this.finalVo;
    }
  }

  /**
   * The piece loop. Nothing follows the loop in this method: V8 compiles a long loop while it
   * runs, and code after it that has not run yet would throw that code away at the end of every
   * run, so the next run's loop would start unoptimised (boxing numbers: garbage collections).
   */
  private pieces(): void {
    const p = this.p;
    const model = this.model;
    const T = p.duration;
    const ts = p.sampleTimes;
    const out = p.output;
    const cap = p.capacitor;
    const rec = p.recorder;
    const levels = rec.levels;
    const { VO, X, VD, DRIVE: F } = model;
    const hasState = model.hasState;
    const Voh = p.rails.high;
    const Vol = p.rails.low;
    const variableHigh = model.variableHigh;
    // Sample clamp at the high side: the variable high level is met exactly by the rail pieces.
    const clampHigh = variableHigh ? Infinity : Voh;
    let atHigh = variableHigh && p.vo0 >= Voh;
    // The loop's numbers start as plain doubles (unary plus): V8 may keep a loop variable first
    // set from a property of unknown type tagged, boxing a heap number on every piece.
    let t = 0;
    let vo = +p.vo0;
    let x = hasState ? +p.x0 : 0;
    for (let i = 0; i < 3; i++) this.sides[i] = vo >= levels[i] ? 1 : 0;
    this.t = 0;
    this.inputPiece();
    {
      const f0 = model.driveOf(model.inputAtStart(), vo, x);
      const held = (vo >= Voh && f0 >= 0) || (vo <= Vol && f0 <= 0);
      rec.startupDirection = held || f0 === 0 ? 0 : f0 > 0 ? 1 : -1;
      if (p.trackVd) this.sides[MONITOR_VD] = model.vdOf(model.inputAtStart(), vo, x) >= 0 ? 1 : 0;
    }
    let stalled = 0;
    let previousSettledLinear = false;
    this.finalVo = vo;
    this.finalX = x;
    while (t < T) {
      this.t = t;
      this.pieceEnd();
      let tb = this.tb;
      if (variableHigh) {
        // The open drain's high level at this instant; an output held there stays on it.
        this.levels[LEVEL_HIGH] = model.highAt(model.inputAtStart(), x);
        if (atHigh) vo = this.levels[LEVEL_HIGH];
      }
      model.startVo = vo;
      model.startX = x;
      let regime = this.regimeAtStart();
      if (isRail(regime)) this.noteRail(regime);
      if (!hasState && isRail(regime) && !(variableHigh && regime === RAIL_HIGH)) {
        if (rec.startupEnd === Infinity) rec.startupEnd = t;
        this.t = t;
        holdAtRail(this, regime === RAIL_HIGH);
        t = this.t;
        previousSettledLinear = false;
        vo = regime === RAIL_HIGH ? Voh : Vol;
        this.finalVo = vo;
        if (t >= T) break;
        this.t = t;
        this.pieceEnd();
        tb = this.tb;
        model.startVo = vo;
        regime = this.regimeAtStart();
      }
      if (this.basis.sineCount > 0) tb = Math.min(tb, t + this.pieceCapSine);
      model.startVo = vo;
      regime = this.resolveAtStart(regime);
      if (isRail(regime)) this.noteRail(regime);
      const h = Math.min(tb - t, this.cap);
      this.steps++;

      // Earliest regime exit
      let tx = h;
      let next = -1;
      const exits = EXITS[regime];
      const scan = this.scan;
      scan.start = t;
      for (let i = 0; i < exits.length; i++) {
        scan.span = tx;
        scan.firstExit(this.exitFunction(regime, i));
        const tau = scan.exit;
        if (tau <= tx) {
          tx = tau;
          next = exits[i].to;
        }
      }
      // An exit closer than the time resolution at t would not move the clock.
      if (!(t + tx > t)) tx = ulp(t);
      const tEnd = next < 0 && h === tb - t ? tb : Math.min(T, t + tx);

      // Monitored crossings within (0, tx]
      scan.span = tx;
      if (!isRail(regime)) {
        const G = this.G;
        for (let lv = 0; lv < 3; lv++) {
          for (let i = 0; i < G.length; i++) G[i] = VO[i];
          G[SLOT_ONE] -= levels[lv];
          this.sides[lv] = scan.crossings(G, lv, this.sides[lv] === 1, rec) ? 1 : 0;
        }
      }
      if (p.trackVd) this.sides[MONITOR_VD] = scan.crossings(VD, MONITOR_VD, this.sides[MONITOR_VD] === 1, rec) ? 1 : 0;
      if (rec.startupEnd === Infinity) this.startupCheck(regime, t, tx);
      rec.flush();

      // Output (and capacitor) samples inside the piece
      while (this.sample < ts.length && ts[this.sample] <= tEnd) {
        const tau = ts[this.sample] - t;
        const v = this.basis.valueAt(VO, tau);
        out[this.sample] = v > clampHigh ? clampHigh : v < Vol ? Vol : v;
        if (cap !== null) cap[this.sample] = this.basis.valueAt(X, tau);
        this.sample++;
      }

      // Clipping time and slew (the power-on transient does not count towards the slew rate)
      if (isRail(regime)) rec.clippedTime += tx;
      else if (t + tx > rec.startupEnd) {
        if (regime === SLEW_UP) rec.maxSlew = Math.max(rec.maxSlew, p.slewRate);
        else if (regime === SLEW_DOWN) rec.maxSlew = Math.max(rec.maxSlew, p.slewRateFall);
        else {
          scan.start = t;
          scan.span = tx;
          scan.from = Math.max(0, rec.startupEnd - t);
          scan.maxAbs(F, this.scratch);
          rec.maxSlew = Math.max(rec.maxSlew, scan.best);
        }
      }

      // Advance
      this.tx = tx;
      this.stateAtEnd(hasState);
      let voNext = this.voEnd;
      const xNext = hasState ? this.xEnd : 0;
      if (variableHigh) {
        atHigh = next === RAIL_HIGH || (regime === RAIL_HIGH && next < 0);
        if (atHigh) voNext = this.basis.valueAt(model.HIGH, tx);
      } else if (next === RAIL_HIGH || voNext > Voh || regime === RAIL_HIGH) voNext = Voh;
      if (next === RAIL_LOW || voNext < Vol || regime === RAIL_LOW) voNext = Vol;
      if (!Number.isFinite(voNext) || !Number.isFinite(xNext))
        throw new SimFailed(
          `the exact solver reached a non-finite state at t = ${t.toPrecision(6)} s (a degenerate stage: check the resistor and capacitor values)`,
        );
      const settledLinear = regime === LINEAR && next < 0;
      if (settledLinear && previousSettledLinear && !p.trackVd && t >= rec.startupEnd) {
        // Amplifier gain from the solution: output against input increments over linear pieces
        // that neither follow nor end in a regime change (where the loop's lag would bias it).
        const du = p.signal.valueAt(Math.max(0, t + tx - this.delay)) - p.signal.valueAt(Math.max(0, t - this.delay));
        rec.gainCross += du * (voNext - vo);
        rec.gainInputSquares += du * du;
      }
      previousSettledLinear = settledLinear;
      stalled = tEnd > t ? 0 : stalled + 1;
      if (stalled > 1000) throw new SimFailed(`the exact solver could not advance past t = ${t} s`);
      vo = voNext;
      x = xNext;
      t = tEnd;
      if ((this.steps & 1023) === 0 || this.steps > this.maxSteps) this.checkIn(t);
      this.finalVo = vo;
      this.finalX = x;
    }
  }

  /**
   * The regime the state (model.startVo, model.startX) calls for at the start of the input
   * piece. A small method of its own, so V8 inlines the model's helpers into it and no double
   * crosses a call (see `t`).
   */
  private regimeAtStart(): Regime {
    const model = this.model;
    const vo = model.startVo;
    return enterRegime(vo, model.driveOf(model.inputAtStart(), vo, model.startX), this.levels);
  }

  /** Length of the piece being advanced, and the output and capacitor state at its end (stateAtEnd). */
  private tx = 0;
  private voEnd = 0;
  private xEnd = 0;

  /** The closed form at τ = tx into voEnd (and xEnd with a capacitor); small for the same reason. */
  private stateAtEnd(hasState: boolean): void {
    const basis = this.basis;
    basis.evaluate(this.tx);
    this.voEnd = basis.dot(this.model.VO);
    if (hasState) this.xEnd = basis.dot(this.model.X);
  }

  /** First time the output reaches each limit: the input there (amplifier readings). */
  private noteRail(regime: Regime): void {
    const t = this.t;
    const rec = this.p.recorder;
    if (regime === RAIL_HIGH && this.firstHigh !== this.firstHigh)
      this.firstHigh = this.model.variableHigh ? this.levels[LEVEL_HIGH] : this.p.rails.high;
    if (regime === RAIL_HIGH ? rec.clipInputHigh === rec.clipInputHigh : rec.clipInputLow === rec.clipInputLow) return;
    const u = this.p.signal.valueAt(Math.max(0, t - this.delay));
    if (regime === RAIL_HIGH) rec.clipInputHigh = u;
    else rec.clipInputLow = u;
  }

  /** End the power-on transient when dvo/dt turns against its initial direction (see Recorder). */
  private startupCheck(regime: Regime, t0: number, tx: number): void {
    const rec = this.p.recorder;
    const dir = rec.startupDirection;
    if (dir === 0 || isRail(regime)) {
      rec.startupEnd = t0;
      return;
    }
    if (regime === SLEW_UP || regime === SLEW_DOWN) {
      if ((regime === SLEW_UP ? 1 : -1) !== dir) rec.startupEnd = t0;
      return;
    }
    const G = this.scratch; // −dir·drive ≥ 0 means moving back
    const F = this.model.DRIVE;
    for (let i = 0; i < G.length; i++) G[i] = -dir * F[i];
    if (this.basis.valueAtStart(G) >= 0) {
      rec.startupEnd = t0;
      return;
    }
    const scan = this.scan;
    scan.start = t0;
    scan.span = tx;
    scan.firstExit(G);
    const tau = scan.exit;
    if (tau === tau) rec.startupEnd = t0 + tau;
  }
}
