import "server-only";
// Server-side simulations run off the request thread, in a piscina worker-thread pool: each
// run has a wall-time budget (checked inside the solver, and a hard stop that ends the worker)
// and a heap limit (resourceLimits), so one large run can neither hold other requests nor take
// the process's memory. The worker body is lib/server/sim-worker.ts, bundled by esbuild on
// first use into one CommonJS file in the OS temp folder — Next bundles the server code, so a
// worker cannot load our TypeScript sources by path at run time without this step.
import { createHash } from "node:crypto";
import { existsSync, readFileSync } from "node:fs";
import { availableParallelism, tmpdir } from "node:os";
import path from "node:path";
import { AppError } from "./errors";
import type { SimAnswer, SimTask } from "./sim-worker";

export type { SimAnswer, SimTask } from "./sim-worker";

const num = (name: string, fallback: number) => {
  const v = Number(process.env[name]);
  return Number.isFinite(v) && v > 0 ? v : fallback;
};

/** Wall time one run may take inside a worker (RAILWISE_SIM_BUDGET_MS, default 20 s). */
export const runBudgetMs = () => num("RAILWISE_SIM_BUDGET_MS", 20_000);
/** Wall time one study upload may take (RAILWISE_STUDY_BUDGET_MS, default 60 s). */
export const studyBudgetMs = () => num("RAILWISE_STUDY_BUDGET_MS", 60_000);
/** Old-generation heap of each worker (RAILWISE_SIM_MEMORY_MB, default 512 MB). */
export const workerMemoryMb = () => num("RAILWISE_SIM_MEMORY_MB", 512);
/** Worker threads: one core is left to the request thread (RAILWISE_SIM_THREADS overrides). */
export const poolThreads = () =>
  Math.floor(num("RAILWISE_SIM_THREADS", Math.max(1, Math.min(4, availableParallelism() - 1))));
/** Tasks waiting for a thread before new ones are refused with 503. */
const MAX_QUEUE = 32;
/** How long a task may wait for a free thread, on top of its own budget, before the hard stop. */
const QUEUE_ALLOWANCE_MS = 120_000;

interface PoolLike {
  run(task: SimTask, options: { signal: AbortSignal }): Promise<SimAnswer>;
  queueSize: number;
  destroy(): Promise<void>;
}

declare global {
  /** One pool per server process, kept across hot reloads in development. */
  var railwiseSimPool: Promise<PoolLike> | undefined;
}

function projectRoot(): string {
  return process.env.RAILWISE_ROOT || process.cwd();
}

/** Bundles the worker once per source version; the file name carries the source hash. */
async function workerFile(): Promise<string> {
  const entry = path.join(/*turbopackIgnore: true*/ projectRoot(), "lib", "server", "sim-worker.ts");
  if (!existsSync(entry))
    throw new Error(`simulation worker source not found at ${entry} (set RAILWISE_ROOT to the project folder)`);
  const esbuild = await import("esbuild");
  // The hash covers the bundle's inputs: build to memory first, then write once.
  const built = await esbuild.build({
    entryPoints: [entry],
    bundle: true,
    platform: "node",
    format: "cjs",
    target: "node20",
    write: false,
    logLevel: "silent",
    absWorkingDir: projectRoot(),
    tsconfig: path.join(/*turbopackIgnore: true*/ projectRoot(), "tsconfig.json"),
  });
  const code = built.outputFiles[0].contents;
  const hash = createHash("sha256").update(code).digest("hex").slice(0, 16);
  const file = path.join(/*turbopackIgnore: true*/ tmpdir(), `railwise-sim-worker-${hash}.cjs`);
  const { writeFileSync, renameSync } = await import("node:fs");
  if (!existsSync(file) || createHash("sha256").update(readFileSync(file)).digest("hex").slice(0, 16) !== hash) {
    const temp = `${file}.${process.pid}.tmp`;
    writeFileSync(temp, code);
    renameSync(temp, file);
  }
  return file;
}

async function createPool(): Promise<PoolLike> {
  const { Piscina } = await import("piscina");
  const filename = await workerFile();
  const pool = new Piscina({
    filename,
    minThreads: 1,
    maxThreads: poolThreads(),
    maxQueue: MAX_QUEUE,
    idleTimeout: 60_000,
    resourceLimits: { maxOldGenerationSizeMb: workerMemoryMb(), maxYoungGenerationSizeMb: 64 },
  });
  // Piscina answers `any`; the worker (sim-worker.ts) answers a SimAnswer.
  return {
    run: (task, options) => pool.run(task, options) as Promise<SimAnswer>,
    get queueSize() {
      return pool.queueSize;
    },
    destroy: () => pool.destroy(),
  };
}

function pool(): Promise<PoolLike> {
  if (!globalThis.railwiseSimPool) {
    globalThis.railwiseSimPool = createPool().catch((err) => {
      globalThis.railwiseSimPool = undefined;
      throw err;
    });
  }
  return globalThis.railwiseSimPool;
}

/** Starts the pool (and bundles the worker) ahead of the first run; failures surface on use. */
export function warmSimPool(): void {
  void pool().catch((err) => console.error("[railwise] simulation pool could not start:", err));
}

function failure(answer: Extract<SimAnswer, { ok: false }>): AppError {
  return new AppError(answer.code, answer.message, answer.issues);
}

/**
 * Runs one task in the pool. Refusals from the worker (bounds, budget, invalid scenario, study
 * mismatch) become AppErrors with their status; a worker ended by the hard stop or by its heap
 * limit answers 422 saying which; a full queue answers 503.
 */
export async function runInPool<K extends SimTask["kind"]>(
  task: SimTask & { kind: K },
): Promise<Extract<SimAnswer, { ok: true; kind: K }>> {
  const p = await pool();
  if (p.queueSize >= MAX_QUEUE) {
    throw new AppError("busy", "The server is running too many simulations; try again in a minute.");
  }
  const hardStop = AbortSignal.timeout(task.budgetMs * 1.5 + 2_000 + QUEUE_ALLOWANCE_MS);
  let answer: SimAnswer;
  try {
    answer = await p.run(task, { signal: hardStop });
  } catch (err) {
    const code = (err as { code?: string }).code ?? "";
    const message = err instanceof Error ? err.message : String(err);
    if (code === "ERR_WORKER_OUT_OF_MEMORY" || /out of memory/i.test(message)) {
      throw new AppError(
        "over_memory",
        `This simulation needed more than the server's ${workerMemoryMb()} MB per run and was stopped; shorten the run or lower run.points.`,
      );
    }
    if (hardStop.aborted || (err instanceof Error && err.name === "AbortError")) {
      throw new AppError("over_budget", `This simulation did not finish within the server's budget and was stopped.`);
    }
    if (/queue is at limit/i.test(message))
      throw new AppError("busy", "The server is running too many simulations; try again in a minute.");
    throw err;
  }
  if (!answer.ok) throw failure(answer);
  return answer as Extract<SimAnswer, { ok: true; kind: K }>;
}
