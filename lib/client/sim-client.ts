// Browser side of the simulation worker. One worker per client; a run can be cancelled by an
// AbortSignal or `cancel()`: the worker is terminated (a busy worker cannot be interrupted
// otherwise) and a fresh one is spawned for the next run. A terminated worker never answers,
// so pending calls are raced against the abort (comlink#372, #601).
// Progress arrives through Comlink.proxy, throttled in the worker and again here.
// Results come back with their Float64Arrays transferred, not copied.
import * as Comlink from "comlink";
import type { Scenario } from "@/lib/schemas/scenario";
import type { SimResult, SolverName } from "@/lib/sim/types";
import { SimCancelled } from "@/lib/sim/errors";
import type { SimWorkerApi } from "@/workers/sim.worker";

export { SimCancelled };

export interface SimRunOptions {
  solver?: SolverName;
  holdOff?: number;
  /** Completed fraction 0…1, at most every `progressIntervalMs` (default 100 ms) plus a final 1. */
  onProgress?: (fraction: number) => void;
  signal?: AbortSignal;
}

function defaultWorker(): Worker {
  return new Worker(new URL("../../workers/sim.worker.ts", import.meta.url), { type: "module", name: "railwise-sim" });
}

export class SimWorkerClient {
  private worker: Worker | null = null;
  private remote: Comlink.Remote<SimWorkerApi> | null = null;
  private cancelCurrent: (() => void) | null = null;
  private disposed = false;

  constructor(
    private readonly createWorker: () => Worker = defaultWorker,
    private readonly progressIntervalMs = 100,
  ) {
    this.spawn();
  }

  private spawn(): void {
    this.worker = this.createWorker();
    this.remote = Comlink.wrap<SimWorkerApi>(this.worker);
  }

  private kill(): void {
    if (this.remote) this.remote[Comlink.releaseProxy]();
    this.worker?.terminate();
    this.worker = null;
    this.remote = null;
  }

  /** Run a scenario in the worker. A new run cancels the one still pending. */
  async run(scenario: Scenario, options: SimRunOptions = {}): Promise<SimResult> {
    if (this.disposed) throw new Error("SimWorkerClient was disposed");
    const { signal, onProgress } = options;
    if (signal?.aborted) throw new SimCancelled();
    this.cancel();
    if (!this.remote) this.spawn();
    const remote = this.remote!;

    let last = -Infinity;
    const progress = onProgress
      ? Comlink.proxy((f: number) => {
          const now = performance.now();
          if (f >= 1 || now - last >= this.progressIntervalMs) {
            last = now;
            onProgress(f);
          }
        })
      : undefined;

    let rejectAbort: (e: Error) => void = () => {};
    const aborted = new Promise<never>((_, reject) => {
      rejectAbort = reject;
    });
    const stop = () => {
      // Terminate now; the next run spawns a fresh worker.
      this.kill();
      rejectAbort(new SimCancelled());
    };
    this.cancelCurrent = stop;
    signal?.addEventListener("abort", stop, { once: true });
    try {
      return (await Promise.race([
        remote.run(scenario, { solver: options.solver, holdOff: options.holdOff }, progress),
        aborted,
      ])) as SimResult;
    } finally {
      signal?.removeEventListener("abort", stop);
      if (this.cancelCurrent === stop) this.cancelCurrent = null;
    }
  }

  /** Cancel the pending run, if any (terminate + respawn on the next run). */
  cancel(): void {
    this.cancelCurrent?.();
    this.cancelCurrent = null;
  }

  dispose(): void {
    this.cancel();
    this.kill();
    this.disposed = true;
  }
}
