import { describe, expect, expectTypeOf, it } from "vitest";
import type { AuditJson as ServerAuditJson } from "@/lib/server/audit";
import type {
  CaptureJson as ServerCaptureJson,
  CaptureSummaryJson as ServerCaptureSummary,
} from "@/lib/server/captures";
import type { PartProfileJson as ServerPartJson } from "@/lib/server/parts";
import type { BoardJson as ServerBoardJson } from "@/lib/server/boards";
import type { listScenarios, ScenarioJson as ServerScenarioJson } from "@/lib/server/scenarios";
import type { RunJson as ServerRunJson, RunSummaryJson as ServerRunSummaryJson } from "@/lib/server/runs";
import type { createRunLink, LatestDecisionJson as ServerLatestDecision, reviewQueue } from "@/lib/server/review";
import type { listMembers } from "@/lib/server/team";
import type { checkDatabase } from "@/lib/server/health";
import type { PersonJson as IdsPersonJson } from "@/lib/server/ids";
import type { storedResult } from "@/lib/server/sim-worker";
import type { ResultJson as CoreResultJson, SimMetrics } from "@/lib/sim/types";
import type { toResultJson } from "@/lib/sim";
import { GENERAL_PURPOSE_BIPOLAR } from "@/lib/demo/parts";
import type { useBoards } from "@/lib/client/boards";
import type { useScenarios, useScenarioVersion } from "@/lib/client/scenarios";
import type { useRun } from "@/lib/client/runs";
import type { useSignoffs } from "@/lib/client/signoffs";
import type { useReviewQueue } from "@/lib/client/review-requests";
import type { useMembers } from "@/lib/client/members";
import type { useCaptures } from "@/lib/client/captures";
import type { buildSavedStudy, SavedStudy } from "@/lib/studies";
import {
  type AuditJson,
  auditEntrySchema,
  type BoardJson,
  type CaptureJson,
  type CaptureSummaryJson,
  captureSchema,
  captureSummarySchema,
  type HealthJson,
  type LatestDecisionJson,
  listOf,
  type MemberJson,
  type PartProfileJson,
  type PersonJson,
  type ResultJson,
  type ReviewQueueJson,
  type ScenarioVersionDocJson,
  type SignoffListJson,
  boardSchema,
  type RunJson,
  type RunLinkCreatedJson,
  type RunSummaryJson,
  runLinkCreatedSchema,
  runLinkSchema,
  type SavedStudyJson,
  type ScenarioJson,
  type ScenarioSummaryJson,
  type StoredResultJson,
  scenarioRecordSchema,
  scenarioSummarySchema,
  signoffSchema,
} from "@/lib/schemas/responses";

// Shapes follow the server mappers in lib/server (captures.ts, audit.ts, parts.ts); common practice, no source.
const summary = {
  id: "c1",
  name: "Bench comparator input",
  sourceFilename: "bench.csv",
  columns: { time: "t", value: "v" },
  points: 2,
  start: 0,
  duration: 0.001,
  min: -1.2,
  max: 3.3,
  createdBy: null,
  createdAt: "2026-12-03T08:00:00.000Z",
};

describe("response schemas", () => {
  it("accept the capture summary and full capture the server builds", () => {
    expect(captureSummarySchema.parse(summary)).toEqual(summary);
    const full = { ...summary, samples: [[0, -1.2] as [number, number], [0.001, 3.3] as [number, number]] };
    expect(captureSchema.parse(full).samples).toHaveLength(2);
    expect(listOf(captureSummarySchema).parse({ items: [summary] }).items).toHaveLength(1);
  });

  it("are strict: an unknown or missing field is named in the issue", () => {
    const extra = captureSummarySchema.safeParse({ ...summary, samples: [] });
    expect(extra.success).toBe(false);
    expect(JSON.stringify(extra.error?.issues)).toContain("samples");
    const { createdBy: _drop, ...missing } = summary;
    const r = captureSummarySchema.safeParse(missing);
    expect(r.success).toBe(false);
    expect(r.error?.issues[0].path).toEqual(["createdBy"]);
  });

  it("reject a non-ISO time and a non-finite statistic", () => {
    expect(captureSummarySchema.safeParse({ ...summary, createdAt: "yesterday" }).success).toBe(false);
    expect(captureSummarySchema.safeParse({ ...summary, max: Number.POSITIVE_INFINITY }).success).toBe(false);
  });

  it("accept an audit entry with targetName (the field the old client type had lost)", () => {
    const entry = {
      id: "a1",
      action: "member.invited",
      actorId: "u1",
      actorName: "Ada",
      targetType: null,
      targetId: null,
      targetName: null,
      details: { email: "x@example.test" },
      createdAt: "2026-12-03T08:00:00.000Z",
    };
    expect(auditEntrySchema.parse(entry)).toEqual(entry);
    const { targetName: _t, ...old } = entry;
    expect(auditEntrySchema.safeParse(old).success).toBe(false);
  });

  it("match the server mapper types both ways", () => {
    expectTypeOf<ServerCaptureSummary>().toEqualTypeOf<CaptureSummaryJson>();
    expectTypeOf<ServerCaptureJson>().toExtend<CaptureJson>();
    expectTypeOf<CaptureJson>().toExtend<ServerCaptureJson>();
    expectTypeOf<ServerAuditJson>().toEqualTypeOf<AuditJson>();
    expectTypeOf<ServerPartJson>().toExtend<PartProfileJson>();
    expectTypeOf<PartProfileJson>().toExtend<ServerPartJson>();
  });
});

describe("response schemas of the other resources", () => {
  const t = "2026-12-03T08:00:00.000Z";
  const uuid = "0b5c0f2e-8d7a-4b8e-9a51-3f1b2c4d5e6f";
  // A minimal valid railwise.scenario/1 (lib/schemas/README.md § Scenario JSON); common practice, no source.
  const scenario = {
    schema: "railwise.scenario/1",
    supply: { positive: 5, negative: 0 },
    opamp: GENERAL_PURPOSE_BIPOLAR,
    stage: { kind: "comparator", reference: 2.5 },
    input: {
      components: [
        {
          kind: "pwl",
          points: [
            [0, 0],
            [1, 5],
          ],
        },
      ],
    },
    run: { duration: 1, points: 11 },
  };
  const record = {
    id: uuid,
    boardId: uuid,
    name: "Float switch",
    version: 2,
    scenario,
    createdAt: t,
    updatedAt: t,
    updatedBy: { id: uuid, name: "Ada" },
    latestDecision: null,
  };

  it("check a stored scenario against railwise.scenario/1 and name the bad field", () => {
    expect(scenarioRecordSchema.safeParse(record).success).toBe(true);
    const bad = scenarioRecordSchema.safeParse({
      ...record,
      scenario: { ...scenario, supply: { positive: 0, negative: 5 } },
    });
    expect(bad.success).toBe(false);
    expect(bad.error?.issues[0].path.slice(0, 2)).toEqual(["scenario", "supply"]);
  });

  it("accept a lean list item only with empty arrays and a point count", () => {
    const lean = {
      ...record,
      lean: true,
      scenario: { ...scenario, input: { components: [{ kind: "pwl", points: [], pointCount: 2 }] } },
    };
    expect(scenarioSummarySchema.safeParse(lean).success).toBe(true);
    const full = { ...lean, scenario };
    expect(
      scenarioSummarySchema.safeParse({
        ...full,
        scenario: { ...scenario, input: { components: [{ kind: "pwl", points: [[0, 0]], pointCount: 1 }] } },
      }).success,
    ).toBe(false);
    expect(scenarioSummarySchema.safeParse({ ...record }).success).toBe(false); // no `lean`
  });

  it("keep a run link's token out of list items and require it on the create answer", () => {
    const link = {
      id: uuid,
      runId: uuid,
      label: null,
      lastUsedAt: null,
      useCount: 0,
      expiresAt: null,
      revokedAt: null,
      createdAt: t,
      createdBy: uuid,
      state: "active",
    };
    expect(runLinkSchema.safeParse(link).success).toBe(true);
    expect(runLinkSchema.safeParse({ ...link, token: "abc" }).success).toBe(false);
    expect(runLinkCreatedSchema.safeParse(link).success).toBe(false);
    expect(runLinkCreatedSchema.safeParse({ ...link, token: "abc", url: "http://localhost/share/abc" }).success).toBe(
      true,
    );
  });

  it("refuse a decision outside the two the API stores (the old client type allowed any string)", () => {
    const signoff = {
      id: uuid,
      runId: uuid,
      decision: "approved",
      note: "",
      reviewer: { id: null, name: "(removed account)" },
      createdAt: t,
      scenarioVersion: 1,
      withdrawnAt: null,
    };
    expect(signoffSchema.safeParse(signoff).success).toBe(true);
    expect(signoffSchema.safeParse({ ...signoff, decision: "changes-requested" }).success).toBe(false);
    expect(signoffSchema.safeParse({ ...signoff, decision: "maybe" }).success).toBe(false);
  });

  it("match the server mappers' and the core's types", () => {
    expectTypeOf<ServerBoardJson>().toEqualTypeOf<BoardJson>();
    expectTypeOf<ServerScenarioJson>().toEqualTypeOf<ScenarioJson>();
    expectTypeOf<ServerRunJson>().toEqualTypeOf<RunJson>();
    expectTypeOf<ServerRunSummaryJson>().toEqualTypeOf<RunSummaryJson>();
    expectTypeOf<ServerLatestDecision>().toEqualTypeOf<LatestDecisionJson>();
    expectTypeOf<Awaited<ReturnType<typeof listScenarios>>>().toEqualTypeOf<ScenarioSummaryJson[]>();
    expectTypeOf<Awaited<ReturnType<typeof listMembers>>>().toEqualTypeOf<MemberJson[]>();
    expectTypeOf<Awaited<ReturnType<typeof createRunLink>>>().toEqualTypeOf<RunLinkCreatedJson>();
    expectTypeOf<Awaited<ReturnType<typeof reviewQueue>>>().toEqualTypeOf<ReviewQueueJson>();
    expectTypeOf<Awaited<ReturnType<typeof checkDatabase>>>().toEqualTypeOf<HealthJson["database"]>();
    // The person shape lib/server/ids.ts builds; the result the simulator produces and the server
    // stores, and the study lib/studies stores: each declared once (lib/schemas/result.ts,
    // lib/schemas/study.ts), so these hold by construction and guard against a new twin.
    expectTypeOf<IdsPersonJson>().toEqualTypeOf<PersonJson>();
    expectTypeOf<CoreResultJson>().toEqualTypeOf<ResultJson>();
    expectTypeOf<ReturnType<typeof toResultJson>>().toEqualTypeOf<ResultJson>();
    expectTypeOf<ReturnType<typeof storedResult>>().toEqualTypeOf<StoredResultJson>();
    expectTypeOf<SimMetrics>().toEqualTypeOf<ResultJson["metrics"]>();
    expectTypeOf<SavedStudy>().toEqualTypeOf<SavedStudyJson>();
    expectTypeOf<ReturnType<typeof buildSavedStudy>>().toEqualTypeOf<SavedStudyJson>();
  });
});

describe("SWR hooks (one module per resource in lib/client)", () => {
  type Data<H extends (...args: never[]) => { data?: unknown }> = NonNullable<ReturnType<H>["data"]>;
  it("answer the schema types", () => {
    expectTypeOf<Data<typeof useBoards>>().toEqualTypeOf<{ items: BoardJson[] }>();
    expectTypeOf<Data<typeof useScenarios>>().toEqualTypeOf<{ items: ScenarioSummaryJson[] }>();
    expectTypeOf<Data<typeof useScenarioVersion>>().toEqualTypeOf<ScenarioVersionDocJson>();
    expectTypeOf<Data<typeof useRun>>().toEqualTypeOf<RunJson>();
    expectTypeOf<Data<typeof useSignoffs>>().toEqualTypeOf<SignoffListJson>();
    expectTypeOf<Data<typeof useReviewQueue>>().toEqualTypeOf<ReviewQueueJson>();
    expectTypeOf<Data<typeof useMembers>>().toEqualTypeOf<{ items: MemberJson[] }>();
    expectTypeOf<Data<typeof useCaptures>>().toEqualTypeOf<{ items: CaptureSummaryJson[] }>();
    // A value check so the test asserts at run time too: the schema list wrapper is strict.
    expect(listOf(boardSchema).safeParse({ items: [], extra: 1 }).success).toBe(false);
  });
});
