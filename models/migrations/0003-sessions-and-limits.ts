// 0003 – session generation per user (bumped to end every session of that user: sign-out,
// role change, removal) and the sign-in / invitation rate-limit counters, kept in the
// database so they hold across restarts and across server processes.
import { DataTypes, type QueryInterface } from "sequelize";

export async function up({ context: qi }: { context: QueryInterface }) {
  await qi.addColumn("users", "sessionGeneration", { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 });
  await qi.createTable("rate_limits", {
    // e.g. "signin:account:<email>", "signin:address:<ip>", "invite:address:<ip>"
    key: { type: DataTypes.STRING, primaryKey: true, allowNull: false },
    failures: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
    /** Epoch milliseconds: start of the current counting window. */
    windowStart: { type: DataTypes.BIGINT, allowNull: false },
    /** Epoch milliseconds until which attempts are refused (0 = not locked). */
    lockedUntil: { type: DataTypes.BIGINT, allowNull: false, defaultValue: 0 },
  });
}

export async function down({ context: qi }: { context: QueryInterface }) {
  await qi.dropTable("rate_limits");
  await qi.removeColumn("users", "sessionGeneration");
}
