// Reads and writes a test server's database through the app's own db module and models (the
// same Sequelize dialect, pragmas and hooks as the server), on SQLite and PostgreSQL alike.
// Tests never open the SQLite file or speak SQL to a driver directly.
import type { Sequelize } from "sequelize";
import { createSequelize } from "@/models/db";
import { getModels, type Models } from "@/models";
import type { TestServer } from "./server";

export interface DbAccess {
  sequelize: Sequelize;
  models: Models;
}

/** Opens the server's database, runs `fn`, closes the connection again (also on failure). */
export async function withServerDb<T>(
  server: Pick<TestServer, "databaseUrl">,
  fn: (db: DbAccess) => Promise<T>,
): Promise<T> {
  const sequelize = createSequelize(server.databaseUrl);
  try {
    return await fn({ sequelize, models: getModels(sequelize) });
  } finally {
    await sequelize.close();
  }
}
