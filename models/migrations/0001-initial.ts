// 0001 – the whole first schema. Foreign keys cascade from team → board → scenario → run so
// deleting a board or scenario removes what hangs off it in one statement.
import { DataTypes, type QueryInterface } from "sequelize";

const id = { type: DataTypes.UUID, primaryKey: true, allowNull: false };
const stamp = { type: DataTypes.DATE, allowNull: false };
const str = (allowNull = false) => ({ type: DataTypes.STRING, allowNull });
const fk = (table: string, onDelete: "CASCADE" | "SET NULL", allowNull = onDelete === "SET NULL") => ({
  type: DataTypes.UUID,
  allowNull,
  references: { model: table, key: "id" },
  onDelete,
  onUpdate: "CASCADE",
});
const team = () => fk("teams", "CASCADE");
const user = () => fk("users", "SET NULL");

export async function up({ context: qi }: { context: QueryInterface }) {
  await qi.createTable("users", {
    id,
    email: { ...str(), unique: true },
    name: str(),
    passwordHash: str(),
    createdAt: stamp,
    updatedAt: stamp,
  });
  await qi.createTable("teams", { id, name: str(), createdAt: stamp, updatedAt: stamp });
  await qi.createTable("memberships", {
    id,
    userId: fk("users", "CASCADE"),
    teamId: team(),
    role: str(),
    createdAt: stamp,
    updatedAt: stamp,
  });
  await qi.addIndex("memberships", ["userId", "teamId"], { unique: true, name: "memberships_user_team" });
  await qi.addIndex("memberships", ["teamId"], { name: "memberships_team" });

  await qi.createTable("boards", {
    id,
    teamId: team(),
    name: str(),
    description: { type: DataTypes.TEXT, allowNull: false, defaultValue: "" },
    createdBy: user(),
    createdAt: stamp,
    updatedAt: stamp,
  });
  await qi.addIndex("boards", ["teamId"], { name: "boards_team" });

  await qi.createTable("scenarios", {
    id,
    teamId: team(),
    boardId: fk("boards", "CASCADE"),
    name: str(),
    version: { type: DataTypes.INTEGER, allowNull: false },
    data: { type: DataTypes.JSON, allowNull: false },
    updatedBy: user(),
    createdAt: stamp,
    updatedAt: stamp,
  });
  await qi.addIndex("scenarios", ["boardId"], { name: "scenarios_board" });

  await qi.createTable("scenario_versions", {
    id,
    scenarioId: fk("scenarios", "CASCADE"),
    version: { type: DataTypes.INTEGER, allowNull: false },
    name: str(),
    data: { type: DataTypes.JSON, allowNull: false },
    authorId: user(),
    note: str(true),
    createdAt: stamp,
  });
  await qi.addIndex("scenario_versions", ["scenarioId", "version"], {
    unique: true,
    name: "scenario_versions_scenario_version",
  });

  await qi.createTable("runs", {
    id,
    teamId: team(),
    scenarioId: fk("scenarios", "CASCADE"),
    scenarioVersion: { type: DataTypes.INTEGER, allowNull: true },
    label: str(),
    scenario: { type: DataTypes.JSON, allowNull: false },
    result: { type: DataTypes.JSON, allowNull: false },
    study: { type: DataTypes.JSON, allowNull: true },
    createdBy: user(),
    createdAt: stamp,
  });
  await qi.addIndex("runs", ["scenarioId", "createdAt"], { name: "runs_scenario_created" });

  await qi.createTable("run_links", {
    id,
    teamId: team(),
    runId: fk("runs", "CASCADE"),
    tokenHash: { ...str(), unique: true },
    expiresAt: { type: DataTypes.DATE, allowNull: true },
    revokedAt: { type: DataTypes.DATE, allowNull: true },
    createdBy: user(),
    createdAt: stamp,
  });
  await qi.addIndex("run_links", ["runId"], { name: "run_links_run" });

  await qi.createTable("comments", {
    id,
    teamId: team(),
    runId: fk("runs", "CASCADE"),
    authorId: user(),
    body: { type: DataTypes.TEXT, allowNull: false },
    createdAt: stamp,
  });
  await qi.addIndex("comments", ["runId", "createdAt"], { name: "comments_run_created" });

  await qi.createTable("signoffs", {
    id,
    teamId: team(),
    runId: fk("runs", "CASCADE"),
    reviewerId: user(),
    decision: str(),
    note: { type: DataTypes.TEXT, allowNull: false, defaultValue: "" },
    createdAt: stamp,
  });
  await qi.addIndex("signoffs", ["runId", "createdAt"], { name: "signoffs_run_created" });

  await qi.createTable("part_profiles", {
    id,
    teamId: team(),
    name: str(),
    params: { type: DataTypes.JSON, allowNull: false },
    createdBy: user(),
    createdAt: stamp,
    updatedAt: stamp,
  });
  await qi.addIndex("part_profiles", ["teamId", "name"], { unique: true, name: "part_profiles_team_name" });

  await qi.createTable("captures", {
    id,
    teamId: team(),
    name: str(),
    samples: { type: DataTypes.JSON, allowNull: false },
    columns: { type: DataTypes.JSON, allowNull: false },
    sourceFilename: str(true),
    createdBy: user(),
    createdAt: stamp,
  });
  await qi.addIndex("captures", ["teamId"], { name: "captures_team" });

  await qi.createTable("invitations", {
    id,
    teamId: team(),
    email: str(),
    role: str(),
    tokenHash: { ...str(), unique: true },
    expiresAt: stamp,
    acceptedAt: { type: DataTypes.DATE, allowNull: true },
    invitedBy: user(),
    createdAt: stamp,
  });
  await qi.addIndex("invitations", ["teamId"], { name: "invitations_team" });

  await qi.createTable("audit_log", {
    id,
    teamId: fk("teams", "CASCADE", true),
    actorId: user(),
    action: str(),
    targetType: str(true),
    targetId: str(true),
    details: { type: DataTypes.JSON, allowNull: true },
    createdAt: stamp,
  });
  await qi.addIndex("audit_log", ["teamId", "createdAt"], { name: "audit_log_team_created" });
}

export async function down({ context: qi }: { context: QueryInterface }) {
  for (const table of [
    "audit_log",
    "invitations",
    "captures",
    "part_profiles",
    "signoffs",
    "comments",
    "run_links",
    "runs",
    "scenario_versions",
    "scenarios",
    "boards",
    "memberships",
    "teams",
    "users",
  ]) {
    await qi.dropTable(table);
  }
}
