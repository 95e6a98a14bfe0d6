import "server-only";
import { Op } from "sequelize";
import { getModels, getSequelize } from "@/models";
import { selectPrepared } from "@/models/prepared";
import type { Transaction } from "sequelize";
import { badRequest, conflict, forbidden, gone, notFound } from "@/lib/server/errors";
import { isId } from "@/lib/server/ids";
import { recordAudit } from "@/lib/server/audit";
import { appBaseUrl, sendMail } from "@/lib/server/mail";
import { hashToken, newToken, plausibleToken } from "@/lib/server/tokens";
import type { DecisionName } from "@/lib/schemas/team";
import type {
  CommentJson,
  LatestDecisionJson,
  QueueItemJson as QueueItem,
  ReviewQueueJson as ReviewQueue,
  ReviewRequestJson,
  RunLinkCreatedJson,
  RunLinkJson,
  SavedStudyJson,
  SharedRunJson,
  SignoffListJson as SignoffList,
  SignoffJson as SignoffRecord,
  StoredResultJson,
} from "@/lib/schemas/responses";
import type { Scenario } from "@/lib/schemas/scenario";

export type { LatestDecisionJson };

// Review of runs: run links, comments and sign-offs. Every lookup is scoped by teamId.

const iso = (d: Date | string | null | undefined) => (d ? new Date(d).toISOString() : null);

/** The run's row inside the caller's team, or 404 (another team's run is a 404 too). */
export async function runInTeamOrThrow({
  runId,
  teamId,
  transaction,
}: {
  runId: string;
  teamId: string;
  transaction?: Transaction;
}) {
  if (!isId(runId)) throw notFound("No such run in your team.");
  const run = await getModels().Run.findOne({
    where: { id: runId, teamId },
    attributes: ["id", "teamId", "scenarioId", "scenarioVersion", "label", "createdBy", "createdAt"],
    // On PostgreSQL the row lock serialises sign-offs and review requests on one run; SQLite
    // serialises write transactions by itself and ignores the lock.
    ...(transaction ? { transaction, lock: transaction.LOCK.UPDATE } : {}),
  });
  if (!run) throw notFound("No such run in your team.");
  return run;
}

// ---- Run links ----

function linkState(row: { expiresAt: Date | null; revokedAt: Date | null }): RunLinkJson["state"] {
  if (row.revokedAt) return "revoked";
  if (row.expiresAt && new Date(row.expiresAt).getTime() <= Date.now()) return "expired";
  return "active";
}

type LinkRowish = {
  id: string;
  runId: unknown;
  expiresAt: Date | null;
  revokedAt: Date | null;
  createdAt: Date;
  createdBy: unknown;
  label?: string | null;
  lastUsedAt?: Date | null;
  useCount?: number;
};

/** The name the routes know a run link by. */
export type RunLinkRecord = RunLinkJson;

function linkJson(row: LinkRowish): RunLinkRecord {
  return {
    id: row.id,
    label: row.label ?? null,
    lastUsedAt: iso(row.lastUsedAt),
    useCount: row.useCount ?? 0,
    runId: row.runId as string,
    expiresAt: iso(row.expiresAt),
    revokedAt: iso(row.revokedAt),
    createdAt: iso(row.createdAt)!,
    createdBy: (row.createdBy as string | null) ?? null,
    state: linkState(row),
  };
}

export async function listRunLinks({ runId, teamId }: { runId: string; teamId: string }): Promise<RunLinkRecord[]> {
  await runInTeamOrThrow({ runId, teamId });
  const rows = await getModels().RunLink.findAll({ where: { runId, teamId }, order: [["createdAt", "DESC"]] });
  return rows.map(linkJson);
}

export async function createRunLink({
  runId,
  teamId,
  actorId,
  expiresAt,
  label = null,
  request,
}: {
  runId: string;
  teamId: string;
  actorId: string;
  expiresAt: Date | null;
  label?: string | null;
  request: Request;
}): Promise<RunLinkCreatedJson> {
  await runInTeamOrThrow({ runId, teamId });
  const { token, tokenHash } = newToken();
  const row = await getSequelize().transaction(async (transaction) => {
    const created = await getModels().RunLink.create(
      { teamId, runId, tokenHash, expiresAt, createdBy: actorId, label: label || null },
      { transaction },
    );
    await recordAudit(
      {
        teamId,
        actorId,
        action: "link.created",
        targetType: "run",
        targetId: runId,
        details: { linkId: created.id, expiresAt: iso(expiresAt), label: label || null },
      },
      transaction,
    );
    return created;
  });
  return { ...linkJson(row), token, url: `${appBaseUrl(request)}/share/${token}` };
}

export async function revokeRunLink({
  runId,
  linkId,
  teamId,
  actorId,
}: {
  runId: string;
  linkId: string;
  teamId: string;
  actorId: string;
}): Promise<RunLinkRecord> {
  await runInTeamOrThrow({ runId, teamId });
  if (!isId(linkId)) throw notFound("No such link on this run.");
  return getSequelize().transaction(async (transaction) => {
    const row = await getModels().RunLink.findOne({
      where: { id: linkId, runId, teamId },
      transaction,
      lock: transaction.LOCK.UPDATE,
    });
    if (!row) throw notFound("No such link on this run.");
    if (!row.revokedAt) {
      row.revokedAt = new Date();
      await row.save({ transaction });
      await recordAudit(
        {
          teamId,
          actorId,
          action: "link.revoked",
          targetType: "run",
          targetId: runId,
          details: { linkId, label: row.label ?? null },
        },
        transaction,
      );
    }
    return linkJson(row);
  });
}

/**
 * The run behind a link, for a visitor without a session: the run's own data only (no team,
 * board, author or other runs). Unknown tokens are 404; revoked or expired links are 410,
 * checked on every request so revocation takes effect at once.
 */
export async function runForLinkToken({ token }: { token: string }): Promise<SharedRunJson & { teamId: string }> {
  if (!plausibleToken(token)) throw notFound("This link is not valid.");
  const { RunLink, Run } = getModels();
  const link = await RunLink.findOne({ where: { tokenHash: hashToken(token) } });
  if (!link) throw notFound("This link is not valid.");
  if (link.revokedAt) throw gone("This link has been revoked.");
  if (link.expiresAt && new Date(link.expiresAt).getTime() <= Date.now()) throw gone("This link has expired.");
  const run = await Run.findOne({ where: { id: link.runId as string, teamId: link.teamId as string } });
  if (!run) throw notFound("This link is not valid.");
  // Last use, for the link list ("who opened it, when"); one atomic UPDATE, no read-then-write.
  await RunLink.update({ lastUsedAt: new Date() }, { where: { id: link.id } });
  await RunLink.increment("useCount", { by: 1, where: { id: link.id } });
  const scenarioName = (run.scenario as { name?: string } | null)?.name ?? null;
  return {
    /** Server-side only (the share page checks whether a signed-in visitor is of this team). */
    teamId: run.teamId as string,
    scenarioName,
    id: run.id,
    label: run.label,
    createdAt: iso(run.createdAt)!,
    scenario: run.scenario as Scenario,
    result: run.result as StoredResultJson,
    study: (run.study as SavedStudyJson | null) ?? null,
    link: { expiresAt: iso(link.expiresAt) },
  };
}

// ---- Comments ----

type Named = { id: string; name: string } | null | undefined;

export async function listComments({ runId, teamId }: { runId: string; teamId: string }): Promise<CommentJson[]> {
  await runInTeamOrThrow({ runId, teamId });
  const { Comment, User } = getModels();
  const rows = await Comment.findAll({
    where: { runId, teamId },
    include: [{ model: User, as: "author", attributes: ["id", "name"] }],
    order: [
      ["createdAt", "ASC"],
      ["id", "ASC"],
    ],
  });
  return rows.map((c) => {
    const author = c.author;
    return {
      id: c.id,
      runId,
      body: c.body,
      author: { id: (c.authorId as string | null) ?? null, name: author?.name ?? "(removed account)" },
      createdAt: iso(c.createdAt)!,
    };
  });
}

/** E-mail addresses of the run's author, earlier commenters and reviewers, minus `exceptUserId`. */
async function participantEmails({
  runId,
  teamId,
  exceptUserId,
}: {
  runId: string;
  teamId: string;
  exceptUserId: string;
}): Promise<string[]> {
  const { Run, Comment, Signoff, User, Membership } = getModels();
  const run = await Run.findOne({ where: { id: runId, teamId }, attributes: ["createdBy"] });
  const commenters = await Comment.findAll({ where: { runId, teamId }, attributes: ["authorId"], group: ["authorId"] });
  const reviewers = await Signoff.findAll({
    where: { runId, teamId },
    attributes: ["reviewerId"],
    group: ["reviewerId"],
  });
  const ids = new Set<string>();
  for (const id of [run?.createdBy, ...commenters.map((c) => c.authorId), ...reviewers.map((s) => s.reviewerId)]) {
    if (typeof id === "string" && id !== exceptUserId) ids.add(id);
  }
  if (ids.size === 0) return [];
  // Only people still in the team hear about it.
  const members = await Membership.findAll({
    where: { teamId, userId: { [Op.in]: [...ids] } },
    attributes: ["userId"],
  });
  const users = await User.findAll({
    where: { id: { [Op.in]: members.map((m) => m.userId as string) } },
    attributes: ["email"],
  });
  return users.map((u) => u.email);
}

export async function addComment({
  runId,
  teamId,
  author,
  body,
  request,
}: {
  runId: string;
  teamId: string;
  author: { userId: string; name: string };
  body: string;
  request: Request;
}): Promise<CommentJson> {
  const run = await runInTeamOrThrow({ runId, teamId });
  const row = await getModels().Comment.create({ teamId, runId, authorId: author.userId, body });
  const to = await participantEmails({ runId, teamId, exceptUserId: author.userId });
  if (to.length) {
    // Not awaited: the comment is saved whatever the mail server does (sendMail logs failures).
    void sendMail({
      to,
      subject: `New comment on run "${run.label}"`,
      text: [
        `${author.name} commented on the run "${run.label}":`,
        "",
        body,
        "",
        `Open the run: ${appBaseUrl(request)}/runs/${runId}`,
      ].join("\n"),
    });
  }
  return {
    id: row.id,
    runId,
    body: row.body,
    author: { id: author.userId, name: author.name },
    createdAt: iso(row.createdAt)!,
  };
}

// ---- Sign-offs ----

type SignoffRowish = {
  id: string;
  runId: unknown;
  decision: DecisionName;
  note: string;
  reviewerId: unknown;
  createdAt: Date;
  scenarioVersion?: number | null;
  withdrawnAt?: Date | null;
};

function signoffJson(s: SignoffRowish, reviewerName?: string | null): SignoffRecord {
  return {
    id: s.id,
    runId: s.runId as string,
    decision: s.decision,
    note: s.note,
    reviewer: { id: (s.reviewerId as string | null) ?? null, name: reviewerName ?? "(removed account)" },
    createdAt: iso(s.createdAt)!,
    scenarioVersion: s.scenarioVersion ?? null,
    withdrawnAt: iso(s.withdrawnAt),
  };
}

const reviewerOf = (s: unknown) => (s as { reviewer?: Named }).reviewer?.name;

/** Standing decisions (newest first; the first is the run's review state) and withdrawn ones. */
export async function listSignoffs({ runId, teamId }: { runId: string; teamId: string }): Promise<SignoffList> {
  await runInTeamOrThrow({ runId, teamId });
  const { Signoff, User } = getModels();
  const rows = await Signoff.findAll({
    where: { runId, teamId },
    include: [{ model: User, as: "reviewer", attributes: ["id", "name"] }],
    order: [
      ["createdAt", "DESC"],
      ["id", "DESC"],
    ],
  });
  const all = rows.map((s) => signoffJson(s, reviewerOf(s)));
  return { items: all.filter((s) => !s.withdrawnAt), withdrawn: all.filter((s) => s.withdrawnAt) };
}

/** "approved your run" / "requested changes on your run", for mails and the audit log. */
function decisionPhrase(decision: DecisionName): string {
  return decision === "approved" ? "approved" : "requested changes on";
}

async function scenarioNameOf(
  scenarioId: string,
  transaction?: Transaction,
): Promise<{ name: string; version: number } | null> {
  const row = await getModels().Scenario.findByPk(scenarioId, { attributes: ["name", "version"], transaction });
  return row ? { name: row.name, version: row.version } : null;
}

export async function addSignoff({
  runId,
  teamId,
  reviewer,
  decision,
  note,
  request,
}: {
  runId: string;
  teamId: string;
  reviewer: { userId: string; name: string };
  decision: DecisionName;
  note: string;
  request: Request;
}): Promise<SignoffRecord> {
  const { row, run, scenario } = await getSequelize().transaction(async (transaction) => {
    const run = await runInTeamOrThrow({ runId, teamId, transaction });
    const scenario = await scenarioNameOf(run.scenarioId as string, transaction);
    // A reviewer has one standing decision per run: a new one replaces (withdraws) their earlier one.
    await getModels().Signoff.update(
      { withdrawnAt: new Date() },
      { where: { runId, teamId, reviewerId: reviewer.userId, withdrawnAt: null }, transaction },
    );
    const created = await getModels().Signoff.create(
      { teamId, runId, reviewerId: reviewer.userId, decision, note, scenarioVersion: run.scenarioVersion ?? null },
      { transaction },
    );
    await recordAudit(
      {
        teamId,
        actorId: reviewer.userId,
        action: "signoff.created",
        targetType: "run",
        targetId: runId,
        details: {
          decision,
          signoffId: created.id,
          runLabel: run.label,
          scenarioName: scenario?.name ?? null,
          scenarioVersion: run.scenarioVersion ?? null,
        },
      },
      transaction,
    );
    return { row: created, run, scenario };
  });
  const authorId = run.createdBy as string | null;
  if (authorId && authorId !== reviewer.userId) {
    const author = await getModels().User.findByPk(authorId, { attributes: ["email"] });
    if (author) {
      const what = `"${run.label}"${scenario ? ` of ${scenario.name}` : ""}${run.scenarioVersion ? `, version ${run.scenarioVersion}` : ""}`;
      void sendMail({
        to: author.email,
        subject: decision === "approved" ? `Approved: run "${run.label}"` : `Changes requested: run "${run.label}"`,
        text: [
          `${reviewer.name} ${decisionPhrase(decision)} your run ${what}.`,
          ...(note ? ["", decision === "approved" ? "Note:" : "What must change:", note] : []),
          "",
          `Open the run: ${appBaseUrl(request)}/runs/${runId}`,
        ].join("\n"),
      });
    }
  }
  return signoffJson(row, reviewer.name);
}

/** A reviewer takes back their own standing decision; others' decisions are a 403. */
export async function withdrawSignoff({
  runId,
  signoffId,
  teamId,
  actorId,
}: {
  runId: string;
  signoffId: string;
  teamId: string;
  actorId: string;
}): Promise<SignoffRecord> {
  if (!isId(signoffId)) throw notFound("No such sign-off on this run.");
  return getSequelize().transaction(async (transaction) => {
    const run = await runInTeamOrThrow({ runId, teamId, transaction });
    const row = await getModels().Signoff.findOne({
      where: { id: signoffId, runId, teamId },
      transaction,
      lock: transaction.LOCK.UPDATE,
    });
    if (!row) throw notFound("No such sign-off on this run.");
    if (row.reviewerId !== actorId) throw forbidden("Only the reviewer who made a decision can withdraw it.");
    if (row.withdrawnAt) throw conflict("This decision has already been withdrawn.");
    row.withdrawnAt = new Date();
    await row.save({ transaction });
    const scenario = await scenarioNameOf(run.scenarioId as string, transaction);
    await recordAudit(
      {
        teamId,
        actorId,
        action: "signoff.withdrawn",
        targetType: "run",
        targetId: runId,
        details: {
          decision: row.decision,
          signoffId: row.id,
          runLabel: run.label,
          scenarioName: scenario?.name ?? null,
          scenarioVersion: row.scenarioVersion ?? null,
        },
      },
      transaction,
    );
    const reviewer = await getModels().User.findByPk(actorId, { attributes: ["name"], transaction });
    return signoffJson(row, reviewer?.name);
  });
}

/**
 * The latest standing sign-off over all runs of each scenario, for the board's scenario table
 * (`latestDecision` on the scenario objects). Scenarios without one are absent from the map.
 */
export async function latestDecisionsByScenario({
  teamId,
  scenarioIds,
}: {
  teamId: string;
  scenarioIds: string[];
}): Promise<Map<string, LatestDecisionJson>> {
  const out = new Map<string, LatestDecisionJson>();
  if (scenarioIds.length === 0) return out;
  // One query, prepared once (models/prepared.ts): every standing sign-off on a run of these
  // scenarios, newest first; the first per scenario is its latest decision.
  const sequelize = getSequelize();
  const ids = sequelize.getDialect() === "postgres" ? `= ANY($2::uuid[])` : `IN (SELECT "value" FROM json_each($2))`;
  const rows = await selectPrepared<{
    scenarioId: string;
    current: number;
    runVersion: number | null;
    signoffVersion: number | null;
    decision: LatestDecisionJson["decision"];
    createdAt: Date | string;
    reviewerId: string | null;
    reviewerName: string | null;
    runId: string;
    note: string;
  }>(
    sequelize,
    "railwise_latest_decisions",
    `SELECT r."scenarioId" AS "scenarioId", s."version" AS "current", r."scenarioVersion" AS "runVersion",
            g."scenarioVersion" AS "signoffVersion", g."decision" AS "decision", g."createdAt" AS "createdAt",
            g."reviewerId" AS "reviewerId", u."name" AS "reviewerName", g."runId" AS "runId", g."note" AS "note"
       FROM "signoffs" g
       JOIN "runs" r ON r."id" = g."runId" AND r."teamId" = $1
       JOIN "scenarios" s ON s."id" = r."scenarioId" AND s."teamId" = $1
       LEFT JOIN "users" u ON u."id" = g."reviewerId"
      WHERE g."teamId" = $1 AND g."withdrawnAt" IS NULL AND r."scenarioId" ${ids}
      ORDER BY g."createdAt" DESC, g."id" DESC`,
    [teamId, sequelize.getDialect() === "postgres" ? scenarioIds : JSON.stringify(scenarioIds)],
  );
  for (const g of rows) {
    if (out.has(g.scenarioId)) continue;
    const appliesTo = g.signoffVersion ?? g.runVersion ?? null;
    const current = g.current ?? null;
    out.set(g.scenarioId, {
      decision: g.decision,
      at: iso(g.createdAt)!,
      by: { id: g.reviewerId ?? null, name: g.reviewerName ?? "(removed account)" },
      runId: g.runId,
      note: g.note,
      scenarioVersion: appliesTo,
      outOfDate: appliesTo !== null && current !== null && current > appliesTo,
    });
  }
  return out;
}

// ---- Review requests and the queue ----

const SIGNERS = ["owner", "reviewer"] as const;

/**
 * The author asks named members (who may sign off) to review a run; each new reviewer gets a mail.
 * Asking the same reviewer again about the same run keeps the first request (no second mail).
 */
export async function requestReview({
  runId,
  teamId,
  actor,
  reviewerIds,
  note,
  request,
}: {
  runId: string;
  teamId: string;
  actor: { userId: string; name: string };
  reviewerIds: string[];
  note: string;
  request: Request;
}): Promise<ReviewRequestJson[]> {
  const { Membership, User, ReviewRequest } = getModels();
  const wanted = [...new Set(reviewerIds)];
  const bad = wanted.findIndex((id) => !isId(id));
  if (bad >= 0)
    throw badRequest("reviewerIds must be members of your team who can sign off", [
      { path: ["reviewerIds", bad], message: "not a member id" },
    ]);
  const members = await Membership.findAll({
    where: { teamId, userId: { [Op.in]: wanted } },
    attributes: ["userId", "role"],
  });
  const roleOf = new Map(members.map((m) => [m.userId as string, m.role]));
  for (const [i, id] of wanted.entries()) {
    const role = roleOf.get(id);
    if (!role)
      throw badRequest("reviewerIds must be members of your team", [
        { path: ["reviewerIds", i], message: "not a member of your team" },
      ]);
    if (!(SIGNERS as readonly string[]).includes(role)) {
      throw badRequest(`reviewerIds: a ${role} cannot sign off; choose an owner or a reviewer`, [
        { path: ["reviewerIds", i], message: `a ${role} cannot sign off` },
      ]);
    }
    if (id === actor.userId)
      throw badRequest("reviewerIds: you cannot ask yourself to review your own run", [
        { path: ["reviewerIds", i], message: "that is you" },
      ]);
  }
  const reviewerNames = await namesOf(wanted);
  const { run, scenario, fresh } = await getSequelize().transaction(async (transaction) => {
    const run = await runInTeamOrThrow({ runId, teamId, transaction });
    const scenario = await scenarioNameOf(run.scenarioId as string, transaction);
    const existing = await ReviewRequest.findAll({
      where: { runId, teamId, reviewerId: { [Op.in]: wanted } },
      attributes: ["reviewerId"],
      transaction,
    });
    const have = new Set(existing.map((r) => r.reviewerId as string));
    const fresh: string[] = [];
    for (const reviewerId of wanted) {
      if (have.has(reviewerId)) continue;
      await ReviewRequest.create({ teamId, runId, reviewerId, requestedBy: actor.userId, note }, { transaction });
      fresh.push(reviewerId);
    }
    if (fresh.length) {
      await recordAudit(
        {
          teamId,
          actorId: actor.userId,
          action: "review.requested",
          targetType: "run",
          targetId: runId,
          details: {
            reviewerIds: fresh,
            reviewerNames: fresh.map((id) => reviewerNames.get(id) ?? "(removed account)"),
            runLabel: run.label,
            scenarioName: scenario?.name ?? null,
            scenarioVersion: run.scenarioVersion ?? null,
          },
        },
        transaction,
      );
    }
    return { run, scenario, fresh };
  });
  if (fresh.length) {
    const users = await User.findAll({ where: { id: { [Op.in]: fresh } }, attributes: ["email"] });
    const base = appBaseUrl(request);
    const what = `"${run.label}"${scenario ? ` of ${scenario.name}` : ""}${run.scenarioVersion ? ` (version ${run.scenarioVersion})` : ""}`;
    for (const u of users) {
      void sendMail({
        to: u.email,
        subject: `Review requested: run "${run.label}"`,
        text: [
          `${actor.name} asks you to review the run ${what}.`,
          ...(note ? ["", note] : []),
          "",
          `Open the run: ${base}/runs/${runId}`,
          `Your review queue: ${base}/review`,
        ].join("\n"),
      });
    }
  }
  return listReviewRequests({ runId, teamId });
}

type RequestRowish = {
  id: string;
  runId: unknown;
  reviewerId: unknown;
  requestedBy: unknown;
  note: string;
  createdAt: Date;
};

function requestJson(
  r: RequestRowish,
  names: Map<string, string>,
  standing: Map<string, SignoffRecord>,
): ReviewRequestJson {
  const reviewerId = r.reviewerId as string;
  const decided = standing.get(`${r.runId as string}:${reviewerId}`);
  const requester = (r.requestedBy as string | null) ?? null;
  return {
    id: r.id,
    runId: r.runId as string,
    reviewer: { id: reviewerId, name: names.get(reviewerId) ?? "(removed account)" },
    requestedBy: {
      id: requester,
      name: requester ? (names.get(requester) ?? "(removed account)") : "(removed account)",
    },
    note: r.note,
    createdAt: iso(r.createdAt)!,
    decision: decided?.decision ?? null,
    decidedAt: decided?.createdAt ?? null,
  };
}

async function namesOf(ids: Iterable<unknown>): Promise<Map<string, string>> {
  const list = [...new Set([...ids].filter((x): x is string => typeof x === "string"))];
  if (list.length === 0) return new Map();
  const users = await getModels().User.findAll({ where: { id: { [Op.in]: list } }, attributes: ["id", "name"] });
  return new Map(users.map((u) => [u.id, u.name]));
}

/** Standing sign-offs of the given runs, newest first. */
async function standingSignoffs(teamId: string, runIds: string[]): Promise<SignoffRecord[]> {
  if (runIds.length === 0) return [];
  const { Signoff, User } = getModels();
  const rows = await Signoff.findAll({
    where: { teamId, runId: { [Op.in]: runIds }, withdrawnAt: null },
    include: [{ model: User, as: "reviewer", attributes: ["id", "name"] }],
    order: [
      ["createdAt", "DESC"],
      ["id", "DESC"],
    ],
  });
  return rows.map((s) => signoffJson(s, reviewerOf(s)));
}

function byReviewer(signoffs: SignoffRecord[]): Map<string, SignoffRecord> {
  const m = new Map<string, SignoffRecord>();
  for (const s of signoffs) {
    const key = `${s.runId}:${s.reviewer.id}`;
    if (!m.has(key)) m.set(key, s);
  }
  return m;
}

export async function listReviewRequests({
  runId,
  teamId,
}: {
  runId: string;
  teamId: string;
}): Promise<ReviewRequestJson[]> {
  await runInTeamOrThrow({ runId, teamId });
  const rows = await getModels().ReviewRequest.findAll({
    where: { runId, teamId },
    order: [
      ["createdAt", "ASC"],
      ["id", "ASC"],
    ],
  });
  const names = await namesOf(rows.flatMap((r) => [r.reviewerId, r.requestedBy]));
  const standing = byReviewer(await standingSignoffs(teamId, [runId]));
  return rows.map((r) => requestJson(r, names, standing));
}

/**
 * The review queue of one member: runs waiting on their decision, runs they asked others to
 * review, and runs with a standing decision (the latest 50), each with the scenario it belongs to
 * and whether the decision still covers the scenario's current version. `boardId` narrows it.
 */
export async function reviewQueue({
  teamId,
  userId,
  boardId,
}: {
  teamId: string;
  userId: string;
  boardId?: string | null;
}): Promise<ReviewQueue> {
  const { ReviewRequest, Run, Scenario, Board, Signoff } = getModels();
  if (boardId != null && !isId(boardId)) throw notFound("No such board in your team.");
  const requests = await ReviewRequest.findAll({
    where: { teamId },
    order: [
      ["createdAt", "DESC"],
      ["id", "DESC"],
    ],
  });
  const decidedRows = await Signoff.findAll({
    where: { teamId, withdrawnAt: null },
    attributes: ["runId"],
    order: [
      ["createdAt", "DESC"],
      ["id", "DESC"],
    ],
    limit: 500,
  });
  const runIds = [
    ...new Set([...requests.map((r) => r.runId as string), ...decidedRows.map((s) => s.runId as string)]),
  ];
  const runs = runIds.length
    ? await Run.findAll({
        where: { teamId, id: { [Op.in]: runIds } },
        attributes: ["id", "label", "createdAt", "scenarioId", "scenarioVersion"],
      })
    : [];
  const scenarioIds = [...new Set(runs.map((r) => r.scenarioId as string))];
  const scenarios = scenarioIds.length
    ? await Scenario.findAll({
        where: { teamId, id: { [Op.in]: scenarioIds } },
        attributes: ["id", "name", "version", "boardId"],
      })
    : [];
  const boards = scenarios.length
    ? await Board.findAll({
        where: { teamId, id: { [Op.in]: [...new Set(scenarios.map((s) => s.boardId as string))] } },
        attributes: ["id", "name"],
      })
    : [];
  const boardName = new Map(boards.map((b) => [b.id, b.name]));
  const scenarioById = new Map(scenarios.map((s) => [s.id, s]));
  const refs = new Map<string, QueueItem["run"]>();
  for (const r of runs) {
    const s = scenarioById.get(r.scenarioId as string);
    if (!s) continue;
    if (boardId && s.boardId !== boardId) continue;
    refs.set(r.id, {
      id: r.id,
      label: r.label,
      createdAt: iso(r.createdAt)!,
      scenarioVersion: r.scenarioVersion ?? null,
      scenario: {
        id: s.id,
        name: s.name,
        version: s.version,
        boardId: s.boardId as string,
        boardName: boardName.get(s.boardId as string) ?? "",
      },
    });
  }
  const signoffs = await standingSignoffs(teamId, [...refs.keys()]);
  const standing = byReviewer(signoffs);
  const latestOfRun = new Map<string, SignoffRecord>();
  for (const s of signoffs) if (!latestOfRun.has(s.runId)) latestOfRun.set(s.runId, s);
  const names = await namesOf(requests.flatMap((r) => [r.reviewerId, r.requestedBy]));
  const requestsOfRun = new Map<string, ReviewRequestJson[]>();
  for (const r of requests) {
    if (!refs.has(r.runId as string)) continue;
    const list = requestsOfRun.get(r.runId as string) ?? [];
    list.push(requestJson(r, names, standing));
    requestsOfRun.set(r.runId as string, list);
  }
  const item = (runId: string): QueueItem => {
    const run = refs.get(runId)!;
    const decision = latestOfRun.get(runId) ?? null;
    const applies = decision?.scenarioVersion ?? run.scenarioVersion;
    return {
      run,
      requests: requestsOfRun.get(runId) ?? [],
      decision,
      outOfDate: decision !== null && applies !== null && run.scenario.version > applies,
    };
  };
  const waitingOnMe: QueueItem[] = [];
  const requestedByMe: QueueItem[] = [];
  for (const [runId, list] of requestsOfRun) {
    if (list.some((r) => r.reviewer.id === userId && r.decision === null)) waitingOnMe.push(item(runId));
    if (list.some((r) => r.requestedBy.id === userId)) requestedByMe.push(item(runId));
  }
  const decided = [...latestOfRun.keys()].slice(0, 50).map(item);
  const newest = (a: QueueItem, b: QueueItem) => b.run.createdAt.localeCompare(a.run.createdAt);
  return { waitingOnMe: waitingOnMe.sort(newest), requestedByMe: requestedByMe.sort(newest), decided };
}
