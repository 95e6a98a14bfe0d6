// The body of a server simulation worker thread (lib/server/sim-pool.ts runs it in piscina).
// Plain TypeScript on lib/sim, lib/studies and lib/schemas only — no "server-only", Next or
// database import — so esbuild can bundle it into one file that a worker thread loads under
// `next start`, `next dev` and the tests alike. Answers are plain objects (never thrown
// errors), because only plain data survives the trip back to the main thread intact.
import { setPriority } from "node:os";
import { checkRunBounds, simulate, toResultJson, type SimResult } from "@/lib/sim";
import type { SimOptions } from "@/lib/sim/types";
import type { StoredResultJson } from "@/lib/schemas/result";
import type { IssueJson } from "@/lib/schemas/responses";
import { describeIssues, scenarioSchema, type Scenario } from "@/lib/schemas/scenario";
import {
  buildSavedStudy,
  noiseTaskCount,
  noiseTaskScenario,
  runNoiseTask,
  runToleranceTask,
  StudyMismatch,
  toleranceTaskCount,
  toleranceTaskScenario,
  type SavedStudy,
  type StudyUpload,
} from "@/lib/studies";
import { studyCorners } from "@/lib/studies/corners";
import { minMaxIndices, pickAt } from "@/lib/plot/min-max";
import type { ErrorCode } from "./error-codes";

// The simulation threads run at a lower priority than the event loop of the main thread, so a
// request that waits on no simulation (health, lists) is served first. On Linux this applies
// to the calling thread only (setpriority(2): the nice value is per thread); elsewhere it may
// not be allowed, which is harmless. 19, the lowest: a busy simulation thread then gets about
// 1/70 of a core the request thread wants (the kernel's nice weights 1024 vs 15), not 1/10.
try {
  setPriority(19);
} catch {
  // not permitted here
}

/** Stored waveforms are thinned to at most this many points (the plots decimate anyway). */
export const MAX_STORED_POINTS = 4000;

export type SimTask =
  | { kind: "run"; scenario: unknown; budgetMs: number }
  | { kind: "study"; scenario: unknown; upload: StudyUpload; budgetMs: number };

export type SimAnswer =
  | { ok: true; kind: "run"; scenario: Scenario; result: StoredResultJson; elapsedMs: number }
  | { ok: true; kind: "study"; study: SavedStudy; elapsedMs: number; tasksRun: number }
  | { ok: false; code: ErrorCode; message: string; issues?: IssueJson[] };

export function storedResult(result: SimResult): StoredResultJson {
  const n = result.t.length;
  if (n <= MAX_STORED_POINTS) return toResultJson(result);
  // Input and output extremes both survive (lib/plot/min-max.ts, the thinner the plots use).
  const idx = minMaxIndices([result.input, result.output], MAX_STORED_POINTS);
  const pick = (a: Float64Array) => pickAt(a, idx);
  // Optional columns (capacitor, filter node, source units) are picked at the same indices.
  const opt = (a: Float64Array | undefined) => (a && a.length === n ? pick(a) : undefined);
  const thinned: SimResult = {
    ...result,
    t: pick(result.t),
    input: pick(result.input),
    output: pick(result.output),
    capacitor: opt(result.capacitor),
    filtered: opt(result.filtered),
    source: opt(result.source),
  };
  return { ...toResultJson(thinned), decimation: { from: n, kept: idx.length, method: "min-max" } };
}

/** Thrown inside a study task when the budget is spent; the name makes lib/studies re-throw it. */
class BudgetSpent extends Error {
  constructor() {
    super("budget spent");
    this.name = "SimCancelled";
  }
}

/** Thrown inside a study task past the run bounds; the name makes lib/studies re-throw it. */
class PastBounds extends Error {
  constructor(readonly reasons: string[]) {
    super(reasons.join("; "));
    this.name = "SimCancelled";
  }
}

const seconds = (ms: number) => `${Math.round(ms / 100) / 10} s`;

function parse(data: unknown): Scenario | SimAnswer {
  const parsed = scenarioSchema.safeParse(data);
  if (parsed.success) return parsed.data;
  return {
    ok: false,
    code: "invalid_input",
    message: `The stored scenario is not valid: ${describeIssues(parsed.error).join("; ")}`,
    issues: parsed.error.issues.map((i) => ({ path: ["scenario", ...i.path.map(String)], message: i.message })),
  };
}

function pastBounds(reasons: string[], path: (string | number)[], what: string): SimAnswer {
  return {
    ok: false,
    code: "invalid_input",
    message: `${what} is too large for the server: ${reasons.join("; ")}`,
    issues: reasons.map((message) => ({ path, message })),
  };
}

function overBudget(budgetMs: number, what: string): SimAnswer {
  return {
    ok: false,
    code: "over_budget",
    message: `${what} took longer than the server's budget of ${seconds(budgetMs)} per simulation and was stopped; shorten the run, lower run.points or the noise bandwidth.`,
  };
}

function sameNumber(a: unknown, b: unknown): boolean {
  if (typeof a === "number" && typeof b === "number")
    return Math.abs(a - b) <= 1e-9 * Math.max(1, Math.abs(a), Math.abs(b));
  return (a ?? null) === (b ?? null);
}

function sameOutput(server: object, client: object): boolean {
  const keys = new Set([...Object.keys(server), ...Object.keys(client)]);
  return [...keys].every((k) =>
    sameNumber((server as Record<string, unknown>)[k], (client as Record<string, unknown>)[k]),
  );
}

function runTask(task: Extract<SimTask, { kind: "run" }>): SimAnswer {
  const started = performance.now();
  const scenario = parse(task.scenario);
  if ("ok" in scenario) return scenario;
  const reasons = checkRunBounds(scenario);
  if (reasons.length) return pastBounds(reasons, ["scenario"], "This run");
  const deadline = started + task.budgetMs;
  try {
    const result = simulate(scenario, { shouldCancel: () => performance.now() > deadline });
    return { ok: true, kind: "run", scenario, result: storedResult(result), elapsedMs: performance.now() - started };
  } catch (err) {
    const name = err instanceof Error ? err.name : "";
    if (name === "SimCancelled") return overBudget(task.budgetMs, "This run");
    if (name === "SimFailed")
      return {
        ok: false,
        code: "invalid_input",
        message: `The simulation could not finish: ${(err as Error).message}`,
      };
    throw err;
  }
}

/**
 * Re-runs every task of the uploaded study here (not a sample), so the stored study holds only
 * server numbers; an upload that disagrees with the server on any task is refused naming it.
 * Every task goes through the same run bounds as a run, and the whole study shares one budget.
 */
function studyTask(task: Extract<SimTask, { kind: "study" }>): SimAnswer {
  const started = performance.now();
  const scenario = parse(task.scenario);
  if ("ok" in scenario) return scenario;
  const { upload } = task;
  const deadline = started + task.budgetMs;
  let tasksRun = 0;
  const bounded = (s: Scenario, options?: SimOptions): SimResult => {
    const reasons = checkRunBounds(s);
    if (reasons.length) throw new PastBounds(reasons);
    if (performance.now() > deadline) throw new BudgetSpent();
    tasksRun++;
    return simulate(s, { ...options, shouldCancel: () => performance.now() > deadline });
  };
  // Bounds first, before any work: noise tasks share the bandwidth, tolerance tasks the input.
  if (upload.noiseMargin) {
    const n = noiseTaskCount(upload.noiseMargin.config);
    if (n > 1) {
      const reasons = checkRunBounds(noiseTaskScenario(scenario, upload.noiseMargin.config, n - 1));
      if (reasons.length) return pastBounds(reasons, ["noiseMargin", "config", "bandwidth"], "This noise margin study");
    }
  }
  if (upload.toleranceSpread) {
    const reasons = checkRunBounds(toleranceTaskScenario(scenario, upload.toleranceSpread.config, 0));
    if (reasons.length) return pastBounds(reasons, ["toleranceSpread", "config"], "This tolerance spread");
  }
  try {
    const serverUpload: StudyUpload = { ...upload };
    if (upload.noiseMargin) {
      const { config, tasks } = upload.noiseMargin;
      const want = noiseTaskCount(config);
      if (tasks.length !== want)
        throw new StudyMismatch(
          `noiseMargin.tasks must hold ${want} outputs (1 reference + levels × seedsPerLevel), got ${tasks.length}`,
          "noiseMargin.tasks",
        );
      const server = tasks.map((_, i) => runNoiseTask(scenario, config, i, bounded));
      const bad = server.findIndex((s, i) => !sameOutput(s, tasks[i]));
      if (bad >= 0)
        throw new StudyMismatch(
          `noiseMargin.tasks[${bad}] does not match a re-run on this run's scenario`,
          `noiseMargin.tasks.${bad}`,
        );
      serverUpload.noiseMargin = { ...upload.noiseMargin, tasks: server };
    }
    if (upload.toleranceSpread) {
      const { config, tasks } = upload.toleranceSpread;
      const want = toleranceTaskCount(config);
      if (tasks.length !== want)
        throw new StudyMismatch(
          `toleranceSpread.tasks must hold ${want} outputs (1 nominal + draws), got ${tasks.length}`,
          "toleranceSpread.tasks",
        );
      const server = tasks.map((_, i) => runToleranceTask(scenario, config, i, bounded));
      const bad = server.findIndex((s, i) => !sameOutput(s, tasks[i]));
      if (bad >= 0)
        throw new StudyMismatch(
          `toleranceSpread.tasks[${bad}] does not match a re-run on this run's scenario`,
          `toleranceSpread.tasks.${bad}`,
        );
      serverUpload.toleranceSpread = { ...upload.toleranceSpread, tasks: server };
    }
    // Summaries from the server's own task outputs (spotChecks 0: task 0 is compared once more).
    const study = buildSavedStudy(scenario, serverUpload, bounded, {
      spotChecks: 0,
      corners: studyCorners(scenario, upload.toleranceSpread?.config),
    });
    return { ok: true, kind: "study", study, elapsedMs: performance.now() - started, tasksRun };
  } catch (err) {
    if (err instanceof PastBounds) return pastBounds(err.reasons, ["scenario"], "A task of this study");
    if (err instanceof StudyMismatch) {
      return {
        ok: false,
        code: "invalid_input",
        message: `${err.message}. Run the study again on this run's scenario before saving.`,
        issues: [{ path: err.field.split("."), message: err.message }],
      };
    }
    const name = err instanceof Error ? err.name : "";
    if (name === "SimCancelled") return overBudget(task.budgetMs, "This study");
    if (name === "SimFailed")
      return {
        ok: false,
        code: "invalid_input",
        message: `A study task could not finish: ${(err as Error).message}`,
      };
    throw err;
  }
}

export default function runSimTask(task: SimTask): SimAnswer {
  return task.kind === "run" ? runTask(task) : studyTask(task);
}
