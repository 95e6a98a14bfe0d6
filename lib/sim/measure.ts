// Measurements taken from the solution itself (never from the output sample grid), shared by
// both solvers. Solvers report level crossings of the output and sign changes of the
// differential input in time order; `finishMetrics` turns them into the Result JSON metrics.
import type { AmplifierMetrics, SimEvent, SimMetrics } from "./types";
import type { InputSignal } from "./signals";

/** Monitored output levels: 10 %, 50 % (events) and 90 % of the output span. */
export const LEVEL_10 = 0;
export const LEVEL_MID = 1;
export const LEVEL_90 = 2;
/** Monitor id of the differential-input sign change. */
export const MONITOR_VD = 3;

export class Recorder {
  readonly levels: Float64Array;
  readonly events: SimEvent[] = [];
  clippedTime = 0;
  maxSlew = 0;
  /**
   * End of the power-on transient: the output starts at the forced level (run.initialOutput)
   * and the transient lasts while it keeps moving away from it, i.e. until dvo/dt first
   * changes sign or the output is held at a rail. Edges before that are listed and counted as
   * transitions, but they are not caused by the input, so thresholds, chatter, period and duty
   * ignore them. Solvers set this before flushing the crossings of the piece where it happens.
   */
  startupEnd = Infinity;
  /** Initial direction of the output (+1 up, −1 down, 0 none). */
  startupDirection = 0;
  startupEvents = 0;
  /** Input when the output first reaches Voh / Vol (NaN until it does). */
  clipInputHigh = NaN;
  clipInputLow = NaN;
  /** Σ Δu·Δvo and Σ Δu² over linear-regime pieces after the power-on transient (amplifier gain). */
  gainCross = 0;
  gainInputSquares = 0;

  private lastL10Up = NaN;
  private lastL90Down = NaN;
  private riseStart = NaN;
  private fallStart = NaN;
  private riseSum = 0;
  private riseCount = 0;
  private fallSum = 0;
  private fallCount = 0;
  private lastVdCross = NaN;
  private lastEventTime = -Infinity;
  private delaySum = 0;
  private delayCount = 0;

  // Per-piece buffer so crossings of different monitors are dispatched in time order.
  private readonly bufTime = new Float64Array(256);
  private readonly bufCode = new Int32Array(256);
  private bufLen = 0;

  constructor(
    rails: { high: number; low: number },
    private readonly signal: InputSignal,
    /** Transport delay added to the measured propagation delay (see DEVELOPERS notes). */
    private readonly transportDelay: number,
  ) {
    const span = rails.high - rails.low;
    this.levels = Float64Array.of(rails.low + 0.1 * span, (rails.high + rails.low) / 2, rails.low + 0.9 * span);
  }

  /**
   * Time of the crossing pushCrossing queues. The exact solver's searches hand it over in this
   * field: a double passed to a call V8 does not inline is boxed into a new heap number.
   */
  crossingTime = 0;

  /** push(crossingTime, monitor, rising): small enough for V8 to inline into the searches. */
  pushCrossing(monitor: number, rising: boolean): void {
    this.push(this.crossingTime, monitor, rising);
  }

  /** Queue a crossing: monitor 0..2 = output level, 3 = vd sign change; rising = now on the high side. */
  push(time: number, monitor: number, rising: boolean): void {
    if (this.bufLen === this.bufTime.length) this.flush();
    this.bufTime[this.bufLen] = time;
    this.bufCode[this.bufLen] = monitor * 2 + (rising ? 1 : 0);
    this.bufLen++;
  }

  /** Dispatch queued crossings in time order (insertion sort: a piece holds only a few). */
  flush(): void {
    const n = this.bufLen;
    const T = this.bufTime;
    const C = this.bufCode;
    for (let i = 1; i < n; i++) {
      const t = T[i];
      const c = C[i];
      let j = i - 1;
      while (j >= 0 && T[j] > t) {
        T[j + 1] = T[j];
        C[j + 1] = C[j];
        j--;
      }
      T[j + 1] = t;
      C[j + 1] = c;
    }
    for (let i = 0; i < n; i++) this.dispatch(T[i], C[i] >> 1, (C[i] & 1) === 1);
    this.bufLen = 0;
  }

  private dispatch(time: number, monitor: number, rising: boolean): void {
    switch (monitor) {
      case LEVEL_10:
        if (rising) this.lastL10Up = time;
        else if (!Number.isNaN(this.fallStart)) {
          this.fallSum += time - this.fallStart;
          this.fallCount++;
          this.fallStart = NaN;
        }
        break;
      case LEVEL_90:
        if (!rising) this.lastL90Down = time;
        else if (!Number.isNaN(this.riseStart)) {
          this.riseSum += time - this.riseStart;
          this.riseCount++;
          this.riseStart = NaN;
        }
        break;
      case LEVEL_MID: {
        this.events.push({ time, edge: rising ? "rising" : "falling", input: this.signal.valueAt(time) });
        if (time < this.startupEnd) this.startupEvents++;
        if (rising) {
          this.riseStart = this.lastL10Up;
          this.fallStart = NaN;
        } else {
          this.fallStart = this.lastL90Down;
          this.riseStart = NaN;
        }
        if (!Number.isNaN(this.lastVdCross) && this.lastVdCross > this.lastEventTime) {
          this.delaySum += time - this.lastVdCross + this.transportDelay;
          this.delayCount++;
        }
        this.lastEventTime = time;
        break;
      }
      case MONITOR_VD:
        this.lastVdCross = time;
        break;
    }
  }

  riseTime(): number | null {
    return this.riseCount ? this.riseSum / this.riseCount : null;
  }
  fallTime(): number | null {
    return this.fallCount ? this.fallSum / this.fallCount : null;
  }
  propagationDelay(): number | null {
    return this.delayCount ? this.delaySum / this.delayCount : null;
  }
}

export function defaultHoldOff(duration: number, longestPeriod: number | null): number {
  return longestPeriod === null ? 0.01 * duration : Math.min(0.01 * duration, 0.01 * longestPeriod);
}

export function finishMetrics(
  rec: Recorder,
  opts: { duration: number; holdOff: number; inverting: boolean; amplifier: boolean; inputConnected: boolean },
): SimMetrics {
  const events = rec.events;
  const from = rec.startupEvents;
  // Output edges caused by the input crossing upward: rising for non-inverting stages,
  // falling for inverting ones (lib/schemas/README.md § Result JSON). A relaxation oscillator's input is
  // not connected, so no edge is caused by the input: its thresholds are null.
  const upEdge = opts.inverting ? "falling" : "rising";
  // One pass over the edges after the power-on transient, with no arrays in between (a noisy
  // run has thousands of edges; the sums run in edge order, as a reduce over them would).
  let upSum = 0;
  let upCount = 0;
  let downSum = 0;
  let downCount = 0;
  let chatter = 0;
  let risingCount = 0;
  let first = NaN;
  let last = NaN;
  for (let i = from; i < events.length; i++) {
    const e = events[i];
    if (e.edge === upEdge) {
      upSum += e.input;
      upCount++;
    } else {
      downSum += e.input;
      downCount++;
    }
    if (i > from && e.time - events[i - 1].time < opts.holdOff) chatter++;
    if (e.edge === "rising") {
      if (risingCount === 0) first = e.time;
      last = e.time;
      risingCount++;
    }
  }
  const upper = opts.inputConnected && upCount > 0 ? upSum / upCount : null;
  const lower = opts.inputConnected && downCount > 0 ? downSum / downCount : null;
  let period: number | null = null;
  let dutyCycle: number | null = null;
  if (risingCount >= 2) {
    period = (last - first) / (risingCount - 1);
    // High time of each period: from its rising edge to the first falling edge after it.
    let high = 0;
    let riseAt = NaN;
    for (let i = from; i < events.length; i++) {
      const e = events[i];
      if (e.time < first || e.time > last) continue;
      if (e.edge === "rising") {
        if (!Number.isNaN(riseAt)) high += e.time - riseAt;
        riseAt = e.time;
      } else if (!Number.isNaN(riseAt)) {
        high += e.time - riseAt;
        riseAt = NaN;
      }
    }
    dutyCycle = high / (last - first);
  }
  if (opts.amplifier) {
    // Amplifiers do not switch: no switching readings (lib/schemas/README.md § The circuit as built).
    return {
      transitions: null,
      upperThreshold: null,
      lowerThreshold: null,
      hysteresis: null,
      chatter: null,
      clippedFraction: Math.min(1, Math.max(0, rec.clippedTime / opts.duration)),
      maxSlewRate: rec.maxSlew,
      period: null,
      dutyCycle: null,
      propagationDelay: null,
      riseTime: null,
      fallTime: null,
      holdOff: opts.holdOff,
    };
  }
  return {
    transitions: rec.events.length,
    upperThreshold: upper,
    lowerThreshold: lower,
    hysteresis: upper !== null && lower !== null ? upper - lower : null,
    chatter,
    clippedFraction: Math.min(1, Math.max(0, rec.clippedTime / opts.duration)),
    maxSlewRate: rec.maxSlew,
    period,
    dutyCycle,
    propagationDelay: opts.amplifier ? null : rec.propagationDelay(),
    riseTime: rec.riseTime(),
    fallTime: rec.fallTime(),
    holdOff: opts.holdOff,
  };
}

/**
 * Amplifier readings. `gain` is the least-squares slope of output against input increments
 * over the solver's steady linear-regime pieces after the power-on transient (from the solution,
 * not from the samples); when the input does not move there it is the small-signal closed-loop
 * gain of the network, `smallSignalGain`. The clip inputs come from the solver (first arrival).
 */
export function amplifierMetrics(rec: Recorder, smallSignalGain: number): AmplifierMetrics {
  const finite = (x: number) => (Number.isFinite(x) ? x : null);
  const measured = rec.gainInputSquares > 0 ? rec.gainCross / rec.gainInputSquares : NaN;
  return {
    gain: finite(Number.isFinite(measured) ? measured : smallSignalGain),
    clipInputHigh: finite(rec.clipInputHigh),
    clipInputLow: finite(rec.clipInputLow),
  };
}
