// `npm run bench`: the performance table of the simulation core, in one run, side by side.
//  1. noisy Schmitt trigger with 1,000,000 noise segments, 1,001 output points (exact solver):
//     in-process wall time (median of 7 after 5 warm-ups; the first, cold run is shown too),
//     CPU time, garbage collections during
//     the timed runs (a solver that allocated per step would trigger many), and peak memory
//     growth measured in a fresh child process.
//  2. 60 s slow ramp through a stiff 10 MHz-GBW amplifier: exact solver vs odex on the same run,
//     and their ratio. odex cannot finish a stiff run; it gets a large step budget and the table
//     says how far it got and how long that took (the ratio is then a lower bound).
//  3. a non-stiff Schmitt run, exact vs odex, for context.
//  4. a sine-driven Schmitt trigger with heavy (0.3 V rms) and light (0.02 V rms) noise,
//     1,000,000 noise segments each, beside the same model's C loop (scripts/bench/model-loop.c,
//     compiled here with gcc -O2 and run by this bench: the same regimes located inside each
//     segment and the same noise bit for bit) and the ratio; target ≤ 3× on each, and the C
//     loop's edge count equal to the solver's.
//  5. start time of the compiled `railwise` bin (`node build/cli/railwise.cjs simulate -` with
//     a small scenario on stdin): median of 20 runs after 3 warm-ups, and hyperfine's figure
//     when hyperfine is installed; `node -e 0` beside it for Node's own start.
//  then the study rows (scripts/bench-studies.ts) and, when scripts/bench-load.ts exists, the
//  server load test as the last section.
// GCs are counted from PerformanceObserver "gc" entries whose start falls inside a timed run
// (the entries arrive asynchronously, so they are matched by time after the runs).
// Flags: --only-sine (just section 4), --only-load (just the load test), --no-cli (skip 5),
// --no-studies, --no-load.
import { spawnSync } from "node:child_process";
import { existsSync, mkdirSync, readFileSync, statSync, writeFileSync } from "node:fs";
import os from "node:os";
import path from "node:path";
import { constants, PerformanceObserver } from "node:perf_hooks";
import { parseScenario, type Scenario } from "@/lib/schemas/scenario";
import { buildSync } from "esbuild";
import { outputLimits } from "@/lib/sim";
import type { SimOptions, SimResult } from "@/lib/sim/types";
import { noiseKnots, noiseSegmentCount } from "@/lib/sim/noise";

const NOISY: Scenario = parseScenario({
  schema: "railwise.scenario/1",
  name: "bench: noisy Schmitt trigger",
  supply: { positive: 5, negative: 0 },
  opamp: {
    openLoopGain: 2e5,
    gainBandwidth: 1e6,
    slewRate: 1e6,
    outputHeadroomHigh: 0.05,
    outputHeadroomLow: 0.05,
    inputOffset: 1e-3,
  },
  stage: { kind: "schmitt-noninverting", rInput: 10e3, rFeedback: 100e3, reference: 2.5 },
  input: {
    components: [{ kind: "triangle", amplitude: 1, frequency: 50, offset: 2.5 }],
    noise: { rms: 0.02, bandwidth: 5e6, seed: 7 },
  },
  run: { duration: 0.1, points: 1001 },
});

const STIFF: Scenario = parseScenario({
  schema: "railwise.scenario/1",
  name: "bench: 60 s ramp through a 10 MHz amplifier",
  supply: { positive: 5, negative: -5 },
  opamp: {
    openLoopGain: 2e5,
    gainBandwidth: 10e6,
    slewRate: 10e6,
    outputHeadroomHigh: 0.5,
    outputHeadroomLow: 0.5,
    inputOffset: 0,
  },
  stage: { kind: "noninverting-amplifier", rGround: 10e3, rFeedback: 10e3, reference: 0 },
  input: { components: [{ kind: "ramp", from: -3, to: 3, start: 0, duration: 60 }] },
  run: { duration: 60, points: 1001 },
});

const NONSTIFF: Scenario = parseScenario({
  schema: "railwise.scenario/1",
  name: "bench: Schmitt trigger, triangle",
  supply: { positive: 5, negative: -5 },
  opamp: {
    openLoopGain: 2e5,
    gainBandwidth: 1e6,
    slewRate: 1e6,
    outputHeadroomHigh: 0,
    outputHeadroomLow: 0,
    inputOffset: 0,
  },
  stage: { kind: "schmitt-noninverting", rInput: 10e3, rFeedback: 100e3, reference: 0 },
  input: { components: [{ kind: "triangle", amplitude: 2, frequency: 100 }] },
  run: { duration: 0.02, points: 1001 },
});

/** The sine case of issue 10: heavy noise; SINE_LIGHT is the same with 0.02 V rms. */
const sineSchmitt = (rms: number): Scenario =>
  parseScenario({
    schema: "railwise.scenario/1",
    name: `bench: sine Schmitt trigger, noise ${rms} V rms`,
    supply: { positive: 5, negative: 0 },
    opamp: {
      openLoopGain: 2e5,
      gainBandwidth: 10e6,
      slewRate: 10e6,
      outputHeadroomHigh: 0.05,
      outputHeadroomLow: 0.05,
      inputOffset: 0,
    },
    stage: { kind: "schmitt-noninverting", rInput: 10e3, rFeedback: 50e3, reference: 2.5 },
    input: {
      components: [{ kind: "sine", amplitude: 2, frequency: 3, offset: 2.5 }],
      noise: { rms, bandwidth: 500e3, seed: 7 },
    },
    run: { duration: 1, points: 1001 },
  });
const SINE_HEAVY = sineSchmitt(0.3);
const SINE_LIGHT = sineSchmitt(0.02);

const ODEX_BUDGET = 100_000;
const ROOT = path.resolve(__dirname, "..");

/**
 * The simulation core as it ships: lib/sim bundled by esbuild into one file, as the railwise
 * bin and the browser's worker run it. Under tsx each module's exports are getter functions,
 * and the solver's hot loops read their slot and regime constants through them (a sixth to a
 * third of a sine run in a CPU profile), a cost no shipped build has. Rebuilt on every bench
 * run (a fraction of a second).
 */
function bundledCore(): typeof import("@/lib/sim") {
  const outfile = path.join(ROOT, "build/bench/sim-core.cjs");
  buildSync({
    absWorkingDir: ROOT,
    entryPoints: ["lib/sim/index.ts"],
    outfile,
    bundle: true,
    platform: "node",
    format: "cjs",
    target: "node20",
    tsconfig: "tsconfig.json",
    logLevel: "warning",
  });
  return require(outfile);
}
const { SimFailed, simulate } = bundledCore();
const flag = (name: string) => process.argv.includes(name);

interface Timing {
  wallMs: number;
  cpuMs: number;
  /** [start, end] (performance.now) of every timed run, for matching GC entries. */
  intervals: [number, number][];
  result: SimResult | null;
  error?: string;
  coldMs?: number;
}

const gcStarts: { start: number; major: boolean }[] = [];
const gcObserver = new PerformanceObserver((list) => {
  for (const e of list.getEntries()) {
    // detail.kind: perf_hooks.constants.NODE_PERFORMANCE_GC_MINOR (scavenge) or MAJOR / INCREMENTAL / WEAKCB
    const kind = (e as PerformanceEntry & { detail?: { kind?: number } }).detail?.kind;
    gcStarts.push({ start: e.startTime, major: kind !== constants.NODE_PERFORMANCE_GC_MINOR });
  }
});

/** Let the observer deliver pending "gc" entries (they arrive after the synchronous runs). */
const flushGcEntries = () => new Promise((resolve) => setTimeout(resolve, 20));

/** Garbage collections that started inside the timed runs (call after flushGcEntries). */
const gcsDuring = (t: Timing) => {
  const inside = gcStarts.filter((g) => t.intervals.some(([a, b]) => g.start >= a && g.start <= b));
  const major = inside.filter((g) => g.major).length;
  return {
    count: inside.length,
    label: inside.length ? `${inside.length} (${inside.length - major} minor, ${major} other)` : "0",
  };
};

function timeOnce(s: Scenario, o: SimOptions = {}): Timing {
  const c0 = process.cpuUsage();
  const t0 = performance.now();
  let result: SimResult | null = null;
  let error: string | undefined;
  try {
    result = simulate(s, o);
  } catch (e) {
    if (!(e instanceof SimFailed)) throw e;
    error = e.message;
  }
  const t1 = performance.now();
  const c = process.cpuUsage(c0);
  return { wallMs: t1 - t0, cpuMs: (c.user + c.system) / 1000, intervals: [[t0, t1]], result, error };
}

function median(s: Scenario, o: SimOptions = {}, warm = 5, runs = 7): Timing {
  let coldMs = 0;
  for (let i = 0; i < warm; i++) {
    const t = timeOnce(s, o);
    if (i === 0) coldMs = t.wallMs;
  }
  const all = Array.from({ length: runs }, () => timeOnce(s, o)).sort((a, b) => a.wallMs - b.wallMs);
  const mid = all[Math.floor(runs / 2)];
  return { ...mid, intervals: all.flatMap((t) => t.intervals), coldMs };
}

const MEMORY_CASES: Record<string, Scenario> = { triangle: NOISY, "sine-heavy": SINE_HEAVY };

/** Child process: peak memory growth of one noisy run, from a clean baseline. */
function memoryChild(scenario: Scenario): void {
  const gc = (globalThis as { gc?: () => void }).gc;
  gc?.();
  const rss0 = process.memoryUsage().rss;
  let peak = rss0;
  const sample = () => {
    const r = process.memoryUsage().rss;
    if (r > peak) peak = r;
  };
  simulate(scenario, { onProgress: sample });
  sample();
  const maxRss = process.resourceUsage().maxRSS * 1024;
  process.stdout.write(JSON.stringify({ growth: Math.max(peak, maxRss) - rss0, sampled: peak - rss0 }));
}

function memoryGrowth(which: keyof typeof MEMORY_CASES): { growth: number; sampled: number } | null {
  const r = spawnSync(
    process.execPath,
    [...process.execArgv, "--expose-gc", process.argv[1], "--memory-child", which],
    {
      encoding: "utf8",
      timeout: 120_000,
    },
  );
  try {
    return JSON.parse(r.stdout);
  } catch {
    process.stderr.write(`memory child failed: ${r.stderr}\n`);
    return null;
  }
}

const memoryRow = (mem: { growth: number; sampled: number } | null) => [
  "  peak memory growth (fresh process)",
  "exact",
  "",
  "",
  "",
  "",
  "",
  mem ? `${mb(mem.growth)} MB (sampled during run ${mb(mem.sampled)} MB)` : "not measured",
  "< 100 MB",
  mem ? (mem.growth < 100 * 1048576 ? "yes" : "NO") : "?",
];

const ms = (x: number) => (x < 10 ? x.toFixed(2) : x < 100 ? x.toFixed(1) : Math.round(x).toLocaleString("en"));
const mb = (x: number) => (x / 1048576).toFixed(1);

function table(rows: string[][]): string {
  const widths = rows[0].map((_, c) => Math.max(...rows.map((r) => r[c].length)));
  const line = (r: string[]) =>
    r
      .map((cell, c) => cell.padEnd(widths[c]))
      .join("  ")
      .trimEnd();
  return [line(rows[0]), widths.map((w) => "-".repeat(w)).join("  "), ...rows.slice(1).map(line)].join("\n");
}

async function main(): Promise<void> {
  if (flag("--memory-child")) {
    memoryChild(MEMORY_CASES[process.argv[process.argv.indexOf("--memory-child") + 1]] ?? NOISY);
    return;
  }
  gcObserver.observe({ entryTypes: ["gc"] });
  const load = os
    .loadavg()
    .map((x) => x.toFixed(2))
    .join(" ");
  process.stdout.write(
    `Railwise sim bench — Node ${process.version}, ${os.cpus().length} CPUs, load average ${load}\n`,
  );
  process.stdout.write(
    "wall = median of 7 in-process runs after 5 warm-ups (3 for the sine rows; cold = the very first run, JIT not warm); cpu = process CPU time of the median run\n" +
      "(wall ≫ cpu means other processes were competing for the 2 cores)\n\n",
  );
  if (flag("--only-load")) {
    loadSection();
    return;
  }
  if (!flag("--only-sine")) await coreRows();
  await sineRows();
  if (!flag("--only-sine") && !flag("--no-cli")) cliRows();
  gcObserver.disconnect();
  if (!flag("--only-sine") && !flag("--no-studies")) {
    const { benchStudies, printStudyRows } = await import("./bench-studies");
    printStudyRows(await benchStudies());
  }
  if (!flag("--only-sine") && !flag("--no-load")) loadSection();
}

async function coreRows(): Promise<void> {
  const segments = noiseSegmentCount(NOISY.input.noise!, NOISY.run.duration);
  const noisy = median(NOISY);
  const mem = memoryGrowth("triangle");
  const stiffExact = median(STIFF);
  // odex on the stiff run: one timed attempt with a large step budget (it cannot finish).
  const stiffOdex = timeOnce(STIFF, { solver: "odex", maxSteps: ODEX_BUDGET });
  const nsExact = median(NONSTIFF);
  const nsOdex = median(NONSTIFF, { solver: "odex" }, 1, 3);
  await flushGcEntries();

  const odexNote = stiffOdex.result
    ? `finished, ${stiffOdex.result.solver.steps.toLocaleString("en")} steps`
    : `${stiffOdex.error?.replace(/; this run is stiff.*/, "")}`;
  const reached = stiffOdex.error
    ? Number(/at t = ([\d.e+-]+) s/.exec(stiffOdex.error)?.[1] ?? NaN)
    : STIFF.run.duration;
  const ratio = stiffOdex.wallMs / stiffExact.wallMs;
  const extrapolated =
    Number.isFinite(reached) && reached > 0 ? (stiffOdex.wallMs * STIFF.run.duration) / reached : Infinity;

  const n = noisy.result!;
  const rows = [
    ["case", "solver", "wall ms", "cpu ms", "cold ms", "steps", "GCs (7 runs)", "notes", "target", "met"],
    [
      `noisy Schmitt, ${segments.toLocaleString("en")} noise segments, 1,001 points`,
      "exact",
      ms(noisy.wallMs),
      ms(noisy.cpuMs),
      cold(noisy),
      n.solver.steps.toLocaleString("en"),
      gcsDuring(noisy).label,
      `${n.metrics.transitions} edges, chatter ${n.metrics.chatter}`,
      "≤ 120 ms",
      noisy.wallMs <= 120 ? "yes" : "NO",
    ],
    memoryRow(mem),
    [
      "60 s ramp, 10 MHz GBW amplifier (stiff)",
      "exact",
      ms(stiffExact.wallMs),
      ms(stiffExact.cpuMs),
      cold(stiffExact),
      stiffExact.result!.solver.steps.toLocaleString("en"),
      gcsDuring(stiffExact).label,
      `clipped ${(stiffExact.result!.metrics.clippedFraction * 100).toFixed(2)} %`,
      "≤ 50 ms",
      stiffExact.wallMs <= 50 ? "yes" : "NO",
    ],
    [
      "60 s ramp, 10 MHz GBW amplifier (stiff)",
      "odex",
      ms(stiffOdex.wallMs),
      ms(stiffOdex.cpuMs),
      "",
      stiffOdex.result
        ? stiffOdex.result.solver.steps.toLocaleString("en")
        : `${ODEX_BUDGET.toLocaleString("en")} (limit)`,
      gcsDuring(stiffOdex).label,
      odexNote,
      "",
      "",
    ],
    [
      "  ratio odex / exact on the stiff run",
      "",
      `${stiffOdex.result ? "" : "≥ "}${Math.round(ratio).toLocaleString("en")}×`,
      "",
      "",
      "",
      "",
      stiffOdex.result
        ? ""
        : `odex covered ${reached.toPrecision(3)} s of 60 s; full run extrapolated ≈ ${Number.isFinite(extrapolated) ? Math.round(extrapolated / 1000).toLocaleString("en") + " s" : "never"}`,
      "≥ 100×",
      ratio >= 100 ? "yes" : "NO",
    ],
    [
      "Schmitt, triangle (not stiff)",
      "exact",
      ms(nsExact.wallMs),
      ms(nsExact.cpuMs),
      cold(nsExact),
      nsExact.result!.solver.steps.toLocaleString("en"),
      gcsDuring(nsExact).label,
      `${nsExact.result!.metrics.transitions} edges`,
      "",
      "",
    ],
    [
      "Schmitt, triangle (not stiff)",
      "odex",
      ms(nsOdex.wallMs),
      ms(nsOdex.cpuMs),
      cold(nsOdex),
      nsOdex.result!.solver.steps.toLocaleString("en"),
      gcsDuring(nsOdex).label,
      `ratio odex/exact ${Math.round(nsOdex.wallMs / nsExact.wallMs)}×`,
      "",
      "",
    ],
  ];
  process.stdout.write(table(rows) + "\n");
}

const cold = (t: Timing) => (t.coldMs === undefined ? "" : ms(t.coldMs));

interface CLoop {
  medianMs: number;
  minMs: number;
  edges: number;
  finalOutput: number;
  /** segments the C loop cut short (its piece guard); 0 expected */
  stalls: number;
  /** its first three noise knots, compared bit for bit with lib/sim/noise.ts */
  knots: number[];
}

/**
 * Compile scripts/bench/model-loop.c with gcc -O2 (when missing or older than the source);
 * -ffp-contract=off keeps gcc from fusing a multiply and an add, which would change the noise's
 * last bits on a machine with FMA.
 */
function buildCLoop(): { exe: string } | { problem: string } {
  const source = path.join(ROOT, "scripts/bench/model-loop.c");
  const exe = path.join(ROOT, "build/bench/model-loop");
  if (existsSync(exe) && statSync(exe).mtimeMs >= statSync(source).mtimeMs) return { exe };
  mkdirSync(path.dirname(exe), { recursive: true });
  const r = spawnSync("gcc", ["-O2", "-ffp-contract=off", "-o", exe, source, "-lm"], { encoding: "utf8" });
  if (r.error || r.status !== 0) return { problem: `gcc -O2 failed: ${r.error?.message ?? r.stderr.trim()}` };
  return { exe };
}

/** The same model as the scenario, as the C loop's arguments (lib/schemas/README.md § Stage topologies). */
function runCLoop(exe: string, s: Scenario, repeats = 7): CLoop | { problem: string } {
  const stage = s.stage;
  if (stage.kind !== "schmitt-noninverting" || typeof stage.reference !== "number" || !s.input.noise) {
    return { problem: "the C loop models a non-inverting Schmitt trigger with a fixed reference and noise" };
  }
  const sine = s.input.components[0];
  if (s.input.components.length !== 1 || sine.kind !== "sine")
    return { problem: "the C loop takes one sine component" };
  const rails = outputLimits(s);
  const sum = stage.rInput + stage.rFeedback;
  const args = [
    stage.rFeedback / sum, // alpha: weight of the input at v+
    stage.rInput / sum, // beta: weight of the output at v+
    -stage.reference + s.opamp.inputOffset, // delta: v− = reference, Vos folded in
    s.opamp.openLoopGain,
    s.opamp.gainBandwidth,
    s.opamp.slewRate,
    s.opamp.slewRateFall ?? s.opamp.slewRate,
    rails.high,
    rails.low,
    sine.amplitude,
    sine.frequency,
    sine.offset ?? 0,
    s.input.noise.rms,
    s.input.noise.seed,
    noiseSegmentCount(s.input.noise, s.run.duration),
    s.run.duration,
    s.run.points,
    repeats,
  ].map(String);
  const r = spawnSync(exe, args, { encoding: "utf8", timeout: 120_000 });
  if (r.status !== 0) return { problem: `C loop failed: ${r.stderr.trim() || r.error?.message}` };
  return JSON.parse(r.stdout) as CLoop;
}

/** Whether the C loop's first noise knots are lib/sim/noise.ts's, bit for bit. */
function knotsCheck(c: CLoop, s: Scenario): string {
  const ours = noiseKnots(s.input.noise!, s.run.duration);
  const same = c.knots.length === 3 && c.knots.every((k, i) => Object.is(k, ours[i]));
  return same
    ? "same noise knots"
    : `noise knots DIFFER (${c.knots.join(", ")} vs ${Array.from(ours.subarray(0, 3)).join(", ")})`;
}

async function sineRows(): Promise<void> {
  const built = buildCLoop();
  const rows = [["case", "solver", "wall ms", "cpu ms", "cold ms", "steps", "GCs (7 runs)", "notes", "target", "met"]];
  for (const [label, scenario, memoryCase] of [
    ["sine Schmitt, noise 0.3 V rms", SINE_HEAVY, "sine-heavy"],
    ["sine Schmitt, noise 0.02 V rms", SINE_LIGHT, null],
  ] as const) {
    const segments = noiseSegmentCount(scenario.input.noise!, scenario.run.duration);
    const ours = median(scenario, {}, 3, 7);
    await flushGcEntries();
    const r = ours.result;
    const c = "exe" in built ? runCLoop(built.exe, scenario) : built;
    const ratio = "medianMs" in c ? ours.wallMs / c.medianMs : Number.NaN;
    rows.push(
      [
        `${label}, ${segments.toLocaleString("en")} segments, 1,001 points`,
        "exact",
        ms(ours.wallMs),
        ms(ours.cpuMs),
        cold(ours),
        r ? r.solver.steps.toLocaleString("en") : "",
        gcsDuring(ours).label,
        r ? `${r.metrics.transitions} edges, chatter ${r.metrics.chatter}` : `failed: ${ours.error}`,
        "no GC",
        gcsDuring(ours).count === 0 ? "yes" : "NO",
      ],
      [
        "  C loop, same model (gcc -O2)",
        "C",
        "medianMs" in c ? ms(c.medianMs) : "",
        "",
        "",
        segments.toLocaleString("en"),
        "",
        "medianMs" in c
          ? `median of 7 after 2 warm-ups (min ${ms(c.minMs)}); ${c.edges} edges${c.stalls ? `, ${c.stalls} stalled segments` : ""}; ${knotsCheck(c, scenario)}`
          : c.problem,
        "",
        "",
      ],
      [
        "  edges, exact vs C loop",
        "",
        "",
        "",
        "",
        "",
        "",
        "medianMs" in c && r ? `${r.metrics.transitions} vs ${c.edges}` : "n/a",
        "equal",
        "medianMs" in c && r ? (r.metrics.transitions === c.edges && c.stalls === 0 ? "yes" : "NO") : "?",
      ],
      [
        "  ratio exact / C loop",
        "",
        Number.isFinite(ratio) ? `${ratio.toFixed(1)}×` : "n/a",
        "",
        "",
        "",
        "",
        "",
        "≤ 3×",
        Number.isFinite(ratio) ? (ratio <= 3 ? "yes" : "NO") : "?",
      ],
    );
    if (memoryCase) {
      const mem = memoryGrowth(memoryCase);
      rows.push(memoryRow(mem));
    }
  }
  process.stdout.write("\nSine input beside the same model's C loop (this machine, this run)\n" + table(rows) + "\n");
  if ("exe" in built) {
    // Sanity check of the C loop: without noise a Schmitt trigger switches twice per period of
    // a sine that crosses both switching points, so 3 Hz over 1 s gives 6 edges (common practice, no source).
    const quiet = runCLoop(built.exe, sineSchmitt(1e-12), 1);
    const edges = "edges" in quiet ? quiet.edges : Number.NaN;
    process.stdout.write(`C loop check: without noise ${edges} edges (expected 6) — ${edges === 6 ? "ok" : "WRONG"}\n`);
  }
}

const CLI_OPAMP = {
  openLoopGain: 2e5,
  gainBandwidth: 1e6,
  slewRate: 1e6,
  outputHeadroomHigh: 0.05,
  outputHeadroomLow: 0.05,
  inputOffset: 0,
};

const CLI_SCENARIO = JSON.stringify({
  schema: "railwise.scenario/1",
  supply: { positive: 5, negative: 0 },
  opamp: CLI_OPAMP,
  stage: { kind: "comparator", inputAt: "noninverting", reference: 2.5 },
  input: { components: [{ kind: "triangle", amplitude: 2, frequency: 100, offset: 2.5 }] },
  run: { duration: 0.02, points: 101 },
});

const CLI_SPEC = JSON.stringify({
  schema: "railwise.design-spec/1",
  kind: "schmitt-inverting",
  supply: { positive: 5, negative: 0 },
  opamp: CLI_OPAMP,
  target: { upperThreshold: 3.1, lowerThreshold: 1.9 },
  series: "E24",
  tolerance: 0.01,
  reference: "auto",
});

const medianOf = (xs: number[]) => [...xs].sort((a, b) => a - b)[Math.floor(xs.length / 2)];

/** Wall time of whole processes started with spawnSync (includes the fork from this process). */
function spawnTimes(args: string[], input: string, runs: number): { times: number[]; problem?: string } {
  const times: number[] = [];
  for (let i = 0; i < runs + 3; i++) {
    const t0 = performance.now();
    const r = spawnSync(process.execPath, args, { input, stdio: ["pipe", "ignore", "pipe"], timeout: 30_000 });
    const t = performance.now() - t0;
    if (r.status !== 0) return { times, problem: `exit ${r.status}: ${String(r.stderr).trim().slice(0, 200)}` };
    if (i >= 3) times.push(t);
  }
  return { times };
}

function hyperfineMs(command: string, input: string): number | null {
  const which = spawnSync("sh", ["-c", "command -v hyperfine"], { encoding: "utf8" });
  if (which.status !== 0) return null;
  const dir = path.join(ROOT, "build/bench");
  mkdirSync(dir, { recursive: true });
  const inputFile = path.join(dir, "cli-scenario.json");
  const out = path.join(dir, "hyperfine.json");
  writeFileSync(inputFile, input);
  const r = spawnSync(
    "hyperfine",
    [
      "--warmup",
      "3",
      "--runs",
      "20",
      "--style",
      "none",
      "--export-json",
      out,
      `${command} < ${JSON.stringify(inputFile)}`,
    ],
    { encoding: "utf8", timeout: 120_000 },
  );
  if (r.status !== 0) return null;
  const json = JSON.parse(readFileSync(out, "utf8"));
  return json.results[0].mean * 1000;
}

function cliRows(): void {
  const build = spawnSync(process.execPath, [path.join(ROOT, "scripts/build-cli.mjs"), "--if-stale"], {
    encoding: "utf8",
  });
  const bin = path.join(ROOT, "build/cli/railwise.cjs");
  const rows = [["command", "runs", "median ms", "min ms", "hyperfine mean ms", "target", "met"]];
  if (build.status !== 0 || !existsSync(bin)) {
    rows.push([
      "node build/cli/railwise.cjs simulate -",
      "",
      "",
      "",
      "",
      "< 150 ms",
      `? (build failed: ${build.stderr.trim()})`,
    ]);
  } else {
    const viaBin = spawnTimes([bin, "simulate", "-"], CLI_SCENARIO, 20);
    const bare = spawnTimes(["-e", "0"], "", 20);
    const hf = hyperfineMs(`${JSON.stringify(process.execPath)} ${JSON.stringify(bin)} simulate -`, CLI_SCENARIO);
    const med = viaBin.problem ? Number.NaN : medianOf(viaBin.times);
    rows.push([
      "node build/cli/railwise.cjs simulate - (small scenario on stdin)",
      String(viaBin.times.length),
      viaBin.problem ? `failed: ${viaBin.problem}` : ms(med),
      viaBin.times.length ? ms(Math.min(...viaBin.times)) : "",
      hf === null ? "(hyperfine not installed or failed)" : ms(hf),
      "< 150 ms",
      Number.isFinite(med) ? (med < 150 && (hf === null || hf < 150) ? "yes" : "NO") : "?",
    ]);
    const designRun = spawnTimes([bin, "design", "-"], CLI_SPEC, 20);
    rows.push([
      "node build/cli/railwise.cjs design - (Schmitt spec; includes the synthesis work itself)",
      String(designRun.times.length),
      designRun.problem ? `failed: ${designRun.problem}` : ms(medianOf(designRun.times)),
      designRun.times.length ? ms(Math.min(...designRun.times)) : "",
      "",
      "",
      "",
    ]);
    rows.push([
      "  node -e 0 (Node's own start, for context)",
      String(bare.times.length),
      ms(medianOf(bare.times)),
      ms(Math.min(...bare.times)),
      "",
      "",
      "",
    ]);
  }
  process.stdout.write("\nCLI start through the railwise bin (wall time of the whole process)\n" + table(rows) + "\n");
}

/**
 * Server load test (scripts/bench-load.ts, when it exists) as the last section. It starts
 * `next start` from the production build in NEXT_DIST_DIR (default .next-test); without that
 * build the section says so and is skipped. It never fails the bench. Skip it with --no-load.
 */
function loadSection(): void {
  const file = path.join(ROOT, "scripts/bench-load.ts");
  process.stdout.write("\nServer load test (scripts/bench-load.ts; skip with --no-load)\n");
  if (!existsSync(file)) {
    process.stdout.write("  skipped: scripts/bench-load.ts does not exist in this tree\n");
    return;
  }
  const distDir = process.env.NEXT_DIST_DIR ?? ".next-test";
  if (!existsSync(path.join(ROOT, distDir, "BUILD_ID"))) {
    process.stdout.write(
      `  skipped: no production build in ${distDir} (build one with \`NEXT_DIST_DIR=${distDir} npx next build\`, or set NEXT_DIST_DIR to an existing build)\n`,
    );
    return;
  }
  const r = spawnSync(path.join(ROOT, "node_modules/.bin/tsx"), [file], {
    cwd: ROOT,
    stdio: "inherit",
    timeout: 600_000,
  });
  if (r.status !== 0) {
    process.stdout.write(
      `  the load test did not complete (exit ${r.status ?? r.signal}); the rest of the bench stands\n`,
    );
  }
}

void main();
