// 0005 – a scenario's list form beside its document: `scenarios.summary` holds the scenario with
// its pwl points and capture samples left out and counted (leanScenarioOf), so the board's
// scenario list reads a few hundred bytes per row instead of parsing megabytes of waveform.
// Existing rows are filled here, one at a time; the Scenario model's beforeSave hook keeps the
// column in step from then on.
import { DataTypes, QueryTypes, type QueryInterface } from "sequelize";
import { leanScenarioOf } from "@/lib/schemas/lean-scenario";
import { jsonColumn } from "../prepared";
import type { Scenario } from "@/lib/schemas/scenario";

export async function up({ context: qi }: { context: QueryInterface }) {
  await qi.addColumn("scenarios", "summary", { type: DataTypes.JSON, allowNull: true });
  const sequelize = qi.sequelize;
  const ids = await sequelize.query<{ id: string }>(`SELECT "id" FROM "scenarios"`, { type: QueryTypes.SELECT });
  for (const { id } of ids) {
    const [row] = await sequelize.query<{ data: unknown }>(`SELECT "data" FROM "scenarios" WHERE "id" = $1`, {
      bind: [id],
      type: QueryTypes.SELECT,
    });
    const data = jsonColumn(row.data) as Scenario;
    await sequelize.query(`UPDATE "scenarios" SET "summary" = $1 WHERE "id" = $2`, {
      bind: [JSON.stringify(leanScenarioOf(data)), id],
    });
  }
}

export async function down({ context: qi }: { context: QueryInterface }) {
  await qi.removeColumn("scenarios", "summary");
}
