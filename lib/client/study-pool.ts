// Pool of study workers for one study: one worker per core (1…8), contiguous batches handed
// out as workers free up, outputs merged in task order (so the result never depends on the
// pool size), progress over the whole study, and cancel = terminate every worker at once.
// Workers live only for the duration of a study: none is left running after it ends,
// succeeds, fails or is cancelled.
import * as Comlink from "comlink";
import type { StudyWorkerApi } from "@/workers/study.worker";
import { splitTasks, studyTaskCount, type StudyRequest, type TaskOutput } from "@/lib/studies/study";

export const MAX_POOL_SIZE = 8;

export class StudyCancelled extends Error {
  constructor() {
    super("Study cancelled");
    this.name = "StudyCancelled";
  }
}

export interface StudyProgress {
  done: number;
  total: number;
}

export interface StudyPoolOptions {
  /** Pool size; default navigator.hardwareConcurrency clamped to 1…8. */
  workers?: number;
  /** Tasks per batch; default about 12 batches per worker (even load, smooth progress). */
  batchSize?: number;
  onProgress?: (p: StudyProgress) => void;
  signal?: AbortSignal;
}

export interface StudyRunOutput {
  tasks: TaskOutput[];
  wallMs: number;
  workers: number;
}

export function defaultPoolSize(): number {
  const hc = typeof navigator !== "undefined" ? navigator.hardwareConcurrency : 1;
  return Math.min(MAX_POOL_SIZE, Math.max(1, Math.floor(hc || 1)));
}

/** Workers alive right now across all studies in this page. */
const live = new Set<Worker>();

function spawn(): { worker: Worker; api: Comlink.Remote<StudyWorkerApi> } {
  const worker = new Worker(new URL("../../workers/study.worker.ts", import.meta.url), {
    type: "module",
    name: "railwise-study",
  });
  live.add(worker);
  return { worker, api: Comlink.wrap<StudyWorkerApi>(worker) };
}

export async function runStudyInPool(request: StudyRequest, options: StudyPoolOptions = {}): Promise<StudyRunOutput> {
  const started = performance.now();
  const total = studyTaskCount(request.config);
  const size = Math.min(MAX_POOL_SIZE, Math.max(1, Math.floor(options.workers ?? defaultPoolSize())));
  const batch = options.batchSize ?? Math.max(1, Math.min(64, Math.ceil(total / (size * 12))));
  const ranges = splitTasks(total, batch);
  const outputs: TaskOutput[][] = new Array(ranges.length);
  const { signal, onProgress } = options;
  if (signal?.aborted) throw new StudyCancelled();

  const pool = Array.from({ length: Math.min(size, ranges.length) }, spawn);
  let next = 0;
  let done = 0;
  let stopped = false;
  const stop = () => {
    if (stopped) return;
    stopped = true;
    for (const { worker, api } of pool) {
      api[Comlink.releaseProxy]();
      worker.terminate();
      live.delete(worker);
    }
  };
  // A terminated worker never answers: race the pending calls against the abort (comlink#372).
  let onAbort: () => void = () => {};
  const aborted = new Promise<never>((_, reject) => {
    onAbort = () => {
      stop();
      reject(new StudyCancelled());
    };
    signal?.addEventListener("abort", onAbort, { once: true });
  });
  const lanes = pool.map(async ({ api }) => {
    while (!stopped && next < ranges.length) {
      const j = next++;
      const [a, b] = ranges[j];
      outputs[j] = await api.runBatch(request, a, b);
      done += b - a;
      onProgress?.({ done, total });
    }
  });
  try {
    await Promise.race([Promise.all(lanes), aborted]);
  } finally {
    signal?.removeEventListener("abort", onAbort);
    stop();
  }
  return { tasks: outputs.flat(), wallMs: performance.now() - started, workers: pool.length };
}
