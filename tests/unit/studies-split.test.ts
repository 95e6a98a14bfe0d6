// Determinism: the worker pool hands out contiguous task ranges; whatever the split (1 worker,
// 2, 3, 7 …), the merged outputs must be identical, bit for bit. Run in-process here with the
// same batch function the workers run.
import { describe, expect, it } from "vitest";
import { parseScenario } from "@/lib/schemas/scenario";
import { simulate } from "@/lib/sim";
import { DEMO_SCENARIOS } from "@/lib/demo/scenarios";
import { noiseMarginConfigSchema, toleranceSpreadConfigSchema } from "@/lib/schemas/study";
import { runStudyTasks, splitTasks, studyTaskCount, type StudyRequest, type TaskOutput } from "@/lib/studies/study";

function runSplit(request: StudyRequest, workers: number): TaskOutput[] {
  const total = studyTaskCount(request.config);
  const ranges = splitTasks(total, Math.ceil(total / workers));
  // Run the ranges in reverse, as a pool might finish them, then merge in task order.
  const parts = ranges.map(() => [] as TaskOutput[]);
  for (let j = ranges.length - 1; j >= 0; j--) parts[j] = runStudyTasks(request, ranges[j][0], ranges[j][1], simulate);
  return parts.flat();
}

const bilge = parseScenario(DEMO_SCENARIOS.find((s) => s.key === "bilge-float")!.scenario);
const battery = parseScenario(DEMO_SCENARIOS.find((s) => s.key === "battery-cutoff")!.scenario);

describe("results do not depend on the number of workers", () => {
  it("noise margin study", () => {
    const request: StudyRequest = {
      scenario: { ...battery, run: { ...battery.run, points: 1000 } },
      config: noiseMarginConfigSchema.parse({
        kind: "noise-margin",
        seed: 7,
        rmsFrom: 0.01,
        rmsTo: 0.06,
        levels: 3,
        seedsPerLevel: 6,
        bandwidth: 50,
        limit: 0.01,
      }),
    };
    const one = runSplit(request, 1);
    expect(one).toHaveLength(19);
    for (const w of [2, 3, 7, 19]) expect(runSplit(request, w)).toEqual(one);
  });

  it("tolerance spread", () => {
    const request: StudyRequest = {
      scenario: { ...bilge, run: { ...bilge.run, points: 1000 } },
      config: toleranceSpreadConfigSchema.parse({
        kind: "tolerance-spread",
        seed: 99,
        draws: 24,
        resistorTolerance: 0.05,
        offsetTolerance: 0.002,
        headroomSpread: 0.2,
        distribution: "normal",
        probe: { kind: "triangle", low: 1, high: 4 },
        measures: ["upperThreshold", "lowerThreshold"],
      }),
    };
    const one = runSplit(request, 1);
    expect(one).toHaveLength(25);
    // Draws really differ from one another (the test would be empty otherwise).
    expect(new Set(one.map((o) => (o as { upperThreshold: number }).upperThreshold)).size).toBeGreaterThan(20);
    for (const w of [2, 5, 25]) expect(runSplit(request, w)).toEqual(one);
  });
});

describe("study tasks sample a coarse output grid", () => {
  // Their figures come from located events, which must not depend on the output grid
  // (DEVELOPERS.md § Behavioural op-amp model); check that on the tasks themselves against the scenario's own grid.
  it("gives the same transitions and thresholds as the full grid", async () => {
    const { noiseTaskScenario } = await import("@/lib/studies/noise-margin");
    const { toleranceTaskScenario } = await import("@/lib/studies/tolerance-spread");
    const noise = noiseMarginConfigSchema.parse({
      kind: "noise-margin",
      seed: 3,
      rmsFrom: 0.02,
      rmsTo: 0.2,
      levels: 2,
      seedsPerLevel: 3,
      bandwidth: 500,
      limit: 0.01,
    });
    const tol = toleranceSpreadConfigSchema.parse({
      kind: "tolerance-spread",
      seed: 4,
      draws: 3,
      resistorTolerance: 0.05,
      offsetTolerance: 0.002,
      headroomSpread: 0.2,
      distribution: "uniform",
      probe: { kind: "scenario" },
      measures: ["upperThreshold", "lowerThreshold"],
    });
    for (let i = 0; i < 7; i++) {
      const coarse = noiseTaskScenario(bilge, noise, i);
      expect(coarse.run.points).toBe(257);
      const a = simulate(coarse).metrics;
      const b = simulate({ ...coarse, run: bilge.run }).metrics;
      expect(a.transitions).toBe(b.transitions);
      expect(a.upperThreshold).toBeCloseTo(b.upperThreshold as number, 9);
      expect(a.lowerThreshold).toBeCloseTo(b.lowerThreshold as number, 9);
    }
    for (let i = 0; i < 4; i++) {
      const coarse = toleranceTaskScenario(bilge, tol, i);
      const a = simulate(coarse).metrics;
      const b = simulate({ ...coarse, run: bilge.run }).metrics;
      expect(a.upperThreshold).toBeCloseTo(b.upperThreshold as number, 9);
      expect(a.lowerThreshold).toBeCloseTo(b.lowerThreshold as number, 9);
    }
  });
});
