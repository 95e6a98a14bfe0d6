// The foundation API against the real server (next start on a production build) and a fresh
// SQLite file: sign-in through next-auth's own endpoints as every demo account, the role table
// (DEVELOPERS.md § Roles) for boards, scenarios and runs, team isolation (another team's id → 404), bad
// input → 400, and runs whose numbers come from lib/sim on the server.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { DEMO_ACCOUNTS, DEMO_PASSWORD } from "@/lib/demo/accounts";
import { DEMO_SCENARIOS } from "@/lib/demo/scenarios";
import { parseScenario } from "@/lib/schemas/scenario";
import { simulate } from "@/lib/sim";
import { signIn, startServer, type SignedIn, type TestServer } from "../helpers/server";

type Who = "owner" | "designer" | "reviewer" | "viewer" | "other";

let server: TestServer;
const as = {} as Record<Who, SignedIn>;
let boardId: string;
let otherBoardId: string;
const scenarioIds: Record<string, string> = {};

const json = (body: unknown) => ({ body: JSON.stringify(body) });
const anon = (path: string, init?: RequestInit) => fetch(new URL(path, server.url), { ...init, redirect: "manual" });

async function expectStatus(res: Response, status: number) {
  const text = await res.text();
  expect(res.status, `${res.url} → ${res.status}: ${text.slice(0, 300)}`).toBe(status);
  return text ? (JSON.parse(text) as Record<string, unknown>) : {};
}

beforeAll(async () => {
  server = await startServer();
  for (const a of DEMO_ACCOUNTS) {
    const who: Who = a.email.endsWith("harrowmarine.example") ? "other" : a.role;
    as[who] = await signIn(server.url, a.email, DEMO_PASSWORD);
  }
  const boards = (await (await as.designer.fetch("/api/boards")).json()) as { items: { id: string; name: string }[] };
  boardId = boards.items.find((b) => b.name === "Buoy power and sensing")!.id;
  const other = (await (await as.other.fetch("/api/boards")).json()) as { items: { id: string }[] };
  otherBoardId = other.items[0].id;
  const list = (await (await as.designer.fetch(`/api/scenarios?boardId=${boardId}`)).json()) as {
    items: { id: string; name: string }[];
  };
  for (const s of list.items) scenarioIds[s.name] = s.id;
});

afterAll(async () => {
  await server?.stop();
});

describe("sign-in and session", () => {
  it("every demo account signs in with its role and team on the session", () => {
    for (const a of DEMO_ACCOUNTS) {
      const who: Who = a.email.endsWith("harrowmarine.example") ? "other" : a.role;
      const u = as[who].session.user;
      expect(u.email).toBe(a.email);
      expect(u.role).toBe(a.role);
      expect(u.teamName).toBe(a.team);
      expect(typeof u.id).toBe("string");
      expect(typeof u.teamId).toBe("string");
    }
    expect(as.owner.session.user.teamId).toBe(as.viewer.session.user.teamId);
    expect(as.other.session.user.teamId).not.toBe(as.owner.session.user.teamId);
  });

  it("a wrong password gets no session", async () => {
    await expect(signIn(server.url, "designer@fjordline.example", "not-the-password")).rejects.toThrow(/refused/);
  });

  it("health answers without a session", async () => {
    const body = await expectStatus(await anon("/api/health"), 200);
    expect(body.status).toBe("ok");
  });
});

describe("boards", () => {
  it("every role reads the team's boards; no session → 401", async () => {
    for (const who of ["owner", "designer", "reviewer", "viewer"] as const) {
      const body = (await expectStatus(await as[who].fetch("/api/boards"), 200)) as {
        items: { id: string; scenarioCount: number }[];
      };
      expect(body.items.map((b) => b.id)).toContain(boardId);
      expect(body.items.find((b) => b.id === boardId)!.scenarioCount).toBe(DEMO_SCENARIOS.length);
      expect(body.items.map((b) => b.id)).not.toContain(otherBoardId);
    }
    await expectStatus(await anon("/api/boards"), 401);
    await expectStatus(await anon(`/api/boards/${boardId}`), 401);
  });

  it("only the owner creates, renames and deletes boards", async () => {
    for (const who of ["designer", "reviewer", "viewer"] as const) {
      await expectStatus(await as[who].fetch("/api/boards", { method: "POST", ...json({ name: "Spare board" }) }), 403);
    }
    await expectStatus(
      await anon("/api/boards", {
        method: "POST",
        body: JSON.stringify({ name: "x" }),
        headers: { "content-type": "application/json" },
      }),
      401,
    );
    const created = await expectStatus(
      await as.owner.fetch("/api/boards", {
        method: "POST",
        ...json({ name: "Feed barge", description: "Feeder controls" }),
      }),
      201,
    );
    expect(typeof created.id).toBe("string");
    expect(created.name).toBe("Feed barge");
    const id = created.id as string;

    for (const who of ["designer", "reviewer", "viewer"] as const) {
      await expectStatus(
        await as[who].fetch(`/api/boards/${id}`, { method: "PATCH", ...json({ name: "Renamed" }) }),
        403,
      );
      await expectStatus(await as[who].fetch(`/api/boards/${id}`, { method: "DELETE" }), 403);
    }
    const renamed = await expectStatus(
      await as.owner.fetch(`/api/boards/${id}`, { method: "PATCH", ...json({ name: "Feed barge 2" }) }),
      200,
    );
    expect(renamed.name).toBe("Feed barge 2");
    await expectStatus(await as.owner.fetch(`/api/boards/${id}`, { method: "DELETE" }), 200);
    await expectStatus(await as.owner.fetch(`/api/boards/${id}`), 404);
  });

  it("another team's board is a 404 for every verb", async () => {
    await expectStatus(await as.other.fetch(`/api/boards/${boardId}`), 404);
    await expectStatus(
      await as.other.fetch(`/api/boards/${boardId}`, { method: "PATCH", ...json({ name: "mine now" }) }),
      404,
    );
    await expectStatus(await as.other.fetch(`/api/boards/${boardId}`, { method: "DELETE" }), 404);
    await expectStatus(await as.owner.fetch(`/api/boards/${otherBoardId}`), 404);
    await expectStatus(await as.owner.fetch("/api/boards/not-an-id"), 404);
  });

  it("bad bodies are 400 with the field named, never 500", async () => {
    const empty = await expectStatus(
      await as.owner.fetch("/api/boards", { method: "POST", ...json({ name: "" }) }),
      400,
    );
    expect(empty.error).toBe("invalid_input");
    expect(JSON.stringify(empty.issues)).toContain('"name"');
    const malformed = await expectStatus(
      await as.owner.fetch("/api/boards", { method: "POST", body: "{not json" }),
      400,
    );
    expect(String(malformed.message)).toMatch(/JSON/);
    await expectStatus(await as.owner.fetch("/api/boards", { method: "POST", body: "" }), 400);
    await expectStatus(await as.owner.fetch(`/api/boards/${boardId}`, { method: "PATCH", ...json({ name: 42 }) }), 400);
  });
});

describe("scenarios", () => {
  const demo = () => structuredClone(parseScenario(DEMO_SCENARIOS[0].scenario));

  it("every role lists and reads the board's scenarios", async () => {
    for (const who of ["owner", "designer", "reviewer", "viewer"] as const) {
      const body = (await expectStatus(await as[who].fetch(`/api/scenarios?boardId=${boardId}`), 200)) as {
        items: { id: string; name: string; version: number; scenario: { schema: string } }[];
      };
      expect(body.items.map((s) => s.name).sort()).toEqual(DEMO_SCENARIOS.map((s) => s.name).sort());
      expect(body.items.every((s) => s.scenario.schema === "railwise.scenario/1")).toBe(true);
    }
    const one = await expectStatus(await as.viewer.fetch(`/api/scenarios/${scenarioIds["Status-lamp blinker"]}`), 200);
    expect(one.boardId).toBe(boardId);
    expect((one.scenario as { stage: { kind: string } }).stage.kind).toBe("relaxation-oscillator");
    await expectStatus(await anon(`/api/scenarios?boardId=${boardId}`), 401);
    await expectStatus(await as.viewer.fetch("/api/scenarios"), 400);
  });

  it("owner and designer create, edit (new version) and delete; reviewer and viewer get 403", async () => {
    for (const who of ["reviewer", "viewer"] as const) {
      await expectStatus(
        await as[who].fetch("/api/scenarios", { method: "POST", ...json({ boardId, scenario: demo() }) }),
        403,
      );
    }
    const created = await expectStatus(
      await as.designer.fetch("/api/scenarios", {
        method: "POST",
        ...json({ boardId, name: "Cut-off copy", scenario: demo() }),
      }),
      201,
    );
    expect(created.version).toBe(1);
    const id = created.id as string;
    const byOwner = await expectStatus(
      await as.owner.fetch("/api/scenarios", {
        method: "POST",
        ...json({ boardId, name: "Owner copy", scenario: demo() }),
      }),
      201,
    );

    const changed = demo();
    (changed.stage as { rFeedback: number }).rFeedback = 560e3;
    for (const who of ["reviewer", "viewer"] as const) {
      await expectStatus(
        await as[who].fetch(`/api/scenarios/${id}`, { method: "PUT", ...json({ scenario: changed }) }),
        403,
      );
      await expectStatus(await as[who].fetch(`/api/scenarios/${id}`, { method: "DELETE" }), 403);
    }
    const v2 = await expectStatus(
      await as.owner.fetch(`/api/scenarios/${id}`, { method: "PUT", ...json({ scenario: changed }) }),
      200,
    );
    expect(v2.version).toBe(2);
    expect((v2.scenario as { stage: { rFeedback: number } }).stage.rFeedback).toBe(560e3);
    const v3 = await expectStatus(
      await as.designer.fetch(`/api/scenarios/${id}`, { method: "PUT", ...json({ name: "Cut-off, 560k" }) }),
      200,
    );
    expect(v3.version).toBe(3);
    expect(v3.name).toBe("Cut-off, 560k");

    const stale = await expectStatus(
      await as.designer.fetch(`/api/scenarios/${id}`, { method: "PUT", ...json({ name: "late", baseVersion: 2 }) }),
      409,
    );
    expect(String(stale.message)).toMatch(/version 3/);

    const versions = (await expectStatus(await as.viewer.fetch(`/api/scenarios/${id}/versions`), 200)) as {
      items: { version: number }[];
    };
    expect(versions.items.map((v) => v.version)).toEqual([3, 2, 1]);
    const first = await expectStatus(await as.viewer.fetch(`/api/scenarios/${id}/versions/1`), 200);
    expect((first.scenario as { stage: { rFeedback: number } }).stage.rFeedback).toBe(680e3);
    await expectStatus(await as.viewer.fetch(`/api/scenarios/${id}/versions/1/restore`, { method: "POST" }), 403);
    const restored = await expectStatus(
      await as.designer.fetch(`/api/scenarios/${id}/versions/1/restore`, { method: "POST" }),
      200,
    );
    expect(restored.version).toBe(4);
    expect((restored.scenario as { stage: { rFeedback: number } }).stage.rFeedback).toBe(680e3);
    await expectStatus(await as.designer.fetch(`/api/scenarios/${id}/versions/99`), 404);

    await expectStatus(await as.designer.fetch(`/api/scenarios/${id}`, { method: "DELETE" }), 200);
    await expectStatus(await as.designer.fetch(`/api/scenarios/${id}`), 404);
    await expectStatus(await as.owner.fetch(`/api/scenarios/${byOwner.id as string}`, { method: "DELETE" }), 200);
  });

  it("another team's scenarios and board are 404", async () => {
    const id = scenarioIds["Battery low-voltage disconnect"];
    await expectStatus(await as.other.fetch(`/api/scenarios/${id}`), 404);
    await expectStatus(await as.other.fetch(`/api/scenarios/${id}`, { method: "PUT", ...json({ name: "x" }) }), 404);
    await expectStatus(await as.other.fetch(`/api/scenarios/${id}`, { method: "DELETE" }), 404);
    await expectStatus(await as.other.fetch(`/api/scenarios/${id}/versions`), 404);
    await expectStatus(await as.other.fetch(`/api/scenarios?boardId=${boardId}`), 404);
    await expectStatus(
      await as.other.fetch("/api/scenarios", { method: "POST", ...json({ boardId, scenario: demo() }) }),
      404,
    );
  });

  it("a malformed scenario is a 400 naming the field, and nothing is stored", async () => {
    const bad = demo();
    (bad.stage as { rFeedback: number }).rFeedback = -1;
    const body = await expectStatus(
      await as.designer.fetch("/api/scenarios", {
        method: "POST",
        ...json({ boardId, name: "Broken", scenario: bad }),
      }),
      400,
    );
    expect(body.error).toBe("invalid_input");
    expect(String(body.message)).toContain("scenario.stage.rFeedback");
    expect((body.issues as { path: unknown[] }[]).some((i) => i.path.join(".") === "scenario.stage.rFeedback")).toBe(
      true,
    );
    const put = await expectStatus(
      await as.designer.fetch(`/api/scenarios/${scenarioIds["Hydrophone preamp"]}`, {
        method: "PUT",
        ...json({ scenario: { ...demo(), run: { duration: 1, points: 1 } } }),
      }),
      400,
    );
    expect(String(put.message)).toContain("run.points");
    await expectStatus(
      await as.designer.fetch(`/api/scenarios/${scenarioIds["Hydrophone preamp"]}`, { method: "PUT", body: "{" }),
      400,
    );
    const list = (await (await as.designer.fetch(`/api/scenarios?boardId=${boardId}`)).json()) as {
      items: { name: string; version: number }[];
    };
    expect(list.items.map((s) => s.name)).not.toContain("Broken");
    expect(list.items.find((s) => s.name === "Hydrophone preamp")!.version).toBe(1);
  });
});

describe("runs", () => {
  it("POST re-runs the stored scenario with lib/sim; the stored numbers equal simulate() here", async () => {
    const scenarioId = scenarioIds["Battery low-voltage disconnect"];
    for (const who of ["reviewer", "viewer"] as const) {
      await expectStatus(await as[who].fetch("/api/runs", { method: "POST", ...json({ scenarioId }) }), 403);
    }
    await expectStatus(
      await anon("/api/runs", {
        method: "POST",
        body: JSON.stringify({ scenarioId }),
        headers: { "content-type": "application/json" },
      }),
      401,
    );
    const run = (await expectStatus(
      await as.designer.fetch("/api/runs", { method: "POST", ...json({ scenarioId, label: "bench check" }) }),
      201,
    )) as {
      id: string;
      label: string;
      scenario: unknown;
      result: {
        schema: string;
        metrics: Record<string, unknown>;
        events: unknown[];
        rails: unknown;
        samples: { t: number[]; input: number[]; output: number[] };
      };
    };
    expect(run.label).toBe("bench check");
    expect(run.result.schema).toBe("railwise.result/1");

    // The same deterministic core, run here on the snapshot the server stored.
    const local = simulate(parseScenario(run.scenario));
    expect(run.result.metrics).toEqual(JSON.parse(JSON.stringify(local.metrics)));
    expect(run.result.events).toEqual(JSON.parse(JSON.stringify(local.events)));
    expect(run.result.rails).toEqual(local.rails);
    // The two designed switching points (tests/REFERENCES.md inverting-trigger closed form, see
    // lib/demo/scenarios.ts): 2.6148 V and 2.3852 V at the divider; allow 5 mV for offset/noise.
    expect(run.result.metrics.upperThreshold as number).toBeCloseTo(2.6148, 2);
    expect(run.result.metrics.lowerThreshold as number).toBeCloseTo(2.3852, 2);

    // Stored samples are thinned to ≤ 4,000 points, each one a sample of the full run.
    const { t, input, output } = run.result.samples;
    expect(t.length).toBeLessThanOrEqual(4000);
    expect(t.length).toBeGreaterThan(100);
    expect(t[0]).toBe(local.t[0]);
    expect(t[t.length - 1]).toBe(local.t[local.t.length - 1]);
    const dt = local.t[1] - local.t[0];
    for (let k = 0; k < t.length; k += 37) {
      const i = Math.round(t[k] / dt);
      expect(t[k]).toBe(local.t[i]);
      expect(output[k]).toBe(local.output[i]);
      expect(input[k]).toBe(local.input[i]);
    }

    const one = await expectStatus(await as.viewer.fetch(`/api/runs/${run.id}`), 200);
    expect((one.result as { metrics: unknown }).metrics).toEqual(run.result.metrics);
    const list = (await expectStatus(await as.reviewer.fetch(`/api/runs?scenarioId=${scenarioId}`), 200)) as {
      items: { id: string; result: Record<string, unknown> }[];
    };
    const item = list.items.find((r) => r.id === run.id)!;
    expect(item.result.metrics).toEqual(run.result.metrics);
    expect(item.result.samples).toBeUndefined();

    await expectStatus(await as.other.fetch(`/api/runs/${run.id}`), 404);
    await expectStatus(await as.other.fetch(`/api/runs?scenarioId=${scenarioId}`), 404);
    await expectStatus(await as.other.fetch("/api/runs", { method: "POST", ...json({ scenarioId }) }), 404);
    await expectStatus(await as.other.fetch(`/api/runs/${run.id}`, { method: "DELETE" }), 404);
    await expectStatus(await as.viewer.fetch(`/api/runs/${run.id}`, { method: "DELETE" }), 403);
    await expectStatus(await as.reviewer.fetch(`/api/runs/${run.id}`, { method: "DELETE" }), 403);
    await expectStatus(await as.owner.fetch(`/api/runs/${run.id}`, { method: "DELETE" }), 200);
    await expectStatus(await as.owner.fetch(`/api/runs/${run.id}`), 404);
  });

  it("a run past the server's bounds is a 400 that says why, and nothing is stored", async () => {
    const big = structuredClone(parseScenario(DEMO_SCENARIOS[4].scenario));
    big.run.points = 1_500_000; // valid for the schema (≤ 2,000,000) but past the server's run bound
    const created = await expectStatus(
      await as.designer.fetch("/api/scenarios", {
        method: "POST",
        ...json({ boardId, name: "Blinker, huge", scenario: big }),
      }),
      201,
    );
    const refused = await expectStatus(
      await as.designer.fetch("/api/runs", { method: "POST", ...json({ scenarioId: created.id }) }),
      400,
    );
    expect(String(refused.message)).toContain("run.points");
    const list = (await expectStatus(await as.designer.fetch(`/api/runs?scenarioId=${created.id as string}`), 200)) as {
      items: unknown[];
    };
    expect(list.items).toHaveLength(0);
  });

  it("bad run bodies are 400", async () => {
    await expectStatus(await as.designer.fetch("/api/runs", { method: "POST", ...json({}) }), 400);
    await expectStatus(await as.designer.fetch("/api/runs", { method: "POST", body: "nope" }), 400);
    await expectStatus(await as.designer.fetch("/api/runs", { method: "POST", ...json({ scenarioId: 12 }) }), 400);
    await expectStatus(
      await as.designer.fetch("/api/runs", { method: "POST", ...json({ scenarioId: "no-such-id" }) }),
      404,
    );
    await expectStatus(await as.designer.fetch("/api/runs"), 400);
  });
});

describe("concurrent saves", () => {
  it("50 simultaneous saves of one scenario all land as versions, none lost", async () => {
    const scenario = parseScenario(DEMO_SCENARIOS[0].scenario);
    const created = await expectStatus(
      await as.designer.fetch("/api/scenarios", {
        method: "POST",
        ...json({ boardId, name: "Busy scenario", scenario }),
      }),
      201,
    );
    const id = created.id as string;
    const results = await Promise.all(
      Array.from({ length: 50 }, (_, i) =>
        (i % 2 ? as.designer : as.owner).fetch(`/api/scenarios/${id}`, {
          method: "PUT",
          ...json({ name: `Busy scenario ${i}` }),
        }),
      ),
    );
    const statuses = await Promise.all(
      results.map(async (r) => {
        await r.text();
        return r.status;
      }),
    );
    expect(statuses.filter((s) => s === 200)).toHaveLength(50);
    const versions = (await expectStatus(await as.viewer.fetch(`/api/scenarios/${id}/versions`), 200)) as {
      items: { version: number; name: string }[];
    };
    expect(versions.items).toHaveLength(51);
    expect(new Set(versions.items.map((v) => v.version)).size).toBe(51);
    expect(new Set(versions.items.map((v) => v.name)).size).toBe(51);
    const final = await expectStatus(await as.viewer.fetch(`/api/scenarios/${id}`), 200);
    expect(final.version).toBe(51);
  });
});
