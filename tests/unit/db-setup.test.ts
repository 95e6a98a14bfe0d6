// The data layer on a real SQLite file: pragmas on every connection (including the fresh one a
// transaction opens), migrations and the demo seed are idempotent, and foreign keys cascade.
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { QueryTypes, type Sequelize } from "sequelize";
import { createSequelize, dialectOf, sqliteStorage } from "@/models/db";
import { getModels } from "@/models";
import { migrate } from "@/models/migrate";
import { seed } from "@/models/seed";
import { DEMO_ACCOUNTS } from "@/lib/demo/accounts";
import { DEMO_SCENARIOS } from "@/lib/demo/scenarios";

let dir: string;
let sequelize: Sequelize;

beforeAll(async () => {
  dir = fs.mkdtempSync(path.join(os.tmpdir(), "railwise-db-"));
  sequelize = createSequelize(`sqlite:${path.join(dir, "nested", "db.sqlite")}`);
  await migrate(sequelize);
});

afterAll(async () => {
  await sequelize?.close();
  fs.rmSync(dir, { recursive: true, force: true });
});

const pragma = async (name: string, transaction?: unknown) => {
  const rows = await sequelize.query<Record<string, unknown>>(`PRAGMA ${name}`, {
    type: QueryTypes.SELECT,
    transaction: transaction as never,
  });
  return Object.values(rows[0])[0];
};

describe("DATABASE_URL", () => {
  it("reads sqlite and postgres URLs", () => {
    expect(dialectOf("sqlite:./data/railwise.sqlite")).toBe("sqlite");
    expect(dialectOf("postgres://u:p@db/railwise")).toBe("postgres");
    expect(dialectOf("postgresql://u:p@db/railwise")).toBe("postgres");
    expect(() => dialectOf("mysql://db")).toThrow(/DATABASE_URL/);
    expect(sqliteStorage("sqlite:///tmp/x.sqlite")).toBe("/tmp/x.sqlite");
    expect(sqliteStorage("sqlite:./data/x.sqlite")).toBe(path.resolve("data/x.sqlite"));
  });

  it("creates the folder of the SQLite file", () => {
    expect(fs.existsSync(path.join(dir, "nested", "db.sqlite"))).toBe(true);
  });
});

describe("connections", () => {
  it("WAL, busy timeout and foreign keys on the default connection", async () => {
    expect(String(await pragma("journal_mode"))).toBe("wal");
    expect(Number(await pragma("busy_timeout"))).toBe(10_000);
    expect(Number(await pragma("foreign_keys"))).toBe(1);
  });

  it("the same pragmas on the connection a transaction opens", async () => {
    await sequelize.transaction(async (t) => {
      expect(Number(await pragma("busy_timeout", t))).toBe(10_000);
      expect(Number(await pragma("foreign_keys", t))).toBe(1);
    });
  });
});

describe("migrations and seed", () => {
  it("migrating again applies nothing", async () => {
    expect(await migrate(sequelize)).toEqual([]);
  });

  it("the seed creates the demo data once", async () => {
    const first = await seed(sequelize);
    expect(first.created.length).toBeGreaterThan(10);
    const again = await seed(sequelize);
    expect(again.created).toEqual([]);
    const m = getModels(sequelize);
    expect(await m.User.count()).toBe(DEMO_ACCOUNTS.length);
    expect(await m.Team.count()).toBe(2);
    const board = await m.Board.findOne({ where: { name: "Buoy power and sensing" } });
    expect(board).not.toBeNull();
    expect(await m.Scenario.count({ where: { boardId: board!.id } })).toBe(DEMO_SCENARIOS.length);
    expect(await m.ScenarioVersion.count()).toBe(await m.Scenario.count());
    expect(await m.Capture.count()).toBe(1);
    expect(await m.PartProfile.count()).toBe(6);
  });

  it("deleting a board cascades to its scenarios and their versions", async () => {
    const m = getModels(sequelize);
    const team = await m.Team.findOne({ where: { name: "Harrow Marine" } });
    const board = await m.Board.findOne({ where: { teamId: team!.id } });
    const scenarioIds = (await m.Scenario.findAll({ where: { boardId: board!.id } })).map((s) => s.id);
    expect(scenarioIds.length).toBeGreaterThan(0);
    await board!.destroy();
    expect(await m.Scenario.count({ where: { id: scenarioIds } })).toBe(0);
    expect(await m.ScenarioVersion.count({ where: { scenarioId: scenarioIds } })).toBe(0);
  });

  it("a membership with an unknown role is refused", async () => {
    const m = getModels(sequelize);
    const user = await m.User.findOne();
    const team = await m.Team.findOne();
    await expect(m.Membership.create({ userId: user!.id, teamId: team!.id, role: "admin" as never })).rejects.toThrow();
  });
});

describe("migration 0005: the scenario list form", () => {
  const pwl = {
    kind: "pwl",
    points: [
      [0, 0],
      [0.5, 2],
      [1, 0],
    ],
  };
  const doc = (points: unknown) => ({
    schema: "railwise.scenario/1",
    supply: { positive: 5, negative: 0 },
    stage: { kind: "comparator", reference: 1 },
    input: { components: [{ kind: "dc", level: 1 }, points] },
    run: { duration: 1, points: 11 },
  });
  const summaryOf = async (db: Sequelize, id: string) => {
    const [row] = await db.query<{ summary: string }>(`SELECT "summary" FROM "scenarios" WHERE "id" = $1`, {
      bind: [id],
      type: QueryTypes.SELECT,
    });
    return JSON.parse(row.summary);
  };

  it("fills rows written before it, and the model keeps the column in step on every save", async () => {
    const file = path.join(dir, "before-0005.sqlite");
    const db = createSequelize(`sqlite:${file}`);
    try {
      const { migrator } = await import("@/models/migrate");
      await migrator(db).up({ to: "0004-review" });
      const now = new Date().toISOString();
      await db.query(`INSERT INTO "teams" ("id", "name", "createdAt", "updatedAt") VALUES ($1, 't', $2, $2)`, {
        bind: ["00000000-0000-4000-8000-000000000001", now],
      });
      await db.query(
        `INSERT INTO "boards" ("id", "teamId", "name", "description", "createdAt", "updatedAt")
         VALUES ($1, $2, 'b', '', $3, $3)`,
        { bind: ["00000000-0000-4000-8000-000000000002", "00000000-0000-4000-8000-000000000001", now] },
      );
      const id = "00000000-0000-4000-8000-000000000003";
      await db.query(
        `INSERT INTO "scenarios" ("id", "teamId", "boardId", "name", "version", "data", "createdAt", "updatedAt")
         VALUES ($1, $2, $3, 's', 1, $4, $5, $5)`,
        {
          bind: [
            id,
            "00000000-0000-4000-8000-000000000001",
            "00000000-0000-4000-8000-000000000002",
            JSON.stringify(doc(pwl)),
            now,
          ],
        },
      );
      expect(await migrate(db)).toEqual(["0005-scenario-summary"]);
      // The pwl keeps its kind and says how many points it had; the dc component is unchanged.
      const filled = await summaryOf(db, id);
      expect(filled.input.components).toEqual([
        { kind: "dc", level: 1 },
        { kind: "pwl", points: [], pointCount: 3 },
      ]);
      expect(filled.stage).toEqual({ kind: "comparator", reference: 1 });

      const row = await getModels(db).Scenario.findByPk(id);
      row!.set({
        data: doc({
          kind: "pwl",
          points: [
            [0, 0],
            [1, 1],
          ],
        }),
      });
      await row!.save();
      expect((await summaryOf(db, id)).input.components[1]).toEqual({ kind: "pwl", points: [], pointCount: 2 });
      // A save that leaves the document alone leaves the list form alone.
      row!.set({ name: "renamed" });
      await row!.save();
      expect((await summaryOf(db, id)).input.components[1].pointCount).toBe(2);
    } finally {
      await db.close();
    }
  });
});
