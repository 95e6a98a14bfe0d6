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
import { spawnSync } from "node:child_process";
import os from "node:os";
import { PerformanceObserver } from "node:perf_hooks";
import { parseScenario, type Scenario } from "@/lib/schemas/scenario";
import { simulate, SimFailed } from "@/lib/sim";
import type { SimOptions, SimResult } from "@/lib/sim/types";
import { noiseSegmentCount } from "@/lib/sim/noise";

const NOISY: Scenario = parseScenario({
  schema: "railwise.scenario/1",
  name: "bench: noisy Schmitt trigger",
  supply: { positive: 5, negative: 0 },
  opamp: { openLoopGain: 2e5, gainBandwidth: 1e6, slewRate: 1e6, outputHeadroomHigh: 0.05, outputHeadroomLow: 0.05, inputOffset: 1e-3 },
  stage: { kind: "schmitt-noninverting", rInput: 10e3, rFeedback: 100e3, reference: 2.5 },
  input: { components: [{ kind: "triangle", amplitude: 1, frequency: 50, offset: 2.5 }], noise: { rms: 0.02, bandwidth: 5e6, seed: 7 } },
  run: { duration: 0.1, points: 1001 },
});

const STIFF: Scenario = parseScenario({
  schema: "railwise.scenario/1",
  name: "bench: 60 s ramp through a 10 MHz amplifier",
  supply: { positive: 5, negative: -5 },
  opamp: { openLoopGain: 2e5, gainBandwidth: 10e6, slewRate: 10e6, outputHeadroomHigh: 0.5, outputHeadroomLow: 0.5, inputOffset: 0 },
  stage: { kind: "noninverting-amplifier", rGround: 10e3, rFeedback: 10e3, reference: 0 },
  input: { components: [{ kind: "ramp", from: -3, to: 3, start: 0, duration: 60 }] },
  run: { duration: 60, points: 1001 },
});

const NONSTIFF: Scenario = parseScenario({
  schema: "railwise.scenario/1",
  name: "bench: Schmitt trigger, triangle",
  supply: { positive: 5, negative: -5 },
  opamp: { openLoopGain: 2e5, gainBandwidth: 1e6, slewRate: 1e6, outputHeadroomHigh: 0, outputHeadroomLow: 0, inputOffset: 0 },
  stage: { kind: "schmitt-noninverting", rInput: 10e3, rFeedback: 100e3, reference: 0 },
  input: { components: [{ kind: "triangle", amplitude: 2, frequency: 100 }] },
  run: { duration: 0.02, points: 1001 },
});

const ODEX_BUDGET = 100_000;

interface Timing {
  wallMs: number;
  cpuMs: number;
  gcs: number;
  result: SimResult | null;
  error?: string;
  coldMs?: number;
}

let gcCount = 0;
const gcObserver = new PerformanceObserver((list) => {
  gcCount += list.getEntries().length;
});

function timeOnce(s: Scenario, o: SimOptions = {}): Timing {
  const c0 = process.cpuUsage();
  const g0 = gcCount;
  const t0 = performance.now();
  let result: SimResult | null = null;
  let error: string | undefined;
  try {
    result = simulate(s, o);
  } catch (e) {
    if (!(e instanceof SimFailed)) throw e;
    error = e.message;
  }
  const wallMs = performance.now() - t0;
  const c = process.cpuUsage(c0);
  return { wallMs, cpuMs: (c.user + c.system) / 1000, gcs: gcCount - g0, result, error };
}

function median(s: Scenario, o: SimOptions = {}, warm = 5, runs = 7): Timing {
  let coldMs = 0;
  for (let i = 0; i < warm; i++) {
    const t = timeOnce(s, o);
    if (i === 0) coldMs = t.wallMs;
  }
  const all = Array.from({ length: runs }, () => timeOnce(s, o)).sort((a, b) => a.wallMs - b.wallMs);
  const mid = all[Math.floor(runs / 2)];
  return { ...mid, gcs: all.reduce((n, t) => n + t.gcs, 0), coldMs };
}

/** Child process: peak memory growth of one noisy run, from a clean baseline. */
function memoryChild(): void {
  const gc = (globalThis as { gc?: () => void }).gc;
  gc?.();
  const rss0 = process.memoryUsage().rss;
  let peak = rss0;
  const sample = () => {
    const r = process.memoryUsage().rss;
    if (r > peak) peak = r;
  };
  simulate(NOISY, { onProgress: sample });
  sample();
  const maxRss = process.resourceUsage().maxRSS * 1024;
  process.stdout.write(JSON.stringify({ growth: Math.max(peak, maxRss) - rss0, sampled: peak - rss0 }));
}

function memoryGrowth(): { growth: number; sampled: number } | null {
  const r = spawnSync(process.execPath, [...process.execArgv, "--expose-gc", process.argv[1], "--memory-child"], {
    encoding: "utf8",
    timeout: 120_000,
  });
  try {
    return JSON.parse(r.stdout);
  } catch {
    process.stderr.write(`memory child failed: ${r.stderr}\n`);
    return null;
  }
}

const ms = (x: number) => (x < 10 ? x.toFixed(2) : x < 100 ? x.toFixed(1) : Math.round(x).toLocaleString("en"));
const mb = (x: number) => (x / 1048576).toFixed(1);

function table(rows: string[][]): string {
  const widths = rows[0].map((_, c) => Math.max(...rows.map((r) => r[c].length)));
  const line = (r: string[]) => r.map((cell, c) => cell.padEnd(widths[c])).join("  ").trimEnd();
  return [line(rows[0]), widths.map((w) => "-".repeat(w)).join("  "), ...rows.slice(1).map(line)].join("\n");
}

function main(): void {
  if (process.argv.includes("--memory-child")) {
    memoryChild();
    return;
  }
  gcObserver.observe({ entryTypes: ["gc"] });
  const load = os.loadavg().map((x) => x.toFixed(2)).join(" ");
  process.stdout.write(`Railwise sim bench — Node ${process.version}, ${os.cpus().length} CPUs, load average ${load}\n`);
  process.stdout.write(
    "wall = median of 7 in-process runs after 5 warm-ups (cold = the very first run, JIT not warm); cpu = process CPU time of the median run\n" +
      "(wall ≫ cpu means other processes were competing for the 2 cores)\n\n",
  );

  const segments = noiseSegmentCount(NOISY.input.noise!, NOISY.run.duration);
  const noisy = median(NOISY);
  const mem = memoryGrowth();
  const stiffExact = median(STIFF);
  // odex on the stiff run: one timed attempt with a large step budget (it cannot finish).
  const stiffOdex = timeOnce(STIFF, { solver: "odex", maxSteps: ODEX_BUDGET });
  const nsExact = median(NONSTIFF);
  const nsOdex = median(NONSTIFF, { solver: "odex" }, 1, 3);
  const cold = (t: Timing) => (t.coldMs === undefined ? "" : ms(t.coldMs));

  const odexNote = stiffOdex.result
    ? `finished, ${stiffOdex.result.solver.steps.toLocaleString("en")} steps`
    : `${stiffOdex.error?.replace(/; this run is stiff.*/, "")}`;
  const reached = stiffOdex.error ? Number(/at t = ([\d.e+-]+) s/.exec(stiffOdex.error)?.[1] ?? NaN) : STIFF.run.duration;
  const ratio = stiffOdex.wallMs / stiffExact.wallMs;
  const extrapolated = Number.isFinite(reached) && reached > 0 ? (stiffOdex.wallMs * STIFF.run.duration) / reached : Infinity;

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
      String(noisy.gcs),
      `${n.metrics.transitions} edges, chatter ${n.metrics.chatter}`,
      "≤ 120 ms",
      noisy.wallMs <= 120 ? "yes" : "NO",
    ],
    [
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
    ],
    [
      "60 s ramp, 10 MHz GBW amplifier (stiff)",
      "exact",
      ms(stiffExact.wallMs),
      ms(stiffExact.cpuMs),
      cold(stiffExact),
      stiffExact.result!.solver.steps.toLocaleString("en"),
      String(stiffExact.gcs),
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
      stiffOdex.result ? stiffOdex.result.solver.steps.toLocaleString("en") : `${ODEX_BUDGET.toLocaleString("en")} (limit)`,
      String(stiffOdex.gcs),
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
      String(nsExact.gcs),
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
      String(nsOdex.gcs),
      `ratio odex/exact ${Math.round(nsOdex.wallMs / nsExact.wallMs)}×`,
      "",
      "",
    ],
  ];
  process.stdout.write(table(rows) + "\n");
  gcObserver.disconnect();
}

main();

// Study rows (issue 7): scripts/bench-studies.ts, in the same run; not in the memory child.
if (!process.argv.includes("--memory-child")) {
  void import("./bench-studies").then(async ({ benchStudies, printStudyRows }) => printStudyRows(await benchStudies()));
}
