// Study rows of the project benchmark (`npm run bench` calls `benchStudies()`; also runs alone:
// `npx tsx scripts/bench-studies.ts`). Node has no web workers: the pool is emulated with
// worker_threads running the same batch function (runStudyTasks) the browser's study worker
// runs, with the same splitting as lib/client/study-pool.ts. Wall times include starting the
// threads. Figures to reach (issue 7): 1,000 Monte Carlo draws of a 20,000-sample run < 3 s with
// 2 workers; a 20-level × 50-seed noise study of a demo scenario < 5 s. Each thread (and the
// in-process run) first runs 16 tasks untimed so the JIT has warmed up; thread start-up and
// that warm-up are printed apart. The machine's load average is printed with the table: on a
// shared 2-core box other processes can take most of the CPU.
import { Worker, isMainThread, parentPort } from "node:worker_threads";
import { parseScenario, type Scenario } from "@/lib/schemas/scenario";
import { simulate } from "@/lib/sim";
import type { SimulateFn } from "@/lib/sim/types";
import { DEMO_SCENARIOS } from "@/lib/demo/scenarios";
import { noiseMarginConfigSchema, toleranceSpreadConfigSchema } from "@/lib/schemas/study";
import { runStudyTasks, splitTasks, studyTaskCount, type StudyRequest, type TaskOutput } from "@/lib/studies/study";
import { summarizeNoiseMargin, type NoiseTaskOutput } from "@/lib/studies/noise-margin";
import { summarizeToleranceSpread } from "@/lib/studies/tolerance-spread";
import type { DrawOutput } from "@/lib/schemas/study";
import { STUDY_OUTPUT_POINTS } from "@/lib/studies/grid";

const THIS_FILE = __filename;
/** Tasks each thread runs once before timing (JIT warm-up). */
const WARM = 16;

interface Job {
  request: StudyRequest;
  start: number;
  end: number;
  /** Keep the scenario's own output grid (no coarse study grid), to show what that costs. */
  fullGrid: boolean;
}

/** simulate on the scenario's own output grid, whatever the task asked for. */
const onGrid =
  (points: number): SimulateFn =>
  (s, o) =>
    simulate({ ...s, run: { ...s.run, points } }, o);

if (!isMainThread && parentPort) {
  const port = parentPort;
  port.on("message", (job: Job) => {
    const sim = job.fullGrid ? onGrid(job.request.scenario.run.points) : simulate;
    port.postMessage(runStudyTasks(job.request, job.start, job.end, sim));
  });
  port.postMessage("ready");
}

const cpuMsSince = (c: NodeJS.CpuUsage) => {
  const d = process.cpuUsage(c);
  return (d.user + d.system) / 1000;
};

async function runInThreads(
  request: StudyRequest,
  workers: number,
  fullGrid = false,
): Promise<{ tasks: TaskOutput[]; ms: number; startMs: number; cpuMs: number }> {
  const t0 = performance.now();
  const total = studyTaskCount(request.config);
  const ranges = splitTasks(total, Math.max(1, Math.min(64, Math.ceil(total / (workers * 12)))));
  const outputs: TaskOutput[][] = new Array(ranges.length);
  // The thread loads this file through tsx's CommonJS hook (execArgv "--import tsx" is not
  // honoured for a .ts worker entry on Node 20).
  const boot = `require("tsx/cjs/api").register(); require(${JSON.stringify(THIS_FILE)});`;
  const threads = Array.from({ length: workers }, () => new Worker(boot, { eval: true }));
  // Thread start-up (loading and compiling the TypeScript) is timed apart from the study: a
  // browser's worker loads an already-bundled chunk instead.
  await Promise.all(threads.map((w) => new Promise((resolve) => w.once("message", resolve))));
  // Warm-up: each thread runs the first WARM tasks once (results dropped) so the JIT has seen
  // the code, as the in-process run below gets too. Counted in start-up, not in the study.
  await Promise.all(
    threads.map(
      (w) =>
        new Promise((resolve) => {
          w.once("message", resolve);
          w.postMessage({ request, start: 0, end: Math.min(WARM, total), fullGrid } satisfies Job);
        }),
    ),
  );
  const startMs = performance.now() - t0;
  const cpu0 = process.cpuUsage(); // process-wide: includes every worker thread
  let next = 0;
  try {
    await Promise.all(
      threads.map(async (w) => {
        while (next < ranges.length) {
          const j = next++;
          const [start, end] = ranges[j];
          outputs[j] = await new Promise<TaskOutput[]>((resolve, reject) => {
            const done = (out: TaskOutput[]) => {
              w.off("error", fail);
              resolve(out);
            };
            const fail = (err: Error) => {
              w.off("message", done);
              reject(err);
            };
            w.once("message", done);
            w.once("error", fail);
            w.postMessage({ request, start, end, fullGrid } satisfies Job);
          });
        }
      }),
    );
  } finally {
    await Promise.all(threads.map((w) => w.terminate()));
  }
  const cpuMs = cpuMsSince(cpu0);
  return { tasks: outputs.flat(), ms: performance.now() - t0 - startMs, startMs, cpuMs };
}

function inProcess(request: StudyRequest, fullGrid = false): { tasks: TaskOutput[]; ms: number; cpuMs: number } {
  const sim = fullGrid ? onGrid(request.scenario.run.points) : simulate;
  runStudyTasks(request, 0, Math.min(WARM, studyTaskCount(request.config)), sim); // same warm-up as a thread
  const t0 = performance.now();
  const cpu0 = process.cpuUsage();
  const tasks = runStudyTasks(request, 0, studyTaskCount(request.config), sim);
  return { tasks, ms: performance.now() - t0, cpuMs: cpuMsSince(cpu0) };
}

function demo(key: string): Scenario {
  return parseScenario(DEMO_SCENARIOS.find((d) => d.key === key)!.scenario);
}

export interface StudyBenchRow {
  case: string;
  mode: string;
  ms: number;
  /** CPU time of the study, all threads together (load-independent, unlike ms). */
  cpuMs: number;
  /** Thread start-up before the study (not in ms). */
  startMs?: number;
  target: string;
  note: string;
}

export async function benchStudies(): Promise<StudyBenchRow[]> {
  const rows: StudyBenchRow[] = [];
  const bilge = demo("bilge-float");
  const spread: StudyRequest = {
    scenario: { ...bilge, run: { ...bilge.run, points: 20_000 } },
    config: toleranceSpreadConfigSchema.parse({
      kind: "tolerance-spread",
      seed: 1,
      draws: 1000,
      resistorTolerance: 0.01,
      offsetTolerance: 0.002,
      headroomSpread: 0.2,
      distribution: "normal",
      probe: { kind: "scenario" },
      measures: ["upperThreshold", "lowerThreshold"],
      window: { upperThreshold: [2.95, 3.1], lowerThreshold: [1.9, 2.05] },
    }),
  };
  const a = await runInThreads(spread, 2);
  const s = summarizeToleranceSpread(spread.config as never, a.tasks as DrawOutput[]);
  rows.push({
    case: "Tolerance spread: 1,000 draws, bilge filter, 20,000-sample run",
    mode: "2 worker threads",
    ms: a.ms,
    cpuMs: a.cpuMs,
    startMs: a.startMs,
    target: "< 3000 ms",
    note: `inside window ${(100 * (s.insideShare ?? 0)).toFixed(1)} %; study grid ${STUDY_OUTPUT_POINTS} pts; solver failures ${s.failed}`,
  });
  const a1 = inProcess(spread);
  rows.push({
    case: "  same",
    mode: "1 thread, in-process",
    ms: a1.ms,
    cpuMs: a1.cpuMs,
    target: "",
    note: JSON.stringify(a1.tasks) === JSON.stringify(a.tasks) ? "identical to 2 threads" : "DIFFERS from 2 threads",
  });
  const af = await runInThreads(spread, 2, true);
  rows.push({
    case: "  same, full 20,000-point output per draw",
    mode: "2 worker threads",
    ms: af.ms,
    cpuMs: af.cpuMs,
    startMs: af.startMs,
    target: "",
    note: JSON.stringify(af.tasks) === JSON.stringify(a.tasks) ? "identical figures" : "figures differ",
  });

  const temp = demo("water-temperature-alarm");
  const noise: StudyRequest = {
    scenario: temp,
    config: noiseMarginConfigSchema.parse({
      kind: "noise-margin",
      seed: 1,
      rmsFrom: 0.002,
      rmsTo: 0.04,
      levels: 20,
      seedsPerLevel: 50,
      bandwidth: 5,
      limit: 0.01,
    }),
  };
  const b = await runInThreads(noise, 2);
  const ns = summarizeNoiseMargin(noise.config as never, b.tasks as NoiseTaskOutput[]);
  rows.push({
    case: "Noise margin study: 20 levels × 50 seeds, water-temperature alarm (6,000 pts, 600 s)",
    mode: "2 worker threads",
    ms: b.ms,
    cpuMs: b.cpuMs,
    startMs: b.startMs,
    target: "< 5000 ms",
    note: `chatter ≤ 1 % up to ${ns.safeRms !== null ? (ns.safeRms * 1e3).toFixed(1) + " mV" : "—"} rms; rule of thumb ${(ns.ruleOfThumbRms * 1e3).toFixed(1)} mV; solver failures ${ns.levels.reduce((a, l) => a + l.failed, 0)}`,
  });
  const b1 = inProcess(noise);
  rows.push({
    case: "  same",
    mode: "1 thread, in-process",
    ms: b1.ms,
    cpuMs: b1.cpuMs,
    target: "",
    note: JSON.stringify(b1.tasks) === JSON.stringify(b.tasks) ? "identical to 2 threads" : "DIFFERS from 2 threads",
  });
  return rows;
}

export function printStudyRows(rows: StudyBenchRow[]): void {
  const w = Math.max(...rows.map((r) => r.case.length));
  const os = require("node:os") as typeof import("node:os");
  console.log(
    `\nStudies (load average ${os
      .loadavg()
      .map((l) => l.toFixed(1))
      .join(" ")} on ${os.cpus().length} cores)`,
  );
  for (const r of rows) {
    const start = r.startMs !== undefined ? `(+${r.startMs.toFixed(0)} ms start+warm-up)` : "";
    console.log(
      `${r.case.padEnd(w)}  ${r.mode.padEnd(22)} ${r.ms.toFixed(0).padStart(6)} ms wall ${r.cpuMs.toFixed(0).padStart(6)} ms CPU ${start.padEnd(26)} ${r.target.padEnd(10)} ${r.note}`,
    );
  }
}

const isEntry = isMainThread && require.main === module;
if (isEntry) {
  benchStudies().then(printStudyRows, (err) => {
    console.error(err);
    process.exit(1);
  });
}
