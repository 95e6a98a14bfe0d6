// Runs pending migrations with umzug; the executed list lives in the `migrations_meta` table.
import { Umzug, SequelizeStorage } from "umzug";
import type { Sequelize } from "sequelize";
import { MIGRATIONS } from "./migrations";

export function migrator(sequelize: Sequelize) {
  return new Umzug({
    migrations: MIGRATIONS,
    context: sequelize.getQueryInterface(),
    storage: new SequelizeStorage({ sequelize, tableName: "migrations_meta" }),
    logger: undefined,
  });
}

/** Applies every pending migration; returns the names applied now. */
export async function migrate(sequelize: Sequelize): Promise<string[]> {
  const applied = await migrator(sequelize).up();
  return applied.map((m) => m.name);
}
