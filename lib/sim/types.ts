// Public types of the simulation core. `railwise.result/1` is the JSON contract (lib/schemas/README.md § Result JSON);
// `SimResult` is the in-memory form with typed arrays (transferable from the worker).
import type { Scenario } from "@/lib/schemas/scenario";

export type SolverName = "exact" | "odex";

export interface SimOptions {
  /** Default "exact" (piecewise-exponential with event location); "odex" = GBS cross-check. */
  solver?: SolverName;
  /** Chatter hold-off in seconds; default 1 % of the run or of the input period, whichever is shorter. */
  holdOff?: number;
  /** Called with the completed fraction 0…1, throttled by the caller's needs. */
  onProgress?: (fraction: number) => void;
  /** Polled now and then; returning true aborts the run with a `SimCancelled` error. */
  shouldCancel?: () => boolean;
  /**
   * Step budget over the run: odex default 200,000 steps; exact default from the scenario's
   * size (`defaultPieceBudget`). A run that uses it up fails with SimFailed naming the time reached.
   */
  maxSteps?: number;
}

export interface SimEvent {
  time: number;
  edge: "rising" | "falling";
  /** Input (signal incl. noise) at the moment the output crossed mid-level. */
  input: number;
  /** The source value at the edge, when the scenario has a source (lib/sim/circuit). */
  source?: number;
}

/** Readings of an amplifier stage (lib/schemas/README.md § The circuit as built). */
export interface AmplifierMetrics {
  /** Measured vo/vin slope while the output is in its linear region. */
  gain: number | null;
  /** Input where the output first reaches Voh / Vol; null if it never does. */
  clipInputHigh: number | null;
  clipInputLow: number | null;
}

/** Switching metrics are null for the amplifier kinds (they do not switch). */
export interface SimMetrics {
  transitions: number | null;
  upperThreshold: number | null;
  lowerThreshold: number | null;
  hysteresis: number | null;
  chatter: number | null;
  clippedFraction: number;
  maxSlewRate: number;
  period: number | null;
  dutyCycle: number | null;
  /** Amplifier kinds only. */
  amplifier?: AmplifierMetrics;
  /** Thresholds in source units, when the scenario has a source (lib/sim/circuit). */
  source?: { unit: string; upperThreshold: number | null; lowerThreshold: number | null; hysteresis: number | null };
  /** Extras beyond the contract. */
  propagationDelay?: number | null;
  riseTime?: number | null;
  fallTime?: number | null;
  holdOff?: number;
}

export interface SolverStats {
  name: string;
  steps: number;
  evaluations: number;
  wallMs: number;
}

export interface SimResult {
  rails: { high: number; low: number };
  t: Float64Array;
  input: Float64Array;
  output: Float64Array;
  /** The timing-capacitor voltage (v−) of a relaxation oscillator. */
  capacitor?: Float64Array;
  /** The filter node (RC low-pass before the stage input), when the scenario has a filter. */
  filtered?: Float64Array;
  /** The input in source units, when the scenario has a source (lib/sim/circuit). */
  source?: Float64Array;
  events: SimEvent[];
  metrics: SimMetrics;
  solver: SolverStats;
}

export interface ResultJson {
  schema: "railwise.result/1";
  rails: { high: number; low: number };
  samples: {
    t: number[];
    input: number[];
    output: number[];
    capacitor?: number[];
    filtered?: number[];
    source?: number[];
  };
  events: SimEvent[];
  metrics: SimMetrics;
  solver: SolverStats;
}

export type SimulateFn = (scenario: Scenario, options?: SimOptions) => SimResult;
