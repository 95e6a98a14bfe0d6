// 0004 – review you can sign: sign-offs remember the scenario version they apply to and may be
// withdrawn; run links carry a label (who it was sent to) and when they were last opened;
// review requests name the reviewers an author asked.
import { DataTypes, type QueryInterface } from "sequelize";

const fk = (table: string, onDelete: "CASCADE" | "SET NULL", allowNull = onDelete === "SET NULL") => ({
  type: DataTypes.UUID,
  allowNull,
  references: { model: table, key: "id" },
  onDelete,
  onUpdate: "CASCADE",
});

export async function up({ context: qi }: { context: QueryInterface }) {
  await qi.addColumn("signoffs", "scenarioVersion", { type: DataTypes.INTEGER, allowNull: true });
  await qi.addColumn("signoffs", "withdrawnAt", { type: DataTypes.DATE, allowNull: true });
  await qi.addColumn("run_links", "label", { type: DataTypes.STRING(120), allowNull: true });
  await qi.addColumn("run_links", "lastUsedAt", { type: DataTypes.DATE, allowNull: true });
  await qi.addColumn("run_links", "useCount", { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 });
  await qi.createTable("review_requests", {
    id: { type: DataTypes.UUID, primaryKey: true, allowNull: false },
    teamId: fk("teams", "CASCADE"),
    runId: fk("runs", "CASCADE"),
    reviewerId: fk("users", "CASCADE"),
    requestedBy: fk("users", "SET NULL"),
    note: { type: DataTypes.TEXT, allowNull: false, defaultValue: "" },
    createdAt: { type: DataTypes.DATE, allowNull: false },
  });
  await qi.addIndex("review_requests", ["teamId", "reviewerId"], { name: "review_requests_team_reviewer" });
  await qi.addIndex("review_requests", ["runId", "reviewerId"], { name: "review_requests_run_reviewer", unique: true });
}

export async function down({ context: qi }: { context: QueryInterface }) {
  await qi.dropTable("review_requests");
  await qi.removeColumn("run_links", "useCount");
  await qi.removeColumn("run_links", "lastUsedAt");
  await qi.removeColumn("run_links", "label");
  await qi.removeColumn("signoffs", "withdrawnAt");
  await qi.removeColumn("signoffs", "scenarioVersion");
}
