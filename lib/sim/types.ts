// Public types of the simulation core. `railwise.result/1` is the JSON contract (lib/schemas/README.md § Result JSON);
// `SimResult` is the in-memory form with typed arrays (transferable from the worker).
import type { SimEvent, SimMetrics, SolverStats } from "@/lib/schemas/result";
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

// The JSON-facing shapes are declared once, as schemas in lib/schemas/result.ts; type-only, so
// the core never builds those schemas.
export type { AmplifierMetrics, ResultJson, SimEvent, SimMetrics, SolverStats } from "@/lib/schemas/result";

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

export type SimulateFn = (scenario: Scenario, options?: SimOptions) => SimResult;
