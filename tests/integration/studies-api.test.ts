// PUT/GET /api/runs/:id/study against the real server and a fresh SQLite file. The study is
// computed here in Node with the same deterministic core the browser's workers run; the server
// must accept it only for the run's own scenario, recompute its summaries, refuse bad input
// with the field named, and keep roles and teams apart (DEVELOPERS.md § Roles).
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { DEMO_PASSWORD } from "@/lib/demo/accounts";
import { parseScenario, type Scenario } from "@/lib/schemas/scenario";
import { simulate } from "@/lib/sim";
import { noiseMarginConfigSchema, toleranceSpreadConfigSchema, type StudyUpload } from "@/lib/schemas/study";
import { runStudyInProcess } from "@/lib/studies/study";
import { summarizeNoiseMargin, type NoiseTaskOutput } from "@/lib/studies/noise-margin";
import { signIn, startServer, type SignedIn, type TestServer } from "../helpers/server";

let server: TestServer;
let designer: SignedIn, reviewer: SignedIn, other: SignedIn;
let runId = "";
let scenario: Scenario;
let upload: StudyUpload;

beforeAll(async () => {
  server = await startServer();
  designer = await signIn(server.url, "designer@fjordline.example", DEMO_PASSWORD);
  reviewer = await signIn(server.url, "reviewer@fjordline.example", DEMO_PASSWORD);
  other = await signIn(server.url, "owner@harrowmarine.example", DEMO_PASSWORD);
  const boards = (await (await designer.fetch("/api/boards")).json()) as { items: { id: string; name: string }[] };
  const board = boards.items.find((b) => b.name === "Buoy power and sensing")!;
  const list = (await (await designer.fetch(`/api/scenarios?boardId=${board.id}`)).json()) as {
    items: { id: string; name: string }[];
  };
  const temp = list.items.find((s) => /temperature/i.test(s.name))!;
  const res = await designer.fetch("/api/runs", {
    method: "POST",
    body: JSON.stringify({ scenarioId: temp.id, label: "study test" }),
  });
  expect(res.status).toBe(201);
  const run = (await res.json()) as { id: string; scenario: unknown };
  runId = run.id;
  scenario = parseScenario(run.scenario);
  const noise = noiseMarginConfigSchema.parse({
    kind: "noise-margin",
    seed: 3,
    rmsFrom: 0.005,
    rmsTo: 0.04,
    levels: 4,
    seedsPerLevel: 5,
    bandwidth: 5,
    limit: 0.05,
  });
  const tol = toleranceSpreadConfigSchema.parse({
    kind: "tolerance-spread",
    seed: 4,
    draws: 12,
    resistorTolerance: 0.01,
    offsetTolerance: 0.001,
    headroomSpread: 0.2,
    distribution: "normal",
    probe: { kind: "scenario" },
    measures: ["upperThreshold", "lowerThreshold"],
    window: { upperThreshold: [2.4, 2.45] },
  });
  upload = {
    schema: "railwise.study/1",
    noiseMargin: {
      config: noise,
      tasks: runStudyInProcess({ scenario, config: noise }, simulate) as never,
      wallMs: 1,
      workers: 1,
    },
    toleranceSpread: { config: tol, tasks: runStudyInProcess({ scenario, config: tol }, simulate) as never },
  };
});

afterAll(async () => {
  await server?.stop();
});

const put = (who: SignedIn, body: unknown, id = runId) =>
  who.fetch(`/api/runs/${id}/study`, { method: "PUT", body: typeof body === "string" ? body : JSON.stringify(body) });

describe("PUT /api/runs/:id/study", () => {
  it("stores a study computed on the run's scenario, with server-side summaries", async () => {
    const res = await put(designer, upload);
    expect(res.status).toBe(200);
    const got = (await (await designer.fetch(`/api/runs/${runId}/study`)).json()) as {
      study: { noiseMargin: { summary: unknown }; toleranceSpread: { summary: { draws: number; inside: number } } };
    };
    expect(got.study.noiseMargin.summary).toEqual(
      summarizeNoiseMargin(upload.noiseMargin!.config, upload.noiseMargin!.tasks as NoiseTaskOutput[]),
    );
    expect(got.study.toleranceSpread.summary.draws).toBe(12);
    // The run itself carries it too (run page, shared link).
    const run = (await (await reviewer.fetch(`/api/runs/${runId}`)).json()) as { study: { schema: string } };
    expect(run.study.schema).toBe("railwise.study/1");
  });

  it("refuses outputs that a re-run does not reproduce, naming the task", async () => {
    const tasks = upload.toleranceSpread!.tasks.map((t) => ({ ...t }));
    tasks[0].upperThreshold = (tasks[0].upperThreshold ?? 0) + 0.01;
    const res = await put(designer, {
      ...upload,
      noiseMargin: undefined,
      toleranceSpread: { ...upload.toleranceSpread, tasks },
    });
    expect(res.status).toBe(400);
    expect(((await res.json()) as { message: string }).message).toMatch(/toleranceSpread\.tasks\[0\]/);
  });

  it("refuses bad input with the field named, and changes nothing", async () => {
    const before = await (await designer.fetch(`/api/runs/${runId}/study`)).text();
    const short = await put(designer, {
      ...upload,
      toleranceSpread: undefined,
      noiseMargin: { ...upload.noiseMargin, tasks: upload.noiseMargin!.tasks.slice(1) },
    });
    expect(short.status).toBe(400);
    expect(((await short.json()) as { message: string }).message).toMatch(/noiseMargin\.tasks must hold 21/);
    const badConfig = await put(designer, {
      schema: "railwise.study/1",
      noiseMargin: { config: { ...upload.noiseMargin!.config, levels: 1 }, tasks: [] },
    });
    expect(badConfig.status).toBe(400);
    const body = (await badConfig.json()) as { issues: { path: (string | number)[] }[] };
    expect(body.issues.some((i) => i.path.join(".") === "noiseMargin.config.levels")).toBe(true);
    expect((await put(designer, "{not json")).status).toBe(400);
    expect((await put(designer, { schema: "railwise.study/1" })).status).toBe(400);
    expect(await (await designer.fetch(`/api/runs/${runId}/study`)).text()).toBe(before);
  });

  it("keeps roles and teams apart", async () => {
    expect((await put(reviewer, upload)).status).toBe(403);
    expect((await put(other, upload)).status).toBe(404);
    expect((await other.fetch(`/api/runs/${runId}/study`)).status).toBe(404);
    const anon = await fetch(new URL(`/api/runs/${runId}/study`, server.url), {
      method: "PUT",
      body: JSON.stringify(upload),
      headers: { "content-type": "application/json" },
    });
    expect(anon.status).toBe(401);
    expect((await put(designer, upload, "no-such-run")).status).toBe(404);
  });
});
