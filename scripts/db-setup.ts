// `npm run db:setup` – apply pending migrations, then seed the demo data (idempotent).
import { databaseUrl, getSequelize, maskSecrets, maskUrl } from "@/models/db";
import { migrate } from "@/models/migrate";
import { seed } from "@/models/seed";
import { DEMO_ACCOUNTS, DEMO_PASSWORD } from "@/lib/demo/accounts";

async function main() {
  const quiet = process.argv.includes("--quiet");
  const skipSeed = process.argv.includes("--no-seed") || process.env.RAILWISE_HIDE_DEMO === "1";
  const sequelize = getSequelize();
  try {
    const applied = await migrate(sequelize);
    const report = skipSeed ? { created: [] } : await seed(sequelize);
    if (!quiet) {
      console.log(`database: ${maskUrl(databaseUrl())}`);
      console.log(`migrations applied: ${applied.length ? applied.join(", ") : "none pending"}`);
      console.log(
        `seed: ${report.created.length ? `${report.created.length} rows created` : "demo data already present"}`,
      );
      if (!skipSeed) {
        console.log(`demo accounts (password "${DEMO_PASSWORD}"):`);
        for (const a of DEMO_ACCOUNTS) console.log(`  ${a.email.padEnd(30)} ${a.role.padEnd(9)} ${a.team}`);
      }
    }
  } finally {
    await sequelize.close();
  }
}

main().catch((err: unknown) => {
  console.error(`db:setup failed: ${maskSecrets(err instanceof Error ? err.message : String(err))}`);
  process.exit(1);
});
