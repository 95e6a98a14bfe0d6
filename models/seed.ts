// Idempotent demo seed: creates what is missing, never overwrites what users changed.
import { hash } from "bcryptjs";
import type { Sequelize, Transaction } from "sequelize";
import { DEMO_ACCOUNTS, DEMO_PASSWORD, DEMO_TEAMS } from "@/lib/demo/accounts";
import { DEMO_PART_PROFILES } from "@/lib/demo/parts";
import {
  BILGE_CAPTURE,
  DEMO_BOARD,
  DEMO_SCENARIOS,
  HARROW_BOARD,
  HARROW_SCENARIOS,
  bilgeCaptureSamples,
  type DemoScenario,
} from "@/lib/demo/scenarios";
import { parseScenario } from "@/lib/schemas/scenario";
import { getModels, type Models } from "./index";

export interface SeedReport {
  created: string[];
}

async function findOrCreate<T>(
  find: () => Promise<T | null>,
  create: () => Promise<T>,
  label: string,
  report: SeedReport,
) {
  const found = await find();
  if (found) return found;
  report.created.push(label);
  return create();
}

async function seedBoard(
  m: Models,
  t: Transaction,
  report: SeedReport,
  teamId: string,
  ownerId: string,
  board: { name: string; description: string },
  scenarios: DemoScenario[],
) {
  const row = await findOrCreate(
    () => m.Board.findOne({ where: { teamId, name: board.name }, transaction: t }),
    () =>
      m.Board.create(
        { teamId, name: board.name, description: board.description, createdBy: ownerId },
        { transaction: t },
      ),
    `board ${board.name}`,
    report,
  );
  for (const demo of scenarios) {
    const data = parseScenario(demo.scenario);
    await findOrCreate(
      () => m.Scenario.findOne({ where: { boardId: row.id, name: demo.name }, transaction: t }),
      async () => {
        const s = await m.Scenario.create(
          { teamId, boardId: row.id, name: demo.name, version: 1, data, updatedBy: ownerId },
          { transaction: t },
        );
        await m.ScenarioVersion.create(
          { scenarioId: s.id, version: 1, name: demo.name, data, authorId: ownerId, note: "demo data" },
          { transaction: t },
        );
        return s;
      },
      `scenario ${demo.name}`,
      report,
    );
  }
}

export async function seed(sequelize: Sequelize): Promise<SeedReport> {
  const m = getModels(sequelize);
  const report: SeedReport = { created: [] };
  const passwordHash = await hash(DEMO_PASSWORD, 10);
  await sequelize.transaction(async (t) => {
    const teams = new Map<string, string>();
    for (const name of Object.values(DEMO_TEAMS)) {
      const team = await findOrCreate(
        () => m.Team.findOne({ where: { name }, transaction: t }),
        () => m.Team.create({ name }, { transaction: t }),
        `team ${name}`,
        report,
      );
      teams.set(name, team.id);
      for (const profile of DEMO_PART_PROFILES) {
        await findOrCreate(
          () => m.PartProfile.findOne({ where: { teamId: team.id, name: profile.name }, transaction: t }),
          () =>
            m.PartProfile.create(
              { teamId: team.id, name: profile.name, params: profile.params, createdBy: null },
              { transaction: t },
            ),
          `part profile ${profile.name} (${name})`,
          report,
        );
      }
    }

    const owners = new Map<string, string>();
    for (const account of DEMO_ACCOUNTS) {
      const user = await findOrCreate(
        () => m.User.findOne({ where: { email: account.email }, transaction: t }),
        () => m.User.create({ email: account.email, name: account.name, passwordHash }, { transaction: t }),
        `user ${account.email}`,
        report,
      );
      const teamId = teams.get(account.team)!;
      await findOrCreate(
        () => m.Membership.findOne({ where: { userId: user.id, teamId }, transaction: t }),
        () => m.Membership.create({ userId: user.id, teamId, role: account.role }, { transaction: t }),
        `membership ${account.email}`,
        report,
      );
      if (account.role === "owner") owners.set(account.team, user.id);
    }

    const fjordline = teams.get(DEMO_TEAMS.fjordline)!;
    const harrow = teams.get(DEMO_TEAMS.harrow)!;
    await seedBoard(m, t, report, fjordline, owners.get(DEMO_TEAMS.fjordline)!, DEMO_BOARD, DEMO_SCENARIOS);
    await seedBoard(m, t, report, harrow, owners.get(DEMO_TEAMS.harrow)!, HARROW_BOARD, HARROW_SCENARIOS);

    await findOrCreate(
      () => m.Capture.findOne({ where: { teamId: fjordline, name: BILGE_CAPTURE.name }, transaction: t }),
      () =>
        m.Capture.create(
          {
            teamId: fjordline,
            name: BILGE_CAPTURE.name,
            samples: bilgeCaptureSamples(),
            columns: BILGE_CAPTURE.columns,
            sourceFilename: BILGE_CAPTURE.sourceFilename,
            createdBy: owners.get(DEMO_TEAMS.fjordline)!,
          },
          { transaction: t },
        ),
      `capture ${BILGE_CAPTURE.name}`,
      report,
    );
  });
  return report;
}
