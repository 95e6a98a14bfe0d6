import { describe, expect, expectTypeOf, it } from "vitest";
import type { AuditJson as ServerAuditJson } from "@/lib/server/audit";
import type {
  CaptureJson as ServerCaptureJson,
  CaptureSummaryJson as ServerCaptureSummary,
} from "@/lib/server/captures";
import type { PartProfileJson as ServerPartJson } from "@/lib/server/parts";
import {
  type AuditJson,
  auditEntrySchema,
  type CaptureJson,
  type CaptureSummaryJson,
  captureSchema,
  captureSummarySchema,
  listOf,
  type PartProfileJson,
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
