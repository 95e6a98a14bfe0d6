// Is a Next build in `distDir` older than the sources? Shared by `npm start` and `npm test`.
import fs from "node:fs";
import path from "node:path";

export const ROOT = path.resolve(__dirname, "..");

const SOURCE_DIRS = ["app", "components", "lib", "models", "workers", "public", "types"];
const SOURCE_FILES = [
  "next.config.ts",
  "tailwind.config.ts",
  "postcss.config.mjs",
  "package.json",
  "package-lock.json",
];

function newestMtime(p: string): number {
  let st: fs.Stats;
  try {
    st = fs.statSync(p);
  } catch {
    return 0;
  }
  if (!st.isDirectory()) return st.mtimeMs;
  let newest = st.mtimeMs;
  for (const entry of fs.readdirSync(p)) newest = Math.max(newest, newestMtime(path.join(p, entry)));
  return newest;
}

/** Why a build is needed, or null when the build is newer than every source. */
export function buildNeeded(distDir: string): string | null {
  const buildId = path.join(ROOT, distDir, "BUILD_ID");
  if (!fs.existsSync(buildId)) return `no build in ${distDir}`;
  const built = fs.statSync(buildId).mtimeMs;
  for (const s of [...SOURCE_DIRS, ...SOURCE_FILES]) {
    if (newestMtime(path.join(ROOT, s)) > built) return `${s} changed since the last build`;
  }
  return null;
}

/**
 * `next build` with its own dist folder. Next adds that folder's type paths to tsconfig.json
 * on every build; the shared file is put back afterwards so builds leave the tree clean.
 */
export function nextBuild(distDir: string, spawnSync: typeof import("node:child_process").spawnSync): number {
  const tsconfig = path.join(ROOT, "tsconfig.json");
  const before = fs.existsSync(tsconfig) ? fs.readFileSync(tsconfig, "utf8") : null;
  try {
    const r = spawnSync(process.execPath, [path.join(ROOT, "node_modules/next/dist/bin/next"), "build"], {
      cwd: ROOT,
      stdio: "inherit",
      env: { ...process.env, NEXT_DIST_DIR: distDir, NODE_ENV: "production" },
    });
    return r.status ?? 1;
  } finally {
    if (before !== null && fs.readFileSync(tsconfig, "utf8") !== before) fs.writeFileSync(tsconfig, before);
  }
}
