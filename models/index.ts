// Sequelize models of Railwise. The schema of record is the migrations in models/migrations/;
// these definitions mirror them (never `sync()` at run time). Ids are UUID strings.
import {
  DataTypes,
  type Model,
  type CreationOptional,
  type ForeignKey,
  type InferAttributes,
  type InferCreationAttributes,
  type ModelStatic,
  type NonAttribute,
  type Sequelize,
} from "sequelize";
import { getSequelize } from "./db";
import { stripNul } from "./text";

import { DECISIONS, ROLES, type Decision, type Role } from "@/lib/schemas/roles";
import { leanScenarioOf } from "@/lib/schemas/lean-scenario";
import type { Scenario } from "@/lib/schemas/scenario";

export { DECISIONS, ROLES, type Decision, type Role };

type Attrs<M extends Model> = InferAttributes<M>;
type Creation<M extends Model> = InferCreationAttributes<M>;

export interface UserRow extends Model<Attrs<UserRow>, Creation<UserRow>> {
  id: CreationOptional<string>;
  email: string;
  name: string;
  passwordHash: string;
  sessionGeneration: CreationOptional<number>;
  createdAt: CreationOptional<Date>;
  updatedAt: CreationOptional<Date>;
}

export interface TeamRow extends Model<Attrs<TeamRow>, Creation<TeamRow>> {
  id: CreationOptional<string>;
  name: string;
  createdAt: CreationOptional<Date>;
  updatedAt: CreationOptional<Date>;
}

export interface MembershipRow extends Model<Attrs<MembershipRow>, Creation<MembershipRow>> {
  /** Joined by `include` (as: "user" / "team"); absent otherwise. */
  user?: NonAttribute<Pick<UserRow, "id" | "name" | "email">>;
  team?: NonAttribute<Pick<TeamRow, "name">>;
  id: CreationOptional<string>;
  userId: ForeignKey<string>;
  teamId: ForeignKey<string>;
  role: Role;
  createdAt: CreationOptional<Date>;
  updatedAt: CreationOptional<Date>;
}

export interface BoardRow extends Model<Attrs<BoardRow>, Creation<BoardRow>> {
  id: CreationOptional<string>;
  teamId: ForeignKey<string>;
  name: string;
  description: CreationOptional<string>;
  createdBy: ForeignKey<string | null>;
  createdAt: CreationOptional<Date>;
  updatedAt: CreationOptional<Date>;
}

export interface ScenarioRow extends Model<Attrs<ScenarioRow>, Creation<ScenarioRow>> {
  /** Joined by `include` (as: "updater"); absent otherwise. */
  updater?: NonAttribute<Pick<UserRow, "name"> | null>;
  id: CreationOptional<string>;
  teamId: ForeignKey<string>;
  boardId: ForeignKey<string>;
  name: string;
  version: number;
  /** The current railwise.scenario/1 document (same as the latest scenario_versions row). */
  data: unknown;
  /** The document's list form (leanScenarioOf), kept in step with `data` by a hook (0005). */
  summary?: unknown;
  updatedBy: ForeignKey<string | null>;
  createdAt: CreationOptional<Date>;
  updatedAt: CreationOptional<Date>;
}

export interface ScenarioVersionRow extends Model<Attrs<ScenarioVersionRow>, Creation<ScenarioVersionRow>> {
  /** Joined by `include` (as: "author"); absent otherwise. */
  author?: NonAttribute<Pick<UserRow, "name"> | null>;
  id: CreationOptional<string>;
  scenarioId: ForeignKey<string>;
  version: number;
  name: string;
  data: unknown;
  authorId: ForeignKey<string | null>;
  note: CreationOptional<string | null>;
  createdAt: CreationOptional<Date>;
}

export interface RunRow extends Model<Attrs<RunRow>, Creation<RunRow>> {
  /** Joined by `include` (as: "author"); absent otherwise. */
  author?: NonAttribute<Pick<UserRow, "name"> | null>;
  id: CreationOptional<string>;
  teamId: ForeignKey<string>;
  scenarioId: ForeignKey<string>;
  scenarioVersion: number | null;
  label: string;
  /** Snapshot of the scenario as run (railwise.scenario/1). */
  scenario: unknown;
  /** railwise.result/1 with decimated samples. */
  result: unknown;
  /** Optional study result (noise margin study, tolerance spread). */
  study?: unknown;
  createdBy: ForeignKey<string | null>;
  createdAt: CreationOptional<Date>;
}

export interface RunLinkRow extends Model<Attrs<RunLinkRow>, Creation<RunLinkRow>> {
  id: CreationOptional<string>;
  teamId: ForeignKey<string>;
  runId: ForeignKey<string>;
  /** SHA-256 of the token; the token itself is shown once and never stored. */
  tokenHash: string;
  expiresAt: Date | null;
  revokedAt: CreationOptional<Date | null>;
  createdBy: ForeignKey<string | null>;
  createdAt: CreationOptional<Date>;
  /** 0004: who the link was sent to, and when it was last opened. */
  label: CreationOptional<string | null>;
  lastUsedAt: CreationOptional<Date | null>;
  useCount: CreationOptional<number>;
}

export interface CommentRow extends Model<Attrs<CommentRow>, Creation<CommentRow>> {
  /** Joined by `include` (as: "author"); absent otherwise. */
  author?: NonAttribute<Pick<UserRow, "id" | "name"> | null>;
  id: CreationOptional<string>;
  teamId: ForeignKey<string>;
  runId: ForeignKey<string>;
  authorId: ForeignKey<string | null>;
  body: string;
  createdAt: CreationOptional<Date>;
}

export interface SignoffRow extends Model<Attrs<SignoffRow>, Creation<SignoffRow>> {
  id: CreationOptional<string>;
  teamId: ForeignKey<string>;
  runId: ForeignKey<string>;
  reviewerId: ForeignKey<string | null>;
  decision: Decision;
  note: string;
  createdAt: CreationOptional<Date>;
  /** 0004: the scenario version the decision applies to (the run's), and a withdrawal. */
  scenarioVersion: CreationOptional<number | null>;
  withdrawnAt: CreationOptional<Date | null>;
}

/** 0004: an author's request that a reviewer look at a run. */
export interface ReviewRequestRow extends Model<Attrs<ReviewRequestRow>, Creation<ReviewRequestRow>> {
  id: CreationOptional<string>;
  teamId: ForeignKey<string>;
  runId: ForeignKey<string>;
  reviewerId: ForeignKey<string>;
  requestedBy: ForeignKey<string | null>;
  note: CreationOptional<string>;
  createdAt: CreationOptional<Date>;
}

export interface PartProfileRow extends Model<Attrs<PartProfileRow>, Creation<PartProfileRow>> {
  id: CreationOptional<string>;
  teamId: ForeignKey<string>;
  name: string;
  /** The scenario's `opamp` object (SI units). */
  params: unknown;
  createdBy: ForeignKey<string | null>;
  createdAt: CreationOptional<Date>;
  updatedAt: CreationOptional<Date>;
}

export interface CaptureRow extends Model<Attrs<CaptureRow>, Creation<CaptureRow>> {
  id: CreationOptional<string>;
  teamId: ForeignKey<string>;
  name: string;
  /** [[t, v], ...] in s and V. */
  samples: unknown;
  /** Which CSV columns were used, e.g. { time: "t_s", value: "volts" }. */
  columns: unknown;
  sourceFilename: string | null;
  createdBy: ForeignKey<string | null>;
  createdAt: CreationOptional<Date>;
}

export interface InvitationRow extends Model<Attrs<InvitationRow>, Creation<InvitationRow>> {
  id: CreationOptional<string>;
  teamId: ForeignKey<string>;
  email: string;
  role: Role;
  tokenHash: string;
  expiresAt: Date;
  acceptedAt: CreationOptional<Date | null>;
  invitedBy: ForeignKey<string | null>;
  createdAt: CreationOptional<Date>;
}

export interface AuditRow extends Model<Attrs<AuditRow>, Creation<AuditRow>> {
  /** Joined by `include` (as: "actor"); absent otherwise. */
  actor?: NonAttribute<Pick<UserRow, "name"> | null>;
  id: CreationOptional<string>;
  teamId: ForeignKey<string | null>;
  actorId: ForeignKey<string | null>;
  action: string;
  targetType: string | null;
  targetId: string | null;
  details?: unknown;
  createdAt: CreationOptional<Date>;
}

const id = { type: DataTypes.UUID, defaultValue: DataTypes.UUIDV4, primaryKey: true };
const ref = (allowNull = false) => ({ type: DataTypes.UUID, allowNull });
// TEXT, not VARCHAR(255): the API's limits (notes 500, descriptions 2000, e-mail 254 …) decide
// lengths, and migration 0002 widened PostgreSQL's columns to match (SQLite ignores lengths).
const text = (allowNull = false) => ({ type: DataTypes.TEXT, allowNull });
const json = (allowNull = false) => ({ type: DataTypes.JSON, allowNull });
const createdOnly = { timestamps: true, updatedAt: false } as const;

function stripInstance(instance: Model) {
  const values = (instance as unknown as { dataValues: Record<string, unknown> }).dataValues;
  for (const key of Object.keys(values)) {
    if (instance.isNewRecord || instance.changed(key as never)) values[key] = stripNul(values[key]);
  }
}

export function defineModels(sequelize: Sequelize) {
  const User = sequelize.define<UserRow>("users", {
    id,
    email: { ...text(), unique: true },
    name: text(),
    passwordHash: text(),
    // 0003: bumped to end every session of the user (lib/auth.ts).
    sessionGeneration: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
    createdAt: DataTypes.DATE,
    updatedAt: DataTypes.DATE,
  });
  const Team = sequelize.define<TeamRow>("teams", {
    id,
    name: text(),
    createdAt: DataTypes.DATE,
    updatedAt: DataTypes.DATE,
  });
  const Membership = sequelize.define<MembershipRow>("memberships", {
    id,
    userId: ref(),
    teamId: ref(),
    role: { type: DataTypes.STRING, allowNull: false, validate: { isIn: [ROLES as unknown as string[]] } },
    createdAt: DataTypes.DATE,
    updatedAt: DataTypes.DATE,
  });
  const Board = sequelize.define<BoardRow>("boards", {
    id,
    teamId: ref(),
    name: text(),
    description: { type: DataTypes.TEXT, allowNull: false, defaultValue: "" },
    createdBy: ref(true),
    createdAt: DataTypes.DATE,
    updatedAt: DataTypes.DATE,
  });
  const Scenario = sequelize.define<ScenarioRow>("scenarios", {
    id,
    teamId: ref(),
    boardId: ref(),
    name: text(),
    version: { type: DataTypes.INTEGER, allowNull: false },
    data: json(),
    summary: json(true),
    updatedBy: ref(true),
    createdAt: DataTypes.DATE,
    updatedAt: DataTypes.DATE,
  });
  // Every writer (API, seed, scripts) keeps the list form in step with the document.
  Scenario.addHook("beforeSave", (row: ScenarioRow) => {
    if (row.isNewRecord || row.changed("data")) row.summary = leanScenarioOf(row.data as Scenario);
  });
  const ScenarioVersion = sequelize.define<ScenarioVersionRow>(
    "scenario_versions",
    {
      id,
      scenarioId: ref(),
      version: { type: DataTypes.INTEGER, allowNull: false },
      name: text(),
      data: json(),
      authorId: ref(true),
      note: text(true),
      createdAt: DataTypes.DATE,
    },
    createdOnly,
  );
  const Run = sequelize.define<RunRow>(
    "runs",
    {
      id,
      teamId: ref(),
      scenarioId: ref(),
      scenarioVersion: { type: DataTypes.INTEGER, allowNull: true },
      label: text(),
      scenario: json(),
      result: json(),
      study: json(true),
      createdBy: ref(true),
      createdAt: DataTypes.DATE,
    },
    createdOnly,
  );
  const RunLink = sequelize.define<RunLinkRow>(
    "run_links",
    {
      id,
      teamId: ref(),
      runId: ref(),
      tokenHash: { ...text(), unique: true },
      expiresAt: { type: DataTypes.DATE, allowNull: true },
      revokedAt: { type: DataTypes.DATE, allowNull: true },
      createdBy: ref(true),
      createdAt: DataTypes.DATE,
      label: text(true),
      lastUsedAt: { type: DataTypes.DATE, allowNull: true },
      useCount: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
    },
    createdOnly,
  );
  const Comment = sequelize.define<CommentRow>(
    "comments",
    {
      id,
      teamId: ref(),
      runId: ref(),
      authorId: ref(true),
      body: { type: DataTypes.TEXT, allowNull: false },
      createdAt: DataTypes.DATE,
    },
    createdOnly,
  );
  const Signoff = sequelize.define<SignoffRow>(
    "signoffs",
    {
      id,
      teamId: ref(),
      runId: ref(),
      reviewerId: ref(true),
      decision: { type: DataTypes.STRING, allowNull: false, validate: { isIn: [DECISIONS as unknown as string[]] } },
      note: { type: DataTypes.TEXT, allowNull: false, defaultValue: "" },
      createdAt: DataTypes.DATE,
      scenarioVersion: { type: DataTypes.INTEGER, allowNull: true },
      withdrawnAt: { type: DataTypes.DATE, allowNull: true },
    },
    createdOnly,
  );
  const ReviewRequest = sequelize.define<ReviewRequestRow>(
    "review_requests",
    {
      id,
      teamId: ref(),
      runId: ref(),
      reviewerId: ref(),
      requestedBy: ref(true),
      note: { type: DataTypes.TEXT, allowNull: false, defaultValue: "" },
      createdAt: DataTypes.DATE,
    },
    createdOnly,
  );
  const PartProfile = sequelize.define<PartProfileRow>("part_profiles", {
    id,
    teamId: ref(),
    name: text(),
    params: json(),
    createdBy: ref(true),
    createdAt: DataTypes.DATE,
    updatedAt: DataTypes.DATE,
  });
  const Capture = sequelize.define<CaptureRow>(
    "captures",
    {
      id,
      teamId: ref(),
      name: text(),
      samples: json(),
      columns: json(),
      sourceFilename: text(true),
      createdBy: ref(true),
      createdAt: DataTypes.DATE,
    },
    createdOnly,
  );
  const Invitation = sequelize.define<InvitationRow>(
    "invitations",
    {
      id,
      teamId: ref(),
      email: text(),
      role: { type: DataTypes.STRING, allowNull: false, validate: { isIn: [ROLES as unknown as string[]] } },
      tokenHash: { ...text(), unique: true },
      expiresAt: { type: DataTypes.DATE, allowNull: false },
      acceptedAt: { type: DataTypes.DATE, allowNull: true },
      invitedBy: ref(true),
      createdAt: DataTypes.DATE,
    },
    createdOnly,
  );
  const Audit = sequelize.define<AuditRow>(
    "audit_log",
    {
      id,
      teamId: ref(true),
      actorId: ref(true),
      action: text(),
      targetType: text(true),
      targetId: text(true),
      details: json(true),
      createdAt: DataTypes.DATE,
    },
    createdOnly,
  );

  // U+0000 never reaches a database: PostgreSQL refuses it in text and the SQLite driver cuts
  // strings at it, so the same input would be stored differently. The request edge strips it
  // too (lib/server/errors.ts readJson); this covers every other writer (seed, scripts).
  for (const model of [
    User,
    Team,
    Membership,
    Board,
    Scenario,
    ScenarioVersion,
    Run,
    RunLink,
    Comment,
    Signoff,
    PartProfile,
    Capture,
    Invitation,
    Audit,
  ] as ModelStatic<Model>[]) {
    model.addHook("beforeValidate", stripInstance);
    model.addHook("beforeBulkCreate", (instances: Model[]) => instances.forEach(stripInstance));
  }

  // Associations (for includes); cascades live in the migration's foreign keys.
  Membership.belongsTo(User, { foreignKey: "userId", as: "user" });
  Membership.belongsTo(Team, { foreignKey: "teamId", as: "team" });
  User.hasMany(Membership, { foreignKey: "userId", as: "memberships" });
  Team.hasMany(Membership, { foreignKey: "teamId", as: "memberships" });
  Board.hasMany(Scenario, { foreignKey: "boardId", as: "scenarios" });
  Scenario.belongsTo(Board, { foreignKey: "boardId", as: "board" });
  Scenario.hasMany(ScenarioVersion, { foreignKey: "scenarioId", as: "versions" });
  Scenario.belongsTo(User, { foreignKey: "updatedBy", as: "updater" });
  ScenarioVersion.belongsTo(User, { foreignKey: "authorId", as: "author" });
  Scenario.hasMany(Run, { foreignKey: "scenarioId", as: "runs" });
  Run.belongsTo(Scenario, { foreignKey: "scenarioId", as: "scenarioRow" });
  Run.belongsTo(User, { foreignKey: "createdBy", as: "author" });
  Run.hasMany(RunLink, { foreignKey: "runId", as: "links" });
  Run.hasMany(Comment, { foreignKey: "runId", as: "comments" });
  Run.hasMany(Signoff, { foreignKey: "runId", as: "signoffs" });
  Comment.belongsTo(User, { foreignKey: "authorId", as: "author" });
  Signoff.belongsTo(User, { foreignKey: "reviewerId", as: "reviewer" });
  ReviewRequest.belongsTo(User, { foreignKey: "reviewerId", as: "reviewer" });
  ReviewRequest.belongsTo(User, { foreignKey: "requestedBy", as: "requester" });
  ReviewRequest.belongsTo(Run, { foreignKey: "runId", as: "run" });
  Audit.belongsTo(User, { foreignKey: "actorId", as: "actor" });
  Invitation.belongsTo(Team, { foreignKey: "teamId", as: "team" });

  return {
    User,
    Team,
    Membership,
    Board,
    Scenario,
    ScenarioVersion,
    Run,
    RunLink,
    Comment,
    Signoff,
    ReviewRequest,
    PartProfile,
    Capture,
    Invitation,
    Audit,
  };
}

export type Models = ReturnType<typeof defineModels>;
export type { ModelStatic };

const modelsKey = Symbol.for("railwise.models");
type WithModels = Sequelize & { [modelsKey]?: Models };

/** Models bound to the process-wide Sequelize instance (defined once per instance). */
export function getModels(sequelize: Sequelize = getSequelize()): Models {
  const s = sequelize as WithModels;
  return (s[modelsKey] ??= defineModels(sequelize));
}

export { getSequelize };
