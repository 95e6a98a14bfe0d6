// Server simulations run in the worker pool, not on the request thread (issue item 3): a run
// past its wall-time budget answers 422 saying why, a run past the heap limit answers 422 too,
// and /api/health keeps answering while four heavy runs are in flight. The health p50/p99 is
// printed; the assertion is a gross bound only, because this machine is shared (the 50 ms
// target is reported, not asserted).
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { DEMO_PASSWORD } from "@/lib/demo/accounts";
import type { Scenario } from "@/lib/schemas/scenario";
import { signIn, startServer, type SignedIn, type TestServer } from "@/tests/helpers/server";
import { EMAILS } from "@/tests/helpers/team";

let server: TestServer;
let designer: SignedIn;
let boardId: string;

const BUDGET_MS = 2000;

beforeAll(async () => {
  server = await startServer({ env: { RAILWISE_SIM_BUDGET_MS: String(BUDGET_MS), RAILWISE_SIM_THREADS: "1" } });
  designer = await signIn(server.url, EMAILS.designer, DEMO_PASSWORD);
  const boards = (await (await designer.fetch("/api/boards")).json()) as { items: { id: string }[] };
  boardId = boards.items[0].id;
});
afterAll(async () => {
  await server?.stop();
});

/**
 * A relaxation oscillator (the demo blinker's network with a 1000× smaller timing capacitor,
 * ≈ 1.5 kHz) over `duration` seconds: about 3,000 edges per second of run time, inside the run
 * bounds but expensive — 300 s is about 920,000 edges.
 */
function oscillator(duration: number): Scenario {
  return {
    schema: "railwise.scenario/1",
    name: `Pool load ${duration} s`,
    supply: { positive: 5, negative: 0 },
    opamp: {
      openLoopGain: 200_000,
      gainBandwidth: 1e6,
      slewRate: 1e6,
      outputHeadroomHigh: 0.02,
      outputHeadroomLow: 0.02,
      inputOffset: 0,
    },
    stage: {
      kind: "relaxation-oscillator",
      rReference: 50e3,
      rFeedback: 100e3,
      rTiming: 100e3,
      cTiming: 4.7e-9,
      reference: 2.5,
    },
    input: { components: [{ kind: "dc", level: 0 }] },
    run: { duration, points: 8000, initialOutput: "low" },
  } as unknown as Scenario;
}

async function createScenario(scenario: Scenario, as = designer, board = boardId): Promise<string> {
  const res = await as.fetch("/api/scenarios", { method: "POST", body: JSON.stringify({ boardId: board, scenario }) });
  expect(res.status, await res.clone().text()).toBe(201);
  return ((await res.json()) as { id: string }).id;
}

const quantile = (sorted: number[], q: number) => sorted[Math.min(sorted.length - 1, Math.ceil(q * sorted.length) - 1)];

/** Probes /api/health one request at a time until `done` settles; returns each latency in ms. */
async function probeHealth(done: Promise<unknown>): Promise<number[]> {
  let finished = false;
  void done.finally(() => {
    finished = true;
  });
  const times: number[] = [];
  const deadline = Date.now() + 120_000;
  while (!finished && Date.now() < deadline) {
    const t0 = performance.now();
    const res = await fetch(`${server.url}/api/health`);
    await res.arrayBuffer();
    times.push(performance.now() - t0);
    expect(res.status).toBe(200);
    await new Promise((r) => setTimeout(r, 20));
  }
  return times;
}

describe("simulation worker pool", () => {
  it("a small run still answers 201 with its result through the pool", async () => {
    const id = await createScenario(oscillator(0.05));
    const res = await designer.fetch("/api/runs", { method: "POST", body: JSON.stringify({ scenarioId: id }) });
    expect(res.status, await res.clone().text()).toBe(201);
    const run = (await res.json()) as { result: { metrics: { period: number | null } } };
    // Period of the ideal relaxation oscillator 2·R·C·ln((1+β)/(1−β)) with β = 1/3 (three equal
    // resistors to a mid reference): 2·100 kΩ·4.7 nF·ln 2 ≈ 0.652 ms (handbook formula, see
    // tests/REFERENCES.md); the rail headroom moves it by well under 5 %.
    expect(run.result.metrics.period).toBeGreaterThan(0.652e-3 * 0.95);
    expect(run.result.metrics.period).toBeLessThan(0.652e-3 * 1.05);
  });

  it("a run past its budget answers 422 saying why; four heavy runs in flight leave /api/health answering", async () => {
    const id = await createScenario(oscillator(300));
    const started = performance.now();
    const runs = Promise.all(
      Array.from({ length: 4 }, () =>
        designer
          .fetch("/api/runs", { method: "POST", body: JSON.stringify({ scenarioId: id }) })
          .then(async (r) => ({ status: r.status, body: (await r.json()) as { error: string; message: string } })),
      ),
    );
    const times = await probeHealth(runs);
    const answers = await runs;
    const wall = performance.now() - started;
    for (const a of answers) {
      expect(a.status).toBe(422);
      expect(a.body.error).toBe("over_budget");
      expect(a.body.message).toMatch(/budget of 2 s/);
    }
    const sorted = [...times].sort((a, b) => a - b);
    const p50 = quantile(sorted, 0.5);
    const p99 = quantile(sorted, 0.99);
    console.log(
      `[pool] 4 heavy runs (≈920k edges each, budget ${BUDGET_MS} ms, 1 worker thread) in flight for ${Math.round(wall)} ms: ` +
        `/api/health n=${times.length} p50=${p50.toFixed(1)} ms p99=${p99.toFixed(1)} ms max=${sorted[sorted.length - 1].toFixed(1)} ms (target p99 < 50 ms)`,
    );
    // The runs were queued on one thread: the last could only finish after ≥ 4 budgets.
    expect(wall).toBeGreaterThan(BUDGET_MS * 3);
    expect(times.length).toBeGreaterThan(20);
    // Gross bound on a shared machine: health never waited on a simulation.
    expect(p99).toBeLessThan(1000);
  });
});

describe("simulation worker heap limit", () => {
  let small: TestServer | null = null;
  afterAll(async () => {
    await small?.stop();
  });

  it("a run past the worker's heap answers 422 over_memory; the next run gets a fresh worker", async () => {
    // 24 MB of old generation per worker and a budget long enough that memory, not time, ends
    // the 920,000-edge run (its edge list alone is far past 24 MB).
    small = await startServer({
      env: { RAILWISE_SIM_MEMORY_MB: "24", RAILWISE_SIM_BUDGET_MS: "120000", RAILWISE_SIM_THREADS: "1" },
    });
    const me = await signIn(small.url, EMAILS.designer, DEMO_PASSWORD);
    const board = ((await (await me.fetch("/api/boards")).json()) as { items: { id: string }[] }).items[0].id;
    const create = (scenario: Scenario) => createScenario(scenario, me, board);
    const heavy = await me.fetch("/api/runs", {
      method: "POST",
      body: JSON.stringify({ scenarioId: await create(oscillator(300)) }),
    });
    const body = (await heavy.json()) as { error: string; message: string };
    expect(heavy.status).toBe(422);
    expect(body.error).toBe("over_memory");
    expect(body.message).toMatch(/more than the server's 24 MB per run/);
    expect((await fetch(`${small.url}/api/health`)).status).toBe(200);
    const next = await me.fetch("/api/runs", {
      method: "POST",
      body: JSON.stringify({ scenarioId: await create(oscillator(0.05)) }),
    });
    expect(next.status).toBe(201);
  });
});
