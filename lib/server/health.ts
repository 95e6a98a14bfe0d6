import "server-only";
import { getSequelize } from "@/models";
import { selectOnePrepared } from "@/models/prepared";
import { AppError } from "./errors";

/** One query through the process's connection; 503 when the database does not answer. */
export async function checkDatabase(): Promise<{ dialect: string; ok: true }> {
  const sequelize = getSequelize();
  try {
    await selectOnePrepared(sequelize, "railwise_health", "SELECT 1 AS ok", []);
  } catch (err) {
    console.error("[railwise] health: database check failed:", err);
    throw new AppError("unavailable", "The database does not answer.");
  }
  return { dialect: sequelize.getDialect(), ok: true };
}
