import "server-only";
import { Op } from "sequelize";
import { getModels, getSequelize } from "@/models";
import { gone, notFound } from "@/lib/server/errors";
import { recordAudit } from "@/lib/server/audit";
import { appBaseUrl, sendMail } from "@/lib/server/mail";
import { hashToken, newToken, plausibleToken } from "@/lib/server/tokens";
import {
  DECISION_LABEL,
  type CommentJson,
  type DecisionName,
  type RunLinkJson,
  type SignoffJson,
} from "@/lib/schemas/team";

// Review of runs: run links, comments and sign-offs. Every lookup is scoped by teamId.

const iso = (d: Date | string | null | undefined) => (d ? new Date(d).toISOString() : null);

/** The run's row inside the caller's team, or 404 (another team's run is a 404 too). */
export async function runInTeamOrThrow({ runId, teamId }: { runId: string; teamId: string }) {
  const run = await getModels().Run.findOne({
    where: { id: runId, teamId },
    attributes: ["id", "teamId", "scenarioId", "label", "createdBy", "createdAt"],
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

function linkJson(row: { id: string; runId: unknown; expiresAt: Date | null; revokedAt: Date | null; createdAt: Date; createdBy: unknown }): RunLinkJson {
  return {
    id: row.id,
    runId: row.runId as string,
    expiresAt: iso(row.expiresAt),
    revokedAt: iso(row.revokedAt),
    createdAt: iso(row.createdAt)!,
    createdBy: (row.createdBy as string | null) ?? null,
    state: linkState(row),
  };
}

export async function listRunLinks({ runId, teamId }: { runId: string; teamId: string }): Promise<RunLinkJson[]> {
  await runInTeamOrThrow({ runId, teamId });
  const rows = await getModels().RunLink.findAll({ where: { runId, teamId }, order: [["createdAt", "DESC"]] });
  return rows.map(linkJson);
}

export async function createRunLink({
  runId,
  teamId,
  actorId,
  expiresAt,
  request,
}: {
  runId: string;
  teamId: string;
  actorId: string;
  expiresAt: Date | null;
  request: Request;
}): Promise<RunLinkJson> {
  await runInTeamOrThrow({ runId, teamId });
  const { token, tokenHash } = newToken();
  const row = await getSequelize().transaction(async (transaction) => {
    const created = await getModels().RunLink.create({ teamId, runId, tokenHash, expiresAt, createdBy: actorId }, { transaction });
    await recordAudit(
      { teamId, actorId, action: "link.created", targetType: "run", targetId: runId, details: { linkId: created.id, expiresAt: iso(expiresAt) } },
      transaction,
    );
    return created;
  });
  return { ...linkJson(row), token, url: `${appBaseUrl(request)}/share/${token}` };
}

export async function revokeRunLink({ runId, linkId, teamId, actorId }: { runId: string; linkId: string; teamId: string; actorId: string }): Promise<RunLinkJson> {
  await runInTeamOrThrow({ runId, teamId });
  return getSequelize().transaction(async (transaction) => {
    const row = await getModels().RunLink.findOne({ where: { id: linkId, runId, teamId }, transaction });
    if (!row) throw notFound("No such link on this run.");
    if (!row.revokedAt) {
      row.revokedAt = new Date();
      await row.save({ transaction });
      await recordAudit(
        { teamId, actorId, action: "link.revoked", targetType: "run", targetId: runId, details: { linkId } },
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
export async function runForLinkToken({ token }: { token: string }) {
  if (!plausibleToken(token)) throw notFound("This link is not valid.");
  const { RunLink, Run } = getModels();
  const link = await RunLink.findOne({ where: { tokenHash: hashToken(token) } });
  if (!link) throw notFound("This link is not valid.");
  if (link.revokedAt) throw gone("This link has been revoked.");
  if (link.expiresAt && new Date(link.expiresAt).getTime() <= Date.now()) throw gone("This link has expired.");
  const run = await Run.findOne({ where: { id: link.runId as string, teamId: link.teamId as string } });
  if (!run) throw notFound("This link is not valid.");
  return {
    id: run.id,
    label: run.label,
    createdAt: iso(run.createdAt)!,
    scenario: run.scenario,
    result: run.result,
    study: run.study ?? null,
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
    const author = (c as unknown as { author?: Named }).author;
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
async function participantEmails({ runId, teamId, exceptUserId }: { runId: string; teamId: string; exceptUserId: string }): Promise<string[]> {
  const { Run, Comment, Signoff, User, Membership } = getModels();
  const run = await Run.findOne({ where: { id: runId, teamId }, attributes: ["createdBy"] });
  const commenters = await Comment.findAll({ where: { runId, teamId }, attributes: ["authorId"], group: ["authorId"] });
  const reviewers = await Signoff.findAll({ where: { runId, teamId }, attributes: ["reviewerId"], group: ["reviewerId"] });
  const ids = new Set<string>();
  for (const id of [run?.createdBy, ...commenters.map((c) => c.authorId), ...reviewers.map((s) => s.reviewerId)]) {
    if (typeof id === "string" && id !== exceptUserId) ids.add(id);
  }
  if (ids.size === 0) return [];
  // Only people still in the team hear about it.
  const members = await Membership.findAll({ where: { teamId, userId: { [Op.in]: [...ids] } }, attributes: ["userId"] });
  const users = await User.findAll({ where: { id: { [Op.in]: members.map((m) => m.userId as string) } }, attributes: ["email"] });
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
      text: [`${author.name} commented on the run "${run.label}":`, "", body, "", `Open the run: ${appBaseUrl(request)}/runs/${runId}`].join("\n"),
    });
  }
  return { id: row.id, runId, body: row.body, author: { id: author.userId, name: author.name }, createdAt: iso(row.createdAt)! };
}

// ---- Sign-offs ----

export async function listSignoffs({ runId, teamId }: { runId: string; teamId: string }): Promise<SignoffJson[]> {
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
  return rows.map((s) => {
    const reviewer = (s as unknown as { reviewer?: Named }).reviewer;
    return {
      id: s.id,
      runId,
      decision: s.decision,
      note: s.note,
      reviewer: { id: (s.reviewerId as string | null) ?? null, name: reviewer?.name ?? "(removed account)" },
      createdAt: iso(s.createdAt)!,
    };
  });
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
}): Promise<SignoffJson> {
  const run = await runInTeamOrThrow({ runId, teamId });
  const row = await getSequelize().transaction(async (transaction) => {
    const created = await getModels().Signoff.create({ teamId, runId, reviewerId: reviewer.userId, decision, note }, { transaction });
    await recordAudit(
      { teamId, actorId: reviewer.userId, action: "signoff.created", targetType: "run", targetId: runId, details: { decision, signoffId: created.id } },
      transaction,
    );
    return created;
  });
  const authorId = run.createdBy as string | null;
  if (authorId && authorId !== reviewer.userId) {
    const author = await getModels().User.findByPk(authorId, { attributes: ["email"] });
    if (author) {
      void sendMail({
        to: author.email,
        subject: `${DECISION_LABEL[decision]}: run "${run.label}"`,
        text: [
          `${reviewer.name} signed off your run "${run.label}": ${DECISION_LABEL[decision].toLowerCase()}.`,
          ...(note ? ["", note] : []),
          "",
          `Open the run: ${appBaseUrl(request)}/runs/${runId}`,
        ].join("\n"),
      });
    }
  }
  return {
    id: row.id,
    runId,
    decision: row.decision,
    note: row.note,
    reviewer: { id: reviewer.userId, name: reviewer.name },
    createdAt: iso(row.createdAt)!,
  };
}

export interface LatestDecisionJson {
  decision: DecisionName;
  at: string;
  by: { id: string | null; name: string };
  runId: string;
  note: string;
}

/**
 * The latest sign-off over all runs of each scenario, for the board's scenario table
 * (`latestDecision` on the scenario objects). Scenarios without one are absent from the map.
 */
export async function latestDecisionsByScenario({ teamId, scenarioIds }: { teamId: string; scenarioIds: string[] }): Promise<Map<string, LatestDecisionJson>> {
  const out = new Map<string, LatestDecisionJson>();
  if (scenarioIds.length === 0) return out;
  const { Run, Signoff, User } = getModels();
  const runs = await Run.findAll({ where: { teamId, scenarioId: { [Op.in]: scenarioIds } }, attributes: ["id", "scenarioId"] });
  if (runs.length === 0) return out;
  const scenarioOfRun = new Map(runs.map((r) => [r.id, r.scenarioId as string]));
  const signoffs = await Signoff.findAll({
    where: { teamId, runId: { [Op.in]: [...scenarioOfRun.keys()] } },
    include: [{ model: User, as: "reviewer", attributes: ["id", "name"] }],
    order: [
      ["createdAt", "DESC"],
      ["id", "DESC"],
    ],
  });
  for (const s of signoffs) {
    const scenarioId = scenarioOfRun.get(s.runId as string);
    if (!scenarioId || out.has(scenarioId)) continue;
    const reviewer = (s as unknown as { reviewer?: Named }).reviewer;
    out.set(scenarioId, {
      decision: s.decision,
      at: iso(s.createdAt)!,
      by: { id: (s.reviewerId as string | null) ?? null, name: reviewer?.name ?? "(removed account)" },
      runId: s.runId as string,
      note: s.note,
    });
  }
  return out;
}
