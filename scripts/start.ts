// `npm start` – prepare the database (migrate + seed), build if there is no build or the sources
// are newer, start the local mail sink (unless SMTP_URL is set) and serve with `next start`.
import { spawn, spawnSync } from "node:child_process";
import { randomBytes } from "node:crypto";
import fs from "node:fs";
import path from "node:path";
import { DEMO_ACCOUNTS, DEMO_PASSWORD } from "@/lib/demo/accounts";
import { databaseUrl, getSequelize, maskSecrets, maskUrl } from "@/models/db";
import { migrate } from "@/models/migrate";
import { seed } from "@/models/seed";
import { buildNeeded, nextBuild, ROOT } from "./build-state";
import { startMailSink, type MailSink } from "./mail-sink";

const root = ROOT;
const nextBin = path.join(root, "node_modules", "next", "dist", "bin", "next");
// Replaces client-written forwarding headers with the socket's address (scripts/peer-address.cjs).
const peerAddress = path.join(root, "scripts", "peer-address.cjs");
const distDir = process.env.NEXT_DIST_DIR || ".next";
const port = Number(process.env.PORT || 3000);
const host = process.env.HOST || "0.0.0.0";
// A real deployment sets RAILWISE_HIDE_DEMO=1: no demo seed, no demo accounts printed or shown.
const hideDemo = process.env.RAILWISE_HIDE_DEMO === "1";

/** NEXTAUTH_SECRET from the environment, else one generated once and kept in data/. */
function ensureAuthSecret(): string {
  if (process.env.NEXTAUTH_SECRET?.trim()) return process.env.NEXTAUTH_SECRET.trim();
  const file = path.join(root, "data", ".nextauth-secret");
  if (fs.existsSync(file)) {
    const kept = fs.readFileSync(file, "utf8").trim();
    if (kept) return kept;
  }
  fs.mkdirSync(path.dirname(file), { recursive: true });
  const secret = randomBytes(32).toString("base64url");
  fs.writeFileSync(file, secret + "\n", { mode: 0o600 });
  console.log(`generated NEXTAUTH_SECRET in ${path.relative(root, file)}`);
  return secret;
}

async function prepareDatabase() {
  const sequelize = getSequelize();
  try {
    const applied = await migrate(sequelize);
    const report = hideDemo ? { created: [] } : await seed(sequelize);
    console.log(
      `database ${maskUrl(databaseUrl())}: ${applied.length ? `migrated (${applied.join(", ")})` : "schema up to date"}, ` +
        `${report.created.length ? `${report.created.length} demo rows created` : "demo data present"}`,
    );
  } finally {
    await sequelize.close();
  }
}

async function startSink(): Promise<MailSink | null> {
  if (process.env.SMTP_URL) return null;
  const sinkPort = Number(process.env.SMTP_SINK_PORT || 2525);
  try {
    const sink = await startMailSink({ port: sinkPort });
    console.log(`local mail sink on 127.0.0.1:${sink.port} (set SMTP_URL to send real mail)`);
    return sink;
  } catch (err) {
    console.warn(
      `mail sink not started (${err instanceof Error ? err.message : String(err)}); mails will fail until one listens on ${sinkPort} or SMTP_URL is set`,
    );
    return null;
  }
}

async function main() {
  // The server makes no outbound calls: no Next.js telemetry.
  process.env.NEXT_TELEMETRY_DISABLED = "1";
  process.env.NEXTAUTH_SECRET = ensureAuthSecret();
  const publicUrl = process.env.NEXTAUTH_URL || `http://localhost:${port}`;
  process.env.NEXTAUTH_URL = publicUrl;
  await prepareDatabase();

  const reason = buildNeeded(distDir);
  if (reason) {
    console.log(`building (${reason}) …`);
    const status = nextBuild(distDir, spawnSync);
    if (status !== 0) {
      console.error("next build failed; see the output above.");
      process.exit(status);
    }
  } else {
    console.log(`build in ${distDir} is up to date`);
  }

  const sink = await startSink();
  const server = spawn(process.execPath, ["--require", peerAddress, nextBin, "start", "-p", String(port), "-H", host], {
    cwd: root,
    stdio: "inherit",
    env: { ...process.env, NEXT_DIST_DIR: distDir, NODE_ENV: "production" },
  });

  console.log(`\nRailwise on ${publicUrl}`);
  if (!hideDemo) {
    console.log(`demo accounts, password "${DEMO_PASSWORD}":`);
    for (const a of DEMO_ACCOUNTS) console.log(`  ${a.email.padEnd(30)} ${a.role.padEnd(9)} ${a.team}`);
  }

  const shutdown = (signal: NodeJS.Signals) => {
    server.kill(signal);
    void sink?.close();
  };
  process.on("SIGINT", () => shutdown("SIGINT"));
  process.on("SIGTERM", () => shutdown("SIGTERM"));
  server.on("exit", (code) => {
    void sink?.close().finally(() => process.exit(code ?? 0));
    if (!sink) process.exit(code ?? 0);
  });
}

main().catch((err: unknown) => {
  console.error(`start failed: ${maskSecrets(err instanceof Error ? err.message : String(err))}`);
  process.exit(1);
});
