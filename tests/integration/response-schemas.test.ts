// Every GET route and the main POST/PUT/PATCH/DELETE routes, called once with valid data against
// the real server and a fresh SQLite file; each answer must parse with its response schema
// (lib/schemas/responses.ts, strict: an unknown or missing field fails). The contract is
// lib/schemas/README.md § Responses.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { z } from "zod";
import { DEMO_PASSWORD } from "@/lib/demo/accounts";
import { GENERAL_PURPOSE_BIPOLAR } from "@/lib/demo/parts";
import {
  auditEntrySchema,
  boardSchema,
  captureSchema,
  captureSummarySchema,
  commentSchema,
  deletedSchema,
  healthSchema,
  invitationAcceptedSchema,
  invitationCreatedSchema,
  invitationPreviewSchema,
  invitationSchema,
  listOf,
  memberSchema,
  partProfileJsonSchema,
  reviewQueueSchema,
  reviewRequestSchema,
  runLinkCreatedSchema,
  runLinkSchema,
  runSchema,
  runStudySavedSchema,
  runStudySchema,
  runSummarySchema,
  scenarioRecordSchema,
  scenarioSummarySchema,
  scenarioVersionDocSchema,
  scenarioVersionSchema,
  sharedRunSchema,
  signoffListSchema,
  signoffSchema,
} from "@/lib/schemas/responses";
import { parseScenario } from "@/lib/schemas/scenario";
import { noiseMarginConfigSchema } from "@/lib/schemas/study";
import { simulate } from "@/lib/sim";
import { runStudyInProcess } from "@/lib/studies/study";
import { startServer, type TestServer } from "@/tests/helpers/server";
import { type Caller, setupTeam, type TeamFixture, waitForMail } from "@/tests/helpers/team";

let server: TestServer;
let fx: TeamFixture;
let boardId = "";

beforeAll(async () => {
  server = await startServer();
  fx = await setupTeam(server);
  const boards = (await (await fx.sessions.designer.fetch("/api/boards")).json()) as { items: { id: string }[] };
  boardId = boards.items[0].id;
});
afterAll(async () => {
  await server?.stop();
});

/** Calls the route, expects the status, parses the body strictly with the schema and returns it. */
async function answer<S extends z.ZodType>(
  who: Caller,
  path: string,
  schema: S,
  { method = "GET", body, status = 200 }: { method?: string; body?: unknown; status?: number } = {},
): Promise<z.infer<S>> {
  const init: RequestInit = { method };
  if (body instanceof FormData) init.body = body;
  else if (body !== undefined) init.body = JSON.stringify(body);
  const res = await who.fetch(path, init);
  const text = await res.text();
  expect(res.status, `${method} ${path}: ${text.slice(0, 300)}`).toBe(status);
  const parsed = schema.safeParse(JSON.parse(text));
  expect(parsed.error?.issues ?? [], `${method} ${path}`).toEqual([]);
  return parsed.data as z.infer<S>;
}

describe("every answer parses with its response schema", () => {
  it("health (no session)", async () => {
    await answer(fx.callers.anon, "/api/health", healthSchema);
  });

  it("boards: list, one, create, patch, delete", async () => {
    const owner = fx.sessions.owner;
    const list = await answer(owner, "/api/boards", listOf(boardSchema));
    expect(list.items.length).toBeGreaterThan(0);
    await answer(owner, `/api/boards/${boardId}`, boardSchema);
    const made = await answer(owner, "/api/boards", boardSchema, {
      method: "POST",
      body: { name: "Contract check board" },
      status: 201,
    });
    await answer(owner, `/api/boards/${made.id}`, boardSchema, { method: "PATCH", body: { description: "spare" } });
    await answer(owner, `/api/boards/${made.id}`, deletedSchema, { method: "DELETE" });
  });

  it("scenarios: lean list, one, create, save, versions, restore, delete", async () => {
    const designer = fx.sessions.designer;
    const list = await answer(designer, `/api/scenarios?boardId=${boardId}`, listOf(scenarioSummarySchema));
    // The demo board holds a scenario with an uploaded capture: its samples are left out and counted.
    const counted = list.items.flatMap((s) => s.scenario.input.components).filter((c) => "pointCount" in c);
    expect(counted.length).toBeGreaterThan(0);
    const one = await answer(designer, `/api/scenarios/${fx.scenarioId}`, scenarioRecordSchema);
    const made = await answer(designer, "/api/scenarios", scenarioRecordSchema, {
      method: "POST",
      body: { boardId, name: "Contract check scenario", scenario: one.scenario },
      status: 201,
    });
    const saved = await answer(designer, `/api/scenarios/${made.id}`, scenarioRecordSchema, {
      method: "PUT",
      body: { name: "Contract check scenario, renamed", baseVersion: 1 },
    });
    expect(saved.version).toBe(2);
    const versions = await answer(designer, `/api/scenarios/${made.id}/versions`, listOf(scenarioVersionSchema));
    expect(versions.items.map((v) => v.version)).toEqual([2, 1]);
    await answer(designer, `/api/scenarios/${made.id}/versions/1`, scenarioVersionDocSchema);
    await answer(designer, `/api/scenarios/${made.id}/versions/1/restore`, scenarioRecordSchema, { method: "POST" });
    await answer(designer, `/api/scenarios/${made.id}`, deletedSchema, { method: "DELETE" });
  });

  it("runs: list, one, create, delete, study get and put, shared link", async () => {
    const designer = fx.sessions.designer;
    await answer(designer, `/api/runs?scenarioId=${fx.scenarioId}`, listOf(runSummarySchema));
    const run = await answer(designer, `/api/runs/${fx.runId}`, runSchema);
    await answer(designer, `/api/runs/${fx.runId}/study`, runStudySchema);
    const config = noiseMarginConfigSchema.parse({
      kind: "noise-margin",
      seed: 7,
      rmsFrom: 0.005,
      rmsTo: 0.02,
      levels: 2,
      seedsPerLevel: 1,
      bandwidth: 5,
      limit: 0.05,
    });
    const scenario = parseScenario(run.scenario);
    const tasks = runStudyInProcess({ scenario, config }, simulate) as never;
    const stored = await answer(designer, `/api/runs/${fx.runId}/study`, runStudySavedSchema, {
      method: "PUT",
      body: { schema: "railwise.study/1", noiseMargin: { config, tasks } },
    });
    expect(stored.study.noiseMargin?.summary.levels).toHaveLength(2);
    const shared = await answer(fx.callers.anon, `/api/links/${fx.linkToken}`, sharedRunSchema);
    expect(shared.study?.noiseMargin).toBeDefined();
    const extra = await answer(designer, "/api/runs", runSchema, {
      method: "POST",
      body: { scenarioId: fx.scenarioId, label: "contract check" },
      status: 201,
    });
    await answer(designer, `/api/runs/${extra.id}`, deletedSchema, { method: "DELETE" });
  });

  it("run links, comments, sign-offs, review requests and the queue", async () => {
    const { designer, reviewer } = fx.sessions;
    const base = `/api/runs/${fx.runId}`;
    const link = await answer(designer, `${base}/links`, runLinkCreatedSchema, {
      method: "POST",
      body: { expiresInDays: 3, label: "for the yard" },
      status: 201,
    });
    await answer(designer, `${base}/links`, listOf(runLinkSchema));
    await answer(designer, `${base}/links/${link.id}`, runLinkSchema, { method: "DELETE" });
    await answer(reviewer, `${base}/comments`, commentSchema, {
      method: "POST",
      body: { body: "Deadband looks right." },
      status: 201,
    });
    await answer(designer, `${base}/comments`, listOf(commentSchema));
    const members = await answer(designer, "/api/team/members", listOf(memberSchema));
    const reviewerId = members.items.find((m) => m.role === "reviewer")!.id;
    await answer(designer, `${base}/review-requests`, listOf(reviewRequestSchema), {
      method: "POST",
      body: { reviewerIds: [reviewerId] },
      status: 201,
    });
    await answer(designer, `${base}/review-requests`, listOf(reviewRequestSchema));
    await answer(reviewer, "/api/review/queue", reviewQueueSchema);
    const first = await answer(reviewer, `${base}/signoffs`, signoffSchema, {
      method: "POST",
      body: { decision: "changes_requested", note: "Widen the deadband." },
      status: 201,
    });
    await answer(reviewer, `${base}/signoffs`, signoffSchema, {
      method: "POST",
      body: { decision: "approved" },
      status: 201,
    });
    const list = await answer(designer, `${base}/signoffs`, signoffListSchema);
    expect(list.withdrawn.map((s) => s.id)).toContain(first.id);
    await answer(reviewer, `${base}/signoffs/${list.items[0].id}`, signoffSchema, { method: "DELETE" });
    // With a standing decision the scenario carries latestDecision and the queue a decided item.
    await answer(reviewer, `${base}/signoffs`, signoffSchema, {
      method: "POST",
      body: { decision: "approved" },
      status: 201,
    });
    const withDecision = await answer(designer, `/api/scenarios/${fx.scenarioId}`, scenarioRecordSchema);
    expect(withDecision.latestDecision?.decision).toBe("approved");
    const queue = await answer(designer, `/api/review/queue?boardId=${boardId}`, reviewQueueSchema);
    expect(queue.decided.length).toBeGreaterThan(0);
  });

  it("team: members, role change, invitations with preview and accept, audit", async () => {
    const owner = fx.sessions.owner;
    const members = await answer(owner, "/api/team/members", listOf(memberSchema));
    const viewer = members.items.find((m) => m.role === "viewer")!;
    // Setting the role a member already has changes nothing (and ends no session).
    await answer(owner, `/api/team/members/${viewer.id}`, memberSchema, { method: "PATCH", body: { role: "viewer" } });
    const email = "contract.check@fjordline.example";
    await answer(owner, "/api/team/invitations", invitationCreatedSchema, {
      method: "POST",
      body: { email, role: "viewer" },
      status: 201,
    });
    await answer(owner, "/api/team/invitations", listOf(invitationSchema));
    const mail = await waitForMail(server.mailDir, (m) => m.to.includes(email));
    const token = /\/invite\/([A-Za-z0-9_-]+)/.exec(mail.text)![1];
    await answer(fx.callers.anon, `/api/invitations/${token}`, invitationPreviewSchema);
    await answer(fx.callers.anon, `/api/invitations/${token}/accept`, invitationAcceptedSchema, {
      method: "POST",
      body: { name: "Contract Check", password: DEMO_PASSWORD },
      status: 201,
    });
    const audit = await answer(owner, "/api/team/audit", listOf(auditEntrySchema));
    expect(audit.items.some((e) => e.action === "member.joined")).toBe(true);
  });

  it("part profiles and captures", async () => {
    const designer = fx.sessions.designer;
    await answer(designer, "/api/parts", listOf(partProfileJsonSchema));
    const part = await answer(designer, "/api/parts", partProfileJsonSchema, {
      method: "POST",
      body: { name: "Contract check part", opamp: GENERAL_PURPOSE_BIPOLAR },
      status: 201,
    });
    await answer(designer, `/api/parts/${part.id}`, partProfileJsonSchema);
    await answer(designer, `/api/parts/${part.id}`, partProfileJsonSchema, {
      method: "PUT",
      body: { name: "Contract check part, renamed", opamp: GENERAL_PURPOSE_BIPOLAR },
    });
    const csv = `name,${Object.keys(GENERAL_PURPOSE_BIPOLAR).join(",")}\nContract import,${Object.values(GENERAL_PURPOSE_BIPOLAR).join(",")}\n`;
    const form = new FormData();
    form.set("file", new Blob([csv], { type: "text/csv" }), "parts.csv");
    await answer(designer, "/api/parts/import", listOf(partProfileJsonSchema), {
      method: "POST",
      body: form,
      status: 201,
    });
    const upload = new FormData();
    upload.set("file", new Blob(["t,v\n0,0\n0.001,3.3\n0.002,0\n"], { type: "text/csv" }), "probe.csv");
    upload.set("timeColumn", "t");
    upload.set("voltsColumn", "v");
    // The create answers the summary (the samples are what was just uploaded).
    const capture = await answer(designer, "/api/captures", captureSummarySchema, {
      method: "POST",
      body: upload,
      status: 201,
    });
    await answer(designer, "/api/captures", listOf(captureSummarySchema));
    await answer(designer, `/api/captures/${capture.id}`, captureSchema);
  });
});
