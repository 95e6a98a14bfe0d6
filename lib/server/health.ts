import "server-only";
import { getSequelize } from "@/models";
import { AppError } from "./errors";

/** One query through the process's connection; 503 when the database does not answer. */
export async function checkDatabase(): Promise<{ dialect: string; ok: true }> {
  const sequelize = getSequelize();
  try {
    await sequelize.query("SELECT 1");
  } catch (err) {
    console.error("[railwise] health: database check failed:", err);
    throw new AppError("unavailable", "The database does not answer.");
  }
  return { dialect: sequelize.getDialect(), ok: true };
}
