"use client";
// Runs the draft in the simulation worker (SimWorkerClient over comlink): progress into the
// store, cancel through an AbortSignal (the client terminates and respawns its worker), and the
// waveforms into the bank — never into immer state.
import { useCallback, useEffect, useRef } from "react";
import { scenarioSchema, describeIssues } from "@/lib/schemas/scenario";
import type { SimResult } from "@/lib/sim/types";
import type { SimWorkerClient } from "@/lib/client/sim-client";
import { minMax } from "./readings-logic";
import { useBank, useWbApi } from "./store";

declare global {
  interface Window {
    /** Timing marks read by the e2e test: ms from pressing Run to the first drawn Trace. */
    __railwiseTimings?: { runStartedAt: number | null; firstPlot: { name: string; ms: number; points: number }[] };
  }
}

export function timings() {
  if (typeof window === "undefined") return null;
  window.__railwiseTimings ??= { runStartedAt: null, firstPlot: [] };
  return window.__railwiseTimings;
}

/** Called by the Trace plot when it has drawn a new result for the first time. */
export function markFirstPlot(name: string, points: number) {
  const tm = timings();
  if (!tm || tm.runStartedAt === null) return;
  performance.mark("railwise:first-plot");
  const ms = performance.now() - tm.runStartedAt;
  tm.firstPlot.push({ name, ms, points });
  tm.runStartedAt = null;
  try {
    performance.measure("railwise:run-to-plot", "railwise:run", "railwise:first-plot");
  } catch {
    // A missing start mark (page reloaded mid-run) only loses the measure, not the figure.
  }
}

export function useRunner() {
  const api = useWbApi();
  const bank = useBank();
  const client = useRef<SimWorkerClient | null>(null);
  const abort = useRef<AbortController | null>(null);
  const loading = useRef<Promise<SimWorkerClient> | null>(null);

  const getClient = useCallback(() => {
    if (client.current) return Promise.resolve(client.current);
    loading.current ??= import("@/lib/client/sim-client").then((m) => {
      client.current = new m.SimWorkerClient();
      return client.current;
    });
    return loading.current;
  }, []);

  // Spawn the worker as soon as the workbench mounts so the first Run does not wait for it.
  useEffect(() => {
    void getClient();
    return () => {
      abort.current?.abort();
      client.current?.dispose();
      client.current = null;
      loading.current = null;
    };
  }, [getClient]);

  const run = useCallback(async () => {
    const st = api.getState();
    if (st.status === "running") return;
    const parsed = scenarioSchema.safeParse(st.draft);
    if (!parsed.success) {
      st.runFailed("error", `Fix these fields first — ${describeIssues(parsed.error).join("; ")}`);
      return;
    }
    const tm = timings();
    performance.mark("railwise:run");
    if (tm) tm.runStartedAt = performance.now();
    st.runStarted();
    const ac = new AbortController();
    abort.current = ac;
    const started = performance.now();
    let lastProgress = 0;
    try {
      const c = await getClient();
      const result: SimResult = await c.run(parsed.data, {
        solver: parsed.data.run.solver,
        holdOff: parsed.data.run.holdOff,
        signal: ac.signal,
        onProgress: (p: number) => {
          // The store re-renders only the progress bar; skip sub-percent steps anyway.
          if (p - lastProgress >= 0.01 || p >= 1) {
            lastProgress = p;
            api.getState().runProgress(p);
          }
        },
      });
      const [inputMin, inputMax] = minMax(result.input);
      const key = bank.put(result);
      api.getState().runFinished(key, {
        rails: result.rails,
        events: result.events,
        metrics: result.metrics,
        solver: result.solver,
        points: result.t.length,
        inputMin,
        inputMax,
        scenario: parsed.data,
        wallMs: performance.now() - started,
      });
    } catch (err) {
      if (tm) tm.runStartedAt = null;
      const cancelled = ac.signal.aborted || (err instanceof Error && /cancel|abort/i.test(err.name + err.message));
      api.getState().runFailed(cancelled ? "cancelled" : "error", cancelled ? null : err instanceof Error ? err.message : String(err));
    } finally {
      if (abort.current === ac) abort.current = null;
    }
  }, [api, bank, getClient]);

  const cancel = useCallback(() => abort.current?.abort(), []);

  return { run, cancel };
}
