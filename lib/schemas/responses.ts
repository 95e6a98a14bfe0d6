// Response schemas: the JSON the API answers with, the one place these shapes are declared.
// The server mappers (lib/server) and the SWR hooks (lib/client) take their types from here with
// z.infer; tests/integration/response-schemas.test.ts parses every route's answer with them.
// See lib/schemas/README.md § Responses.
import { z } from "zod";
import { DECISIONS, roleSchema } from "./roles";
import { opampSchema, type Scenario, scenarioSchema } from "./scenario";
import { savedStudySchema } from "./study";
import { storedResultSchema } from "./result";
import type { LeanScenario } from "./lean-scenario";
import { finite, nonNegative } from "./units";

const isoTime = z.iso.datetime({ offset: true });
const id = z.string().min(1);
const count = z.number().int().nonnegative();

// ---- Errors ----

/** One problem with a request: `path` names the field (as the request spells it). */
export const issueSchema = z.strictObject({
  path: z.array(z.union([z.string(), z.number()])),
  message: z.string(),
  code: z.string().optional(),
});

/**
 * Every refusal and failure: `{ error: code, message, issues? }`. The codes and their one HTTP
 * status are lib/server/error-codes.ts; `issues` comes with a 400 that names fields.
 */
export const apiErrorSchema = z.strictObject({
  error: z.string().regex(/^[a-z_]+$/),
  message: z.string().min(1),
  issues: z.array(issueSchema).optional(),
});

export type IssueJson = z.infer<typeof issueSchema>;
export type ApiErrorJson = z.infer<typeof apiErrorSchema>;

/** Every list route answers `{ items: [...] }`. */
export const listOf = <T extends z.ZodType>(item: T) => z.strictObject({ items: z.array(item) });

/** DELETE of a board, scenario or run: `{ id, deleted: true }`. */
export const deletedSchema = z.strictObject({ id, deleted: z.literal(true) });

/** A user named on a stored object (`updatedBy`, `createdBy`, a version's `author`); null when none was recorded. */
export const personSchema = z.strictObject({ id, name: z.string() }).nullable();

/** The author of a comment, a sign-off's reviewer, a review request's people: `id` is null once the account is gone. */
export const memberRefSchema = z.strictObject({ id: z.string().nullable(), name: z.string() });

export const decisionValueSchema = z.enum(DECISIONS);

// ---- Health ----

/** GET /api/health */
export const healthSchema = z.strictObject({
  status: z.literal("ok"),
  database: z.strictObject({ dialect: z.string(), ok: z.literal(true) }),
  time: isoTime,
});

// ---- Boards ----

/** GET /api/boards items, GET/PATCH /api/boards/:id, POST /api/boards. */
export const boardSchema = z.strictObject({
  id,
  name: z.string(),
  description: z.string(),
  scenarioCount: count,
  createdAt: isoTime,
  updatedAt: isoTime,
});

// ---- Scenarios ----

/** The latest standing sign-off over all runs of a scenario (`latestDecision`). */
export const latestDecisionSchema = z.strictObject({
  decision: decisionValueSchema,
  at: isoTime,
  by: memberRefSchema,
  runId: id,
  note: z.string(),
  /** The scenario version the decision applies to (the run's); null for runs from before versions were kept. */
  scenarioVersion: z.number().int().positive().nullable(),
  /** The scenario was saved again after the decided version: the approval no longer covers it. */
  outOfDate: z.boolean(),
});

/** Adds the issues of parsing `value` with `schema` (paths kept) to a refinement. */
function addIssuesOf(schema: z.ZodType, value: unknown, ctx: z.RefinementCtx) {
  const r = schema.safeParse(value);
  if (!r.success) for (const i of r.error.issues) ctx.addIssue({ code: "custom", path: i.path, message: i.message });
}

/** A stored scenario document: it must parse as `railwise.scenario/1`. */
const storedScenario = z.custom<Scenario>().superRefine((v, ctx) => addIssuesOf(scenarioSchema, v, ctx));

/** GET/PUT /api/scenarios/:id, POST /api/scenarios, POST …/versions/:version/restore. */
export const scenarioRecordSchema = z.strictObject({
  id,
  boardId: id,
  name: z.string(),
  version: z.number().int().positive(),
  scenario: storedScenario,
  createdAt: isoTime,
  updatedAt: isoTime,
  updatedBy: personSchema,
  latestDecision: latestDecisionSchema.nullable(),
});

export type { LeanComponent, LeanScenario } from "./lean-scenario";

const LEAN_PLACEHOLDER: [number, number][] = [
  [0, 0],
  [1, 0],
];

/**
 * A lean scenario is a scenario document whose pwl/capture components hold an empty array and a
 * `pointCount`; with two placeholder points in their place it must parse as a scenario.
 */
function checkLean(doc: unknown, ctx: z.RefinementCtx) {
  const components = (doc as { input?: { components?: unknown } } | null)?.input?.components;
  if (!Array.isArray(components)) {
    ctx.addIssue({ code: "custom", path: ["input", "components"], message: "input.components must be a list" });
    return;
  }
  const restored = components.map((c, i) => {
    if (!c || typeof c !== "object" || !("pointCount" in c)) return c;
    const { pointCount, ...rest } = c as { pointCount: unknown; kind?: unknown; points?: unknown; samples?: unknown };
    const field = rest.kind === "pwl" ? "points" : "samples";
    const arr = rest[field];
    if (!Number.isInteger(pointCount) || (pointCount as number) < 0 || !Array.isArray(arr) || arr.length !== 0)
      ctx.addIssue({
        code: "custom",
        path: ["input", "components", i],
        message: `a lean ${String(rest.kind)} component holds an empty ${field} list and a whole pointCount`,
      });
    return { ...rest, [field]: LEAN_PLACEHOLDER };
  });
  const input = { ...(doc as { input: object }).input, components: restored };
  addIssuesOf(scenarioSchema, { ...(doc as object), input }, ctx);
}

const leanScenario = z.custom<LeanScenario>().superRefine(checkLean);

/** GET /api/scenarios?boardId= items: the scenario without its waveform arrays, marked `lean: true`. */
export const scenarioSummarySchema = scenarioRecordSchema.extend({ scenario: leanScenario, lean: z.literal(true) });

/** GET /api/scenarios/:id/versions items (no document) and GET …/versions/:version (with `scenario`). */
export const scenarioVersionSchema = z.strictObject({
  version: z.number().int().positive(),
  name: z.string(),
  note: z.string().nullable(),
  createdAt: isoTime,
  author: personSchema,
});
export const scenarioVersionDocSchema = scenarioVersionSchema.extend({ scenario: storedScenario });

// ---- Runs and results ----

// The result shapes live in ./result (lib/sim takes its types from there).

// ---- Studies (`railwise.study/1` as stored) ----

// The stored study shape (savedStudySchema) lives in ./study beside the upload it extends.

/** GET /api/runs/:id/study */
export const runStudySchema = z.strictObject({ study: savedStudySchema.nullable() });
/** PUT /api/runs/:id/study */
export const runStudySavedSchema = z.strictObject({ id, study: savedStudySchema });

/** GET /api/runs/:id and POST /api/runs: a run with its scenario snapshot and stored result. */
export const runSchema = z.strictObject({
  id,
  scenarioId: id,
  scenarioVersion: z.number().int().positive().nullable(),
  label: z.string(),
  createdAt: isoTime,
  createdBy: personSchema,
  scenario: storedScenario,
  result: storedResultSchema,
  study: savedStudySchema.nullable(),
});

/** GET /api/runs?scenarioId= items: no snapshot, samples or events (open the run for those). */
export const runSummarySchema = runSchema.omit({ scenario: true, result: true }).extend({
  scenarioName: z.string().nullable(),
  result: storedResultSchema.omit({ samples: true, events: true }).extend({ eventCount: count }),
});

/** GET /api/links/:token: the shared run, read-only (nothing of the team). */
export const sharedRunSchema = z.strictObject({
  scenarioName: z.string().nullable(),
  id,
  label: z.string(),
  createdAt: isoTime,
  scenario: storedScenario,
  result: storedResultSchema,
  study: savedStudySchema.nullable(),
  link: z.strictObject({ expiresAt: isoTime.nullable() }),
});

// ---- Run links, comments, sign-offs, review requests, the review queue ----

/** GET /api/runs/:id/links items and DELETE …/links/:linkId; POST adds `token` and `url` (shown once). */
export const runLinkSchema = z.strictObject({
  id,
  runId: id,
  label: z.string().nullable(),
  lastUsedAt: isoTime.nullable(),
  useCount: count,
  expiresAt: isoTime.nullable(),
  revokedAt: isoTime.nullable(),
  createdAt: isoTime,
  createdBy: z.string().nullable(),
  state: z.enum(["active", "expired", "revoked"]),
});
export const runLinkCreatedSchema = runLinkSchema.extend({ token: z.string().min(1), url: z.url() });

/** GET /api/runs/:id/comments items, POST …/comments. */
export const commentSchema = z.strictObject({
  id,
  runId: id,
  body: z.string(),
  author: memberRefSchema,
  createdAt: isoTime,
});

/** A sign-off with the scenario version it applies to; withdrawn ones carry `withdrawnAt`. */
export const signoffSchema = z.strictObject({
  id,
  runId: id,
  decision: decisionValueSchema,
  note: z.string(),
  reviewer: memberRefSchema,
  createdAt: isoTime,
  scenarioVersion: z.number().int().positive().nullable(),
  withdrawnAt: isoTime.nullable(),
});

/** GET /api/runs/:id/signoffs: `items` are the standing decisions (newest first; the first is the run's state). */
export const signoffListSchema = z.strictObject({ items: z.array(signoffSchema), withdrawn: z.array(signoffSchema) });

/** GET/POST /api/runs/:id/review-requests items. */
export const reviewRequestSchema = z.strictObject({
  id,
  runId: id,
  reviewer: memberRefSchema,
  requestedBy: memberRefSchema,
  note: z.string(),
  createdAt: isoTime,
  /** The reviewer's standing decision on the run, if any. */
  decision: decisionValueSchema.nullable(),
  decidedAt: isoTime.nullable(),
});

export const queueItemSchema = z.strictObject({
  run: z.strictObject({
    id,
    label: z.string(),
    createdAt: isoTime,
    scenarioVersion: z.number().int().positive().nullable(),
    scenario: z.strictObject({
      id,
      name: z.string(),
      version: z.number().int().positive(),
      boardId: id,
      boardName: z.string(),
    }),
  }),
  requests: z.array(reviewRequestSchema),
  /** The run's standing decision (latest non-withdrawn sign-off), if any. */
  decision: signoffSchema.nullable(),
  /** The decision applies to an older scenario version than the scenario's current one. */
  outOfDate: z.boolean(),
});

/** GET /api/review/queue */
export const reviewQueueSchema = z.strictObject({
  waitingOnMe: z.array(queueItemSchema),
  requestedByMe: z.array(queueItemSchema),
  decided: z.array(queueItemSchema),
});

// ---- Team ----

/** GET /api/team/members items, PATCH /api/team/members/:id. `id` is the member's user id. */
export const memberSchema = z.strictObject({
  id,
  membershipId: id,
  name: z.string(),
  email: z.string(),
  role: roleSchema,
  joinedAt: isoTime,
});

/** GET /api/team/invitations items; POST adds `mailSent`. */
export const invitationSchema = z.strictObject({
  id,
  email: z.string(),
  role: roleSchema,
  expiresAt: isoTime,
  createdAt: isoTime,
  invitedBy: z.string().nullable(),
});
export const invitationCreatedSchema = invitationSchema.extend({ mailSent: z.boolean() });

/** GET /api/invitations/:token (no session). */
export const invitationPreviewSchema = z.strictObject({
  email: z.string(),
  role: roleSchema,
  teamName: z.string(),
  expiresAt: isoTime,
  existingAccount: z.boolean(),
});

/** POST /api/invitations/:token/accept (201). */
export const invitationAcceptedSchema = z.strictObject({ email: z.string(), role: roleSchema, userId: id });

// ---- Captures, audit, part profiles ----

/** GET /api/captures items and POST /api/captures (201): a measured waveform without its samples. */
export const captureSummarySchema = z.strictObject({
  id,
  name: z.string(),
  sourceFilename: z.string().nullable(),
  columns: z.strictObject({ time: z.string(), value: z.string() }),
  points: count,
  start: finite("start"),
  duration: nonNegative("duration"),
  min: finite("min"),
  max: finite("max"),
  createdBy: z.string().nullable(),
  createdAt: isoTime,
});

/** GET /api/captures/:id: the summary plus [[t, v], ...] in s and V. */
export const captureSchema = captureSummarySchema.extend({
  samples: z.array(z.tuple([finite("sample time"), finite("sample value")])),
});

/** GET /api/team/audit items. `details` is free-form per action. */
export const auditEntrySchema = z.strictObject({
  id,
  action: z.string(),
  actorId: z.string().nullable(),
  actorName: z.string().nullable(),
  targetType: z.string().nullable(),
  targetId: z.string().nullable(),
  /** What the entry is about, in words: the member's name, or the run's label and scenario. */
  targetName: z.string().nullable(),
  details: z.unknown(),
  createdAt: isoTime,
});

/** GET /api/parts items, GET/PUT /api/parts/:id, POST /api/parts: a named op-amp parameter set. */
export const partProfileJsonSchema = z.strictObject({
  id,
  name: z.string(),
  opamp: opampSchema,
  createdBy: z.string().nullable(),
  createdAt: isoTime,
  updatedAt: isoTime,
});

export type ListOf<T> = { items: T[] };
export type DeletedJson = z.infer<typeof deletedSchema>;
export type PersonJson = z.infer<typeof personSchema>;
export type MemberRefJson = z.infer<typeof memberRefSchema>;
export type HealthJson = z.infer<typeof healthSchema>;
export type BoardJson = z.infer<typeof boardSchema>;
export type LatestDecisionJson = z.infer<typeof latestDecisionSchema>;
export type ScenarioJson = z.infer<typeof scenarioRecordSchema>;
export type ScenarioSummaryJson = z.infer<typeof scenarioSummarySchema>;
export type ScenarioVersionJson = z.infer<typeof scenarioVersionSchema>;
export type ScenarioVersionDocJson = z.infer<typeof scenarioVersionDocSchema>;
export type { ResultJson, StoredResultJson } from "./result";
export type SavedStudyJson = z.infer<typeof savedStudySchema>;
export type RunJson = z.infer<typeof runSchema>;
export type RunSummaryJson = z.infer<typeof runSummarySchema>;
export type SharedRunJson = z.infer<typeof sharedRunSchema>;
export type RunLinkJson = z.infer<typeof runLinkSchema>;
export type RunLinkCreatedJson = z.infer<typeof runLinkCreatedSchema>;
export type CommentJson = z.infer<typeof commentSchema>;
export type SignoffJson = z.infer<typeof signoffSchema>;
export type SignoffListJson = z.infer<typeof signoffListSchema>;
export type ReviewRequestJson = z.infer<typeof reviewRequestSchema>;
export type QueueItemJson = z.infer<typeof queueItemSchema>;
export type ReviewQueueJson = z.infer<typeof reviewQueueSchema>;
export type MemberJson = z.infer<typeof memberSchema>;
export type InvitationJson = z.infer<typeof invitationSchema>;
export type InvitationCreatedJson = z.infer<typeof invitationCreatedSchema>;
export type InvitationPreviewJson = z.infer<typeof invitationPreviewSchema>;
export type InvitationAcceptedJson = z.infer<typeof invitationAcceptedSchema>;
export type CaptureSummaryJson = z.infer<typeof captureSummarySchema>;
export type CaptureJson = z.infer<typeof captureSchema>;
export type AuditJson = z.infer<typeof auditEntrySchema>;
export type PartProfileJson = z.infer<typeof partProfileJsonSchema>;
