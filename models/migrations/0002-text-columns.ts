// 0002 – every VARCHAR(255) column becomes TEXT on PostgreSQL, so the database accepts what the
// API accepts (a 500-character version note, a 254-character e-mail, long file names) instead
// of failing with a 500. SQLite does not enforce VARCHAR lengths; nothing to do there.
import type { QueryInterface } from "sequelize";

export const WIDENED: Record<string, string[]> = {
  users: ["email", "name", "passwordHash"],
  teams: ["name"],
  memberships: ["role"],
  boards: ["name"],
  scenarios: ["name"],
  scenario_versions: ["name", "note"],
  runs: ["label"],
  run_links: ["tokenHash"],
  signoffs: ["decision"],
  part_profiles: ["name"],
  captures: ["name", "sourceFilename"],
  invitations: ["email", "role", "tokenHash"],
  audit_log: ["action", "targetType", "targetId"],
};

async function alter(qi: QueryInterface, type: "TEXT" | "VARCHAR(255)") {
  if (qi.sequelize.getDialect() !== "postgres") return;
  for (const [table, columns] of Object.entries(WIDENED)) {
    const clauses = columns.map((c) => `ALTER COLUMN ${qi.quoteIdentifier(c)} TYPE ${type}`).join(", ");
    await qi.sequelize.query(`ALTER TABLE ${qi.quoteIdentifier(table)} ${clauses}`);
  }
}

export async function up({ context: qi }: { context: QueryInterface }) {
  await alter(qi, "TEXT");
}

export async function down({ context: qi }: { context: QueryInterface }) {
  await alter(qi, "VARCHAR(255)");
}
