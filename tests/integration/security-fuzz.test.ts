// A seeded fuzz of 10,000 malformed requests over every route of the app (each app/api route
// handler and each page, found from the file tree) against the real server on loopback:
// malformed ids (%00, %ff%fe, long, dotted), wrong methods, broken or hostile JSON bodies, odd
// content types, garbage query strings, with and without a session. No answer may be a 5xx.
// Bounded: 10,000 requests, 8 at a time, and a 240 s wall-clock cap; the status counts are
// printed. The PostgreSQL pass of `npm test` replays the first 2,500 requests of the same seeded
// stream (the routes and their validation are the database's business only past the id check,
// and the full 10,000 on both passes cost a minute of CI each). The generator is the studies' seeded stream (lib/studies/random.ts), so a seed replays a run.
import fs from "node:fs";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { apiErrorSchema } from "@/lib/schemas/responses";
import { createStream } from "@/lib/studies/random";
import { startServer, type TestServer } from "@/tests/helpers/server";
import { setupTeam, type TeamFixture } from "@/tests/helpers/team";

const SEED = Number(process.env.RAILWISE_FUZZ_SEED ?? 20261202);
const REQUESTS = process.env.RAILWISE_TEST_PG ? 2_500 : 10_000;
const CONCURRENCY = 8;
const WALL_MS = 240_000;

let server: TestServer;
let fx: TeamFixture;

beforeAll(async () => {
  server = await startServer();
  fx = await setupTeam(server);
});
afterAll(async () => {
  await server?.stop();
});

/** Route patterns from the file tree: app/api/**\/route.ts and app/**\/page.tsx, "[x]" segments kept. */
function routePatterns(): { api: string[]; pages: string[] } {
  const root = path.resolve(__dirname, "../../app");
  const api: string[] = [];
  const pages: string[] = [];
  const walk = (dir: string) => {
    for (const e of fs.readdirSync(dir, { withFileTypes: true })) {
      const full = path.join(dir, e.name);
      if (e.isDirectory()) walk(full);
      else if (e.name === "route.ts" || e.name === "page.tsx") {
        const rel = path
          .relative(root, dir)
          .split(path.sep)
          .filter((s) => s && !/^\(.*\)$/.test(s));
        const p = `/${rel.join("/")}`;
        (e.name === "route.ts" ? api : pages).push(p === "/" ? "/" : p);
      }
    }
  };
  walk(root);
  return { api, pages };
}

describe("fuzz: 10,000 malformed requests", () => {
  it("answer no 5xx on any route", { timeout: WALL_MS + 60_000 }, async () => {
    const stream = createStream(SEED);
    const rnd = () => stream.uniform();
    const pick = <T>(xs: readonly T[]): T => xs[Math.floor(rnd() * xs.length)];
    const { api, pages } = routePatterns();
    expect(api.length).toBeGreaterThan(20);
    expect(pages.length).toBeGreaterThan(5);

    const badIds = [
      "%00",
      "abc%00def",
      "%ff%fe",
      "%ff",
      "%c0%af",
      "..",
      "..%2f..%2fetc%2fpasswd",
      "x".repeat(5000),
      "00000000-0000-0000-0000-000000000000",
      "' OR 1=1 --",
      "%E2%80%AE",
      "-1",
      "1e309",
      "null",
      "undefined",
      "%20",
      "a%2Fb",
      fx.runId,
      fx.scenarioId,
      `${fx.runId}%00`,
      fx.linkToken,
      `${fx.linkToken.slice(0, 42)}%ff`,
    ];
    const fill = (pattern: string) =>
      pattern
        .split("/")
        .map((seg) => (/^\[.*\]$/.test(seg) ? pick(badIds) : seg))
        .join("/");
    const hostile: unknown[] = [
      null,
      0,
      -1e308,
      "string",
      [],
      [1, 2, 3],
      {},
      { id: "%00" },
      { name: "a\u0000b", scenario: null },
      { name: "x".repeat(100_000) },
      { boardId: 12, scenario: { schema: "railwise.scenario/1" } },
      { scenarioId: fx.scenarioId, label: { nested: true } },
      { email: "not-an-email", role: "emperor" },
      { role: "owner" },
      { body: 42 },
      { decision: "maybe" },
      { schema: "railwise.study/1", noiseMargin: { config: { bandwidth: 1e11 }, tasks: "x" } },
      { __proto__: { polluted: true } },
      { constructor: { prototype: { polluted: true } } },
      JSON.parse(`${"[".repeat(2000)}${"]".repeat(2000)}`),
      { scenario: { run: { duration: -1, points: 1e12 } } },
    ];
    const rawBodies = ["{", "not json", "\u0000\u0000", '{"a":}', "[".repeat(100_000), '"\\ud800"', "null", ""];
    const types = [
      "application/json",
      "application/json",
      "application/json",
      "text/plain",
      "multipart/form-data; boundary=x",
      "application/x-www-form-urlencoded",
      "",
    ];
    const methods = ["GET", "GET", "POST", "POST", "PUT", "PATCH", "DELETE", "HEAD", "OPTIONS"];
    const queries = [
      "",
      "",
      "?boardId=%00",
      "?boardId=%ff",
      "?with=%ff%fe",
      "?scenarioId[]=1",
      `?boardId=${"z".repeat(3000)}`,
      "?limit=-1&offset=1e99",
      "?q=%",
    ];
    const callers = [fx.sessions.owner, fx.sessions.designer, fx.sessions.viewer, fx.sessions.other, null];

    const counts = new Map<number, number>();
    const fiveHundreds: string[] = [];
    // Every JSON refusal of an API route has the one error shape (lib/schemas/responses.ts,
    // apiErrorSchema); next-auth's own routes answer in next-auth's shape and are left out.
    const offShape: string[] = [];
    let errorBodies = 0;
    let done = 0;
    const deadline = Date.now() + WALL_MS;

    const one = async () => {
      const isPage = rnd() < 0.2;
      const target = `${fill(pick(isPage ? pages : api))}${pick(queries)}`;
      const method = isPage ? pick(["GET", "GET", "POST", "HEAD"]) : pick(methods);
      const headers: Record<string, string> = {};
      const caller = pick(callers);
      if (caller) headers.cookie = caller.cookie;
      let body: string | undefined;
      if (method !== "GET" && method !== "HEAD" && rnd() < 0.85) {
        body = rnd() < 0.7 ? JSON.stringify(pick(hostile)) : pick(rawBodies);
        const type = pick(types);
        if (type) headers["content-type"] = type;
      }
      let status = 0;
      try {
        const res = await fetch(`${server.url}${target}`, {
          method,
          headers,
          body,
          redirect: "manual",
          signal: AbortSignal.timeout(30_000),
        });
        status = res.status;
        const text = await res.text().catch(() => "");
        const json = (res.headers.get("content-type") ?? "").includes("application/json");
        const api = target.startsWith("/api/") && !target.startsWith("/api/auth/");
        if (status >= 400 && json && api && method !== "HEAD") {
          errorBodies++;
          let parsed = false;
          try {
            parsed = apiErrorSchema.safeParse(JSON.parse(text)).success;
          } catch {
            // not JSON at all: off shape
          }
          if (!parsed) offShape.push(`${method} ${target.slice(0, 120)} → ${status} ${text.slice(0, 160)}`);
        }
      } catch (err) {
        // A refused URL (e.g. an invalid escape the client itself rejects) is not a server answer.
        status = -1;
        if (!(err instanceof TypeError)) throw err;
      }
      counts.set(status, (counts.get(status) ?? 0) + 1);
      if (status >= 500) fiveHundreds.push(`${method} ${target.slice(0, 120)} → ${status}`);
    };

    const workers = Array.from({ length: CONCURRENCY }, async () => {
      while (done < REQUESTS && Date.now() < deadline) {
        done++;
        await one();
      }
    });
    await Promise.all(workers);

    const table = [...counts.entries()]
      .sort((a, b) => a[0] - b[0])
      .map(([s, n]) => `${s === -1 ? "client-refused" : s}: ${n}`);
    console.log(
      `[fuzz] seed ${SEED}: ${done} requests over ${api.length} API routes and ${pages.length} pages; status counts ${table.join(", ")}`,
    );
    if (fiveHundreds.length) console.log(`[fuzz] 5xx answers (first 20):\n${fiveHundreds.slice(0, 20).join("\n")}`);
    expect(done).toBe(REQUESTS);
    expect(fiveHundreds).toEqual([]);
    console.log(`[fuzz] ${errorBodies} JSON error answers checked against the error schema`);
    expect(errorBodies).toBeGreaterThan(REQUESTS / 10);
    expect(offShape.slice(0, 20)).toEqual([]);
    // The server still answers normally after the fuzz.
    expect((await fetch(`${server.url}/api/health`)).status).toBe(200);
  });
});
