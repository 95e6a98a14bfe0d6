// Simulation worker: a thin comlink `expose` around lib/sim. The scenario is validated again
// here (a worker never trusts its caller's shape), progress is throttled to about 10 per
// second, and the sample arrays are transferred, not copied.
import * as Comlink from "comlink";
import { parseScenario } from "@/lib/schemas/scenario";
import { simulate } from "@/lib/sim";
import type { SimResult, SolverName } from "@/lib/sim/types";

export interface SimWorkerRunOptions {
  solver?: SolverName;
  holdOff?: number;
}

const PROGRESS_INTERVAL_MS = 100;

const api = {
  run(scenario: unknown, options: SimWorkerRunOptions = {}, onProgress?: (fraction: number) => void): SimResult {
    const parsed = parseScenario(scenario);
    let last = -Infinity;
    const result = simulate(parsed, {
      solver: options.solver,
      holdOff: options.holdOff,
      onProgress: onProgress
        ? (f) => {
            const now = performance.now();
            if (now - last >= PROGRESS_INTERVAL_MS) {
              last = now;
              void onProgress(f);
            }
          }
        : undefined,
    });
    if (onProgress) void onProgress(1);
    // Every sample column goes over by transfer, the oscillator's capacitor included when present.
    const extra = (result as { capacitor?: unknown }).capacitor;
    const buffers = [result.t.buffer, result.input.buffer, result.output.buffer];
    if (extra instanceof Float64Array && !buffers.includes(extra.buffer)) buffers.push(extra.buffer);
    return Comlink.transfer(result, buffers as ArrayBuffer[]);
  },
};

export type SimWorkerApi = typeof api;

/** The exposed object itself, for tests that wire it to a MessagePort. */
export const simWorkerApi: SimWorkerApi = api;

// Only inside a worker (tests import this module in Node, where there is no worker scope).
const scope = globalThis as { WorkerGlobalScope?: abstract new () => unknown };
if (typeof scope.WorkerGlobalScope === "function" && globalThis instanceof scope.WorkerGlobalScope) Comlink.expose(api);
