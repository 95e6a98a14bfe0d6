"use client";
// Runs the draft in the simulation worker (SimWorkerClient over comlink): progress into the
// store, cancel through an AbortSignal (the client terminates and respawns its worker), and the
// waveforms into the bank — never into immer state.
import { useCallback, useEffect, useRef } from "react";
import { scenarioSchema } from "@/lib/schemas/scenario";
import { scenarioIssuesText } from "@/lib/workbench/screen-words";
import type { SimResult } from "@/lib/sim/types";
import type { SimWorkerClient } from "@/lib/client/sim-client";
import { minMax } from "@/lib/workbench/readings-logic";
import { useBank, useWbApi } from "./store";
import { refuseIfInvalid } from "./field-problems";

declare global {
  interface Window {
    /** Timing marks read by the e2e test: ms from pressing Run to the first drawn Trace. */
    __railwiseTimings?: {
      runStartedAt: number | null;
      /** ms from Run to the result arriving from the worker, and the solver's own time in it. */
      resultMs: number | null;
      simMs: number | null;
      firstPlot: { name: string; ms: number; points: number; resultMs: number | null; simMs: number | null }[];
    };
  }
}

export function timings() {
  if (typeof window === "undefined") return null;
  window.__railwiseTimings ??= { runStartedAt: null, resultMs: null, simMs: null, firstPlot: [] };
  return window.__railwiseTimings;
}

/** Called by the Trace plot when it has drawn a new result for the first time. */
export function markFirstPlot(name: string, points: number) {
  const tm = timings();
  if (!tm || tm.runStartedAt === null) return;
  performance.mark("railwise:first-plot");
  const ms = performance.now() - tm.runStartedAt;
  tm.firstPlot.push({ name, ms, points, resultMs: tm.resultMs, simMs: tm.simMs });
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

  const warming = useRef<Promise<unknown> | null>(null);

  // Spawn the worker as soon as the workbench mounts, and let it run a short slice of the
  // scenario (1/50 of the time, 64 points) so the solver is compiled before the first Run.
  useEffect(() => {
    const parsed = scenarioSchema.safeParse(api.getState().draft);
    warming.current = getClient()
      .then((c) => {
        if (!parsed.success) return null;
        const s = parsed.data;
        return c.run({ ...s, run: { ...s.run, duration: s.run.duration / 50, points: 64 } });
      })
      .catch(() => null)
      .finally(() => {
        warming.current = null;
        api.getState().setSolverReady(true);
      });
    return () => {
      abort.current?.abort();
      client.current?.dispose();
      client.current = null;
      loading.current = null;
    };
  }, [api, getClient]);

  const run = useCallback(async () => {
    const st = api.getState();
    if (st.status === "running") return;
    if (refuseIfInvalid(api, ["scenario"], "Run")) {
      st.runFailed("refused", null);
      return;
    }
    const revision = st.revision;
    const parsed = scenarioSchema.safeParse(st.draft);
    if (!parsed.success) {
      st.runFailed("error", `Fix these fields first — ${scenarioIssuesText(parsed.error.issues)}`);
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
      // A pending warm-up is short; cancelling it would cost a worker respawn instead.
      if (warming.current) await warming.current;
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
      if (tm && tm.runStartedAt !== null) {
        tm.resultMs = performance.now() - tm.runStartedAt;
        tm.simMs = result.solver.wallMs;
      }
      const [inputMin, inputMax] = minMax(result.input);
      const key = bank.put(result);
      api.getState().runFinished(
        key,
        {
          rails: result.rails,
          events: result.events,
          metrics: result.metrics,
          solver: result.solver,
          points: result.t.length,
          inputMin,
          inputMax,
          scenario: parsed.data,
          wallMs: performance.now() - started,
        },
        revision,
      );
    } catch (err) {
      if (tm) tm.runStartedAt = null;
      const cancelled = ac.signal.aborted || (err instanceof Error && /cancel|abort/i.test(err.name + err.message));
      api
        .getState()
        .runFailed(
          cancelled ? "cancelled" : "error",
          cancelled ? null : err instanceof Error ? err.message : String(err),
        );
    } finally {
      if (abort.current === ac) abort.current = null;
    }
  }, [api, bank, getClient]);

  const cancel = useCallback(() => abort.current?.abort(), []);

  return { run, cancel };
}
